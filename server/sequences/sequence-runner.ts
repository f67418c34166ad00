/**
 * Runs a sequence: pre-flights all of it from the field in force, records the run, then works
 * through the steps — a ramp hands the steering driver its next target, a hold waits, a shot
 * records the measured field and the prediction for it — one run at a time. An abort holds the
 * present field; a trip ends the run as aborted (steering has stopped by then). Each step's start
 * is written while the step goes (the runner does not wait for it); a start that cannot be
 * recorded stops the run, holding the present field. How the last step ended is written at the end.
 */
import type { Logger } from 'pino';
import type { Calibration } from '../../shared/field/calibration.js';
import { fieldAngles } from '../../shared/field/field-vector.js';
import type { LiveState } from '../../shared/live/live-state.js';
import type { ProfileRecord } from '../../shared/profiles/profile-record.js';
import { profileTrapField } from '../../shared/profiles/trap-orientation.js';
import type { SequenceRecord, SequenceStep, ShotPrediction, StepOutcome } from '../../shared/steering/steering-api.js';
import { targetVector } from '../../shared/steering/target.js';
import type { Db } from '../db/database.js';
import { writeFailureText } from '../db/write-failure.js';
import { HttpError } from '../http/http-error.js';
import type { PathPredictor } from '../steering/path-predictor.js';
import { rampsOfSequence } from '../steering/planner.js';
import { PreflightRefusal, type SteerDesk } from '../steering/steer-desk.js';
import { fieldInForce, type Steering } from '../steering/steering.js';
import { addShot, createRun, endRun } from './run-repository.js';
import { findSequence } from './sequence-repository.js';
import { endSteps, startStep } from './step-repository.js';

export interface RunnerDeps {
  db: Db;
  desk: SteerDesk;
  steering: Steering;
  predictor: Pick<PathPredictor, 'evaluate'>;
  calibration: () => Calibration;
  live: () => LiveState;
  profile: () => ProfileRecord | null;
  log: Pick<Logger, 'info' | 'warn' | 'error'>;
}

interface ActiveRun {
  id: number;
  sequence: SequenceRecord;
  /**
   * Set when the run must stop (`recorded`: its end is stored already; `outcome`: how the step
   * it was on ended); wakes the step that waits.
   */
  stop: { why: string; recorded: boolean; outcome: StepOutcome } | null;
  wake: () => void;
}

export class SequenceRunner {
  private active: ActiveRun | null = null;
  private finished: Promise<void> = Promise.resolve();

  constructor(private readonly deps: RunnerDeps) {
    deps.steering.onTripStop((program) => {
      if (this.active && program.runId === this.active.id) this.stop(this.active, { why: 'the interlock tripped during the run', recorded: false, outcome: 'tripped' });
    });
  }

  /** The run in force, if any. */
  activeRunId(): number | null {
    return this.active?.id ?? null;
  }

  /** Pre-flights and starts a run; 404 unknown sequence, 409 busy or tripped, 422 failed checks. */
  start(actor: string, sequenceId: number, reason: string): Promise<{ runId: number }> {
    const { deps } = this;
    return deps.desk.serial(async () => {
      const sequence = await findSequence(deps.db, sequenceId);
      if (!sequence) throw new HttpError(404, `No sequence with id ${sequenceId}: see GET /api/sequences`);
      this.refuseWhileBusy();
      const plan = await deps.desk.check((from) => rampsOfSequence(sequence.steps, from).ramps);
      if (!plan.ok || !plan.from) throw new PreflightRefusal({ ok: plan.ok, checks: plan.checks, path: plan.path });
      this.refuseWhileBusy();
      const runId = await recorded(() => createRun(deps.db, { sequence, actor, reason, startedAt: new Date() }));
      const run: ActiveRun = { id: runId, sequence, stop: null, wake: () => undefined };
      this.active = run;
      // The run takes the field where steering (or the controller) has it now.
      const here = deps.steering.fieldNow() ?? plan.from;
      const angles = fieldAngles(here);
      deps.steering.run({
        from: here, to: here, rampMs: 0, calibration: plan.calibration, actor, reason, runId, path: plan.path,
        target: { magnitudeG: angles.magnitude, thetaDeg: angles.thetaDeg ?? 0, phiDeg: angles.phiDeg ?? 0, rampMs: 0 },
      });
      deps.log.info({ runId, sequence: sequence.name, version: sequence.version, actor }, 'sequence run started');
      this.finished = this.execute(run, actor, reason).catch((error) => deps.log.error({ err: error, runId }, 'sequence run failed'));
      return { runId };
    });
  }

  /** Aborts the run: records the abort, holds the present field; 404/409 when it is not running. */
  async abort(runId: number, actor: string, reason: string): Promise<void> {
    const run = this.active;
    if (!run || run.id !== runId) throw new HttpError(409, `Run ${runId} is not running`);
    await recorded(() => endRun(this.deps.db, runId, { state: 'aborted', at: new Date(), why: `aborted by ${actor}: ${reason}`, actor, reason }));
    this.deps.steering.holdHere(actor, `run ${runId} aborted: ${reason}`);
    this.stop(run, { why: `aborted by ${actor}: ${reason}`, recorded: true, outcome: 'aborted' });
    await this.finished;
  }

  /** Waits for the run in force to end (tests, shutdown). */
  async settled(): Promise<void> {
    await this.finished;
  }

