/**
 * The steering commands behind the routes: pre-flight a plan, take a target, abort, release.
 * Each command that changes what the controller is told is written to the audit trail first,
 * with the steering state it leads to in the same transaction, and only then acted on, so a command is reported done only once it is recorded; when the
 * record cannot be written nothing is sent. Commands run one after another.
 */
import type { Logger } from 'pino';
import type { ControllerParameters } from '../../shared/apparatus/coil-data.js';
import type { Calibration } from '../../shared/field/calibration.js';
import type { Vec3 } from '../../shared/field/field-vector.js';
import type { LiveState } from '../../shared/live/live-state.js';
import type { ProfileRecord } from '../../shared/profiles/profile-record.js';
import type { PlannedPoint, PreflightResult, SteerTargetRequest } from '../../shared/steering/steering-api.js';
import { targetVector } from '../../shared/steering/target.js';
import type { AuditEntry } from '../audit/audit-log.js';
import { HttpError } from '../http/http-error.js';
import type { PathPredictor } from './path-predictor.js';
import { plannedPoints, withPredictions, type PlannedRamp } from './planner.js';
import { preflight, type PreflightLimits } from './preflight.js';
import { fieldInForce, type Steering } from './steering.js';
import type { StoredSteering } from './stored-steering.js';

/** A telemetry frame older than this (ms) means the controller is not reporting. */
const REPORTING_WITHIN_MS = 2000;

export interface SteerDeskDeps {
  steering: Steering;
  predictor: Pick<PathPredictor, 'evaluate'>;
  coils: ControllerParameters;
  calibration: () => Calibration;
  live: () => LiveState;
  profile: () => ProfileRecord | null;
  /** Limits in force (alarm and trip levels, the lead's collapse-ratio limit). */
  limits: () => Promise<PreflightLimits>;
  interlockTripped: () => boolean;
  /** Writes one audit entry and the steering state it leads to durably, together (rejects when it cannot). */
  audit: (entry: AuditEntry, state: StoredSteering) => Promise<void>;
  /** True while a run steers (manual targets are refused then). */
  runActive: () => boolean;
  log: Pick<Logger, 'info' | 'warn' | 'error'>;
  now?: () => number;
}

/** What a plan starts from and contains, with its pre-flight. */
export interface CheckedPlan extends PreflightResult {
  calibration: Calibration;
  from: Vec3 | null;
}

export class SteerDesk {
  private queue: Promise<unknown> = Promise.resolve();

  constructor(private readonly deps: SteerDeskDeps) {}

  /**
   * Plans the ramps built by `ramps` from the field in force and pre-flights every point. With
   * no field to start from, the ramps start from zero so the other checks still say something.
   */
  async check(ramps: (from: Vec3) => PlannedRamp[]): Promise<CheckedPlan> {
    const { deps } = this;
    const live = deps.live();
    const now = (deps.now ?? Date.now)();
    const calibration = deps.calibration();
    const from = fieldInForce(live, calibration);
    let points: PlannedPoint[] = plannedPoints(calibration, ramps(from ?? { x: 0, y: 0, z: 0 }));
    const profile = deps.profile();
    if (profile) {
      try {
        points = await withPredictions(calibration, profile, points, deps.predictor);
      } catch (error) {
        deps.log.error({ err: error }, 'predictions along the planned path failed');
      }
    }
    const lastFrame = live.controller.lastFrameAt === null ? NaN : Date.parse(live.controller.lastFrameAt);
    const checks = preflight({
      points,
      noProfile: profile === null,
      coils: deps.coils,
      limits: await deps.limits(),
      now: {
        controllerOnline: live.controller.online,
        reporting: from !== null && Number.isFinite(lastFrame) && now - lastFrame <= REPORTING_WITHIN_MS,
        interlockTripped: deps.interlockTripped(),
        hardwareTripped: live.controller.hardwareTripped,
        waterSupplyC: live.waterSupplyC,
        flowLpm: live.flowLpm,
      },
    });
    return { ok: checks.every((c) => c.ok), checks, path: points, calibration, from };
  }

  /** The pre-flight of a single target (nothing is sent). */
  async preflightTarget(request: SteerTargetRequest): Promise<PreflightResult> {
    const { ok, checks, path } = await this.check(singleRamp(request));
    return { ok, checks, path };
  }

