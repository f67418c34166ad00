/**
 * Assembles steering for the server: the path predictor (own worker, the live engine's
 * ε_dd,crit cache), the setpoint driver, the command desk, sequences and runs, and the routes.
 * The limits come from the alarm limits and the stored level set in force. The steering state
 * stored before a restart is restored (nothing is sent; see steering.ts) and every change is stored.
 * Steering exists before supervision (the alarms ask it for the target); what it needs from
 * supervision and ingest is handed over with `connect()`. The owner calls `close()`.
 */
import type { Logger } from 'pino';
import { DEMO_PARAMETERS } from '../../shared/apparatus/coil-data.js';
import type { LevelSetVersion } from '../../shared/levels/level-set.js';
import type { AlarmLimit } from '../alarms/alarm-limit.js';
import type { Db } from '../db/database.js';
import type { CalibrationCache } from '../field/calibration-cache.js';
import type { RouteHandlers } from '../http/route-table.js';
import type { Interlock } from '../interlock/interlock.js';
import type { CommandLink, SteeringContext } from '../interlock/supervisor.js';
import type { LiveStore } from '../live/live-store.js';
import type { CriticalCache } from '../prediction/critical-cache.js';
import type { LivePredictionFeed } from '../prediction/live-prediction-feed.js';
import { abortOrphanedRuns } from '../sequences/run-repository.js';
import { sequenceHandlers, type SequenceRoutes } from '../sequences/sequence-routes.js';
import { seedDemoSequences } from '../sequences/sequence-repository.js';
import { SequenceRunner } from '../sequences/sequence-runner.js';
import { SteerDesk } from './steer-desk.js';
import { PathPredictor } from './path-predictor.js';
import type { PreflightLimits } from './preflight.js';
import { Steering } from './steering.js';
import { steeringHandlers, type SteeringRoutes } from './steering-routes.js';
import { auditWithState, loadSteering, SteeringWriter } from './steering-store.js';

export interface SteeringParts {
  steering: Steering;
  desk: SteerDesk;
  predictor: PathPredictor;
  /** For the alarms: the target direction and whether a ramp is programmed. */
  context: SteeringContext;
  runner: SequenceRunner;
  handlers: Pick<RouteHandlers, SteeringRoutes | SequenceRoutes>;
  /** Hands over the command link (MQTT) and the supervision parts, then starts the setpoint timer. */
  connect(parts: { link: CommandLink; interlock: Interlock; alarmLimits: () => AlarmLimit[]; levels: () => LevelSetVersion }): void;
  close(): Promise<void>;
}

export async function startSteering(deps: {
  db: Db;
  live: LiveStore;
  calibrations: CalibrationCache;
  prediction: LivePredictionFeed;
  criticalCache: CriticalCache;
  log: Logger;
}): Promise<SteeringParts> {
  const { db, live, calibrations, prediction, criticalCache, log } = deps;
  // Like the demo calibration and sample profile: seeded once, on a database without them.
  await seedDemoSequences(db);
  await abortOrphanedRuns(db, new Date());
  let link: CommandLink | null = null;
  let interlock: Interlock | null = null;
  let alarmLimits: () => AlarmLimit[] = () => [];
  let levels: (() => LevelSetVersion) | null = null;
  const interlockTripped = () => interlock?.state().state === 'tripped';
  const steering = new Steering({
    link: { publish: (topic, payload, qos) => link?.publish(topic, payload, qos) },
    tripped: () => interlockTripped() || live.snapshot().controller.hardwareTripped,
  });
  steering.onTripStop((program) => log.warn({ target: program.target, runId: program.runId }, 'steering stopped by a trip'));
  const stored = await loadSteering(db);
  if (stored) {
    steering.restore(stored);
    const { mode, target } = steering.status();
    if (mode !== 'idle') log.warn({ mode, target }, 'steering state restored from before the restart; no setpoint is sent until the next command');
  }
  const writer = new SteeringWriter(db, log);
  steering.onChange((state) => writer.write(state));
  const predictor = new PathPredictor({ cache: criticalCache });

  /** Alarm levels in force, and the lead's trip levels and operating settings (stored level set). */
  const limits = async (): Promise<PreflightLimits> => {
    if (!levels) throw new Error('steering asked for limits before connect()');
    const { trips, settings } = levels().levels;
    const alarms = alarmLimits();
    const lowestH = (prefix: string, fallback: number) =>
      Math.min(fallback, ...alarms.filter((l) => l.channel.startsWith(prefix) && (l.level === 'H' || l.level === 'HH')).map((l) => l.limit));
    return {
      currentAlarmA: lowestH('current.', trips.currentHighA),
      temperatureAlarmC: lowestH('temperature.', trips.temperatureHighC),
      temperatureTripC: trips.temperatureHighC,
      maxFieldG: Math.min(DEMO_PARAMETERS.maxFieldG, settings.maxTargetFieldG),
      collapseRatioLimit: settings.maxTargetCollapseRatio,
    };
  };
  const desk = new SteerDesk({
    steering,
    predictor,
    coils: DEMO_PARAMETERS,
    calibration: () => calibrations.active(),
    live: () => live.snapshot(),
    profile: () => prediction.activeProfile(),
    limits,
    interlockTripped,
    audit: auditWithState(db),
    runActive: () => runner.activeRunId() !== null,
    log,
  });
  const runner: SequenceRunner = new SequenceRunner({
    db, desk, steering, predictor, log,
    calibration: () => calibrations.active(),
    live: () => live.snapshot(),
    profile: () => prediction.activeProfile(),
  });

  return {
    steering,
    desk,
    predictor,
    context: steering,
    runner,
    handlers: { ...steeringHandlers({ desk, steering }), ...sequenceHandlers({ db, desk, runner }) },
    connect(parts) {
      link = parts.link;
      interlock = parts.interlock;
      alarmLimits = parts.alarmLimits;
      levels = parts.levels;
      steering.start();
    },
    async close() {
      await runner.close();
      steering.close();
      await writer.drain();
      await predictor.close();
    },
  };
}