  /** Stops the run in force at shutdown. */
  async close(): Promise<void> {
    if (this.active) this.stop(this.active, { why: 'the server stopped during the run', recorded: false, outcome: 'aborted' });
    await this.finished;
  }

  private refuseWhileBusy(): void {
    if (this.active) throw new HttpError(409, `Run ${this.active.id} is going: wait for it to end or abort it`);
    this.deps.desk.refuseWhileTripped();
  }

  private stop(run: ActiveRun, why: NonNullable<ActiveRun['stop']>): void {
    if (run.stop) return;
    run.stop = why;
    run.wake();
  }

  private async execute(run: ActiveRun, actor: string, reason: string): Promise<void> {
    const { deps } = this;
    let failure: string | null = null;
    /** The step the run is on, when it began, and whether it has run its whole course. */
    let reached: { index: number; startedAt: Date; completed: boolean } | null = null;
    try {
      for (let i = 0; i < run.sequence.steps.length && !run.stop; i++) {
        const step = run.sequence.steps[i];
        reached = { index: i, startedAt: new Date(), completed: false };
        const stored = startStep(deps.db, { runId: run.id, index: i, step, at: reached.startedAt }).catch((error) => this.stepNotRecorded(run, i, error));
        try {
          await this.step(run, step, i, actor, reason);
          reached.completed = !run.stop;
        } finally {
          await stored;
        }
      }
    } catch (error) {
      failure = (error as Error).message;
      deps.log.error({ err: error, runId: run.id }, 'sequence run stopped by an error');
      deps.steering.holdHere('system', `run ${run.id} stopped: ${failure}`);
    }
    this.active = null;
    deps.steering.detachRun(run.id);
    if (reached) {
      const outcome = reached.completed ? 'done' : (run.stop?.outcome ?? 'aborted');
      await endSteps(deps.db, run.id, reached, { at: new Date(), outcome }).catch((error) => deps.log.error({ err: error, runId: run.id }, 'storing the end of a step failed'));
    }
    if (run.stop?.recorded) return;
    const state = run.stop || failure ? 'aborted' : 'done';
    const why = run.stop?.why ?? failure;
    await endRun(deps.db, run.id, { state, at: new Date(), why: why ?? null, actor: state === 'aborted' ? 'system' : actor, reason: why ?? reason })
      .catch((error) => deps.log.error({ err: error, runId: run.id }, 'storing the end of a run failed'));
    deps.log.info({ runId: run.id, state, why }, 'sequence run ended');
  }

  /** A step whose start could not be recorded did not count: the run stops, holding the present field. */
  private stepNotRecorded(run: ActiveRun, index: number, error: unknown): void {
    const why = `the start of step ${index + 1} could not be recorded (${writeFailureText(error)})`;
    this.deps.log.error({ err: error, runId: run.id }, 'storing the start of a step failed');
    if (run.stop) return;
    this.deps.steering.holdHere('system', `run ${run.id} stopped: ${why}`);
    this.stop(run, { why, recorded: false, outcome: 'aborted' });
  }

  private async step(run: ActiveRun, step: SequenceStep, index: number, actor: string, reason: string): Promise<void> {
    const { deps } = this;
    if (step.kind === 'ramp') {
      const from = deps.steering.fieldNow() ?? fieldInForce(deps.live(), deps.calibration());
      if (!from) throw new Error('no field to start the ramp from');
      const target = { magnitudeG: step.magnitudeG, thetaDeg: step.thetaDeg, phiDeg: step.phiDeg, rampMs: step.durationMs };
      deps.steering.run({ from, to: targetVector(step), rampMs: step.durationMs, calibration: deps.calibration(), target, actor, reason, runId: run.id, path: deps.steering.status().path });
      await this.wait(run, step.durationMs);
    } else if (step.kind === 'hold') {
      await this.wait(run, step.durationMs);
    } else {
      await this.shot(run, step.label, index);
    }
  }

  /** Records the measured field and the prediction for it; a shot that cannot be recorded stops the run. */
  private async shot(run: ActiveRun, label: string, stepIndex: number): Promise<void> {
    const { deps } = this;
    const at = new Date();
    const live = deps.live();
    if (!live.field || !live.currents) throw new Error(`shot "${label}": no measured field`);
    const field = { magnitude: live.field.magnitude, thetaDeg: live.field.thetaDeg, phiDeg: live.field.phiDeg };
    const profile = deps.profile();
    let prediction: ShotPrediction | null = null;
    if (profile) {
      const trap = profileTrapField(deps.calibration(), profile.profile, live.currents);
      if (trap.thetaDeg !== null && trap.phiDeg !== null) {
        const [p] = await deps.predictor.evaluate(profile, [{ thetaDeg: trap.thetaDeg, phiDeg: trap.phiDeg }], true);
        prediction = p;
      }
    }
    await addShot(deps.db, { runId: run.id, stepIndex, label, at, field, prediction, profileId: profile?.id ?? null });
  }

  private wait(run: ActiveRun, ms: number): Promise<void> {
    return new Promise((resolve) => {
      const timer = setTimeout(done, ms);
      function done() {
        clearTimeout(timer);
        resolve();
      }
      run.wake = done;
    });
  }
}

/** Runs a write that must be durable before the command counts as done; a failure is a 503. */
async function recorded<T>(write: () => Promise<T>): Promise<T> {
  try {
    return await write();
  } catch {
    throw new HttpError(503, 'The command could not be recorded, so nothing was changed. Try again; if it persists, check the database.');
  }
}