  /**
   * Takes a target: 409 while tripped or while a run steers, 422 with the checks when any
   * fails, otherwise records the command, starts the ramp and returns the checks.
   */
  setTarget(actor: string, request: SteerTargetRequest): Promise<PreflightResult> {
    return this.serial(async () => {
      this.refuseWhileBusy();
      const plan = await this.check(singleRamp(request));
      const result = { ok: plan.ok, checks: plan.checks, path: plan.path };
      if (!plan.ok || !plan.from) throw new PreflightRefusal(result);
      this.refuseWhileBusy();
      const target = { magnitudeG: request.magnitudeG, thetaDeg: request.thetaDeg, phiDeg: request.phiDeg, rampMs: request.rampMs };
      const program = { from: plan.from, to: targetVector(request), rampMs: request.rampMs, calibration: plan.calibration, target, actor, reason: request.reason, runId: null, path: plan.path };
      await this.record({ actor, action: 'steering.target', subject: 'steering', oldValue: this.deps.steering.status().target, newValue: target, reason: request.reason }, this.deps.steering.stored(program));
      this.deps.steering.run(program);
      this.deps.log.info({ actor, target, reason: request.reason }, 'steering to a new target');
      return result;
    });
  }

  /** Ends the ramp where it is and holds the field there (audited); 409 when nothing steers. */
  abort(actor: string, reason: string): Promise<void> {
    return this.serial(async () => {
      const hold = this.deps.steering.holdProgram(actor, reason);
      if (!hold) throw new HttpError(409, 'Nothing is being steered: there is no ramp to abort');
      if (this.deps.runActive()) throw new HttpError(409, 'A sequence run steers the field: abort the run on Sequences instead');
      await this.record({ actor, action: 'steering.abort', subject: 'steering', oldValue: this.deps.steering.status().target, reason }, this.deps.steering.stored(hold));
      this.deps.steering.run(hold);
    });
  }

  /**
   * Stops steering (or clears the state restored after a restart); the controller's demo
   * program (if any) takes over once it hears nothing.
   */
  release(actor: string, reason: string): Promise<void> {
    return this.serial(async () => {
      const { steering } = this.deps;
      if (steering.status().mode === 'idle') throw new HttpError(409, 'Nothing is being steered');
      if (this.deps.runActive()) throw new HttpError(409, 'A sequence run steers the field: abort the run first');
      const why = `released by ${actor}: ${reason}`;
      await this.record({ actor, action: 'steering.release', subject: 'steering', oldValue: steering.status().target, reason }, { program: null, lastStop: { at: new Date().toISOString(), why } });
      steering.release(why);
    });
  }

  /** Runs `job` after every command before it (a run start uses the same line). */
  serial<T>(job: () => Promise<T>): Promise<T> {
    const run = this.queue.then(job);
    this.queue = run.catch(() => undefined);
    return run;
  }

  /** Writes the audit entry with the state it leads to; a failure is a 503 and nothing changes. */
  private async record(entry: AuditEntry, state: StoredSteering): Promise<void> {
    try {
      await this.deps.audit(entry, state);
    } catch (error) {
      this.deps.log.error({ err: error, action: entry.action }, 'a steering command could not be recorded; nothing was sent');
      throw new HttpError(503, 'The command could not be recorded in the audit trail, so nothing was sent to the controller. Try again; if it persists, check the database.');
    }
  }

  /** 409 while the software interlock or the hardware trip chain is tripped. */
  refuseWhileTripped(): void {
    if (this.deps.interlockTripped() || this.deps.live().controller.hardwareTripped) {
      throw new HttpError(409, 'The interlock is tripped: nothing can be steered until it is reset (Interlocks page; a hardware trip is reset at the controller)');
    }
  }

  private refuseWhileBusy(): void {
    this.refuseWhileTripped();
    if (this.deps.runActive()) throw new HttpError(409, 'A sequence run steers the field: abort it on Sequences before setting a target');
  }
}

/** A 422 carrying the failed pre-flight. */
export class PreflightRefusal extends Error {
  constructor(readonly result: PreflightResult) {
    super('pre-flight failed');
  }
}

function singleRamp(request: SteerTargetRequest): (from: Vec3) => PlannedRamp[] {
  return (from) => [{ startMs: 0, from, to: targetVector(request), rampMs: request.rampMs }];
}
