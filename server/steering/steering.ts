/**
 * Drives the controller towards a target: the field in force turns along the shorter great
 * circle with its magnitude linear in time, and the currents for each moment go to the
 * controller as SetpointCommands at a steady rate (20 per second while ramping, 2 per second
 * while holding, which also keeps the controller in remote mode: its demo program resumes only
 * once nothing steers). A trip ends steering at once: the controller holds zero and a new
 * target is needed after the reset. Supervisory only; the hardware interlocks stay in charge.
 *
 * Each change is handed to `onChange` listeners in its stored form (steering-store.ts). After a
 * restart `restore()` takes the stored state without sending anything: a target that had been
 * reached is shown and used by the deviation alarm, a ramp that was under way is shown as
 * interrupted (the field stopped somewhere on its path, so only the measured field counts).
 * The restored state ends with the next command or a trip; no setpoint goes out until then.
 */
import type { Calibration } from '../../shared/field/calibration.js';
import { currentsForField, fieldAngles, fieldVector, type Vec3 } from '../../shared/field/field-vector.js';
import type { LiveState } from '../../shared/live/live-state.js';
import { fieldAlongPath, unit } from '../../shared/steering/great-circle.js';
import type { PlannedPoint, SteeringStatus } from '../../shared/steering/steering-api.js';
import type { SetpointCommand } from '../../shared/telemetry/messages.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import type { CommandLink } from '../interlock/supervisor.js';
import type { StoredProgram, StoredSteering } from './stored-steering.js';

/** Setpoint period while ramping and while holding, ms. */
export const RAMP_PERIOD_MS = 50;
export const HOLD_PERIOD_MS = 500;
/** After a ramp ends, alarms marked "suppress during ramp" stay suppressed this long while the currents settle, ms. */
export const SETTLE_MS = 1000;

/** A ramp in force: from the field `from` to `to` over `rampMs`, started at `startMs` (server clock). */
export interface Program {
  from: Vec3;
  to: Vec3;
  rampMs: number;
  startMs: number;
  calibration: Calibration;
  target: { magnitudeG: number; thetaDeg: number; phiDeg: number; rampMs: number };
  actor: string;
  reason: string;
  runId: number | null;
  path: PlannedPoint[];
}

export interface SteeringDeps {
  link: CommandLink;
  /** True while the software interlock or the hardware trip chain is tripped. */
  tripped: () => boolean;
  now?: () => number;
}

/** Trap-frame field the controller's present setpoints make (or the measured field without them). */
export function fieldInForce(live: LiveState, calibration: Calibration): Vec3 | null {
  if (live.setpoints && !live.controller.softwareHold) return fieldVector(calibration, live.setpoints);
  return live.field?.vector ?? null;
}

export class Steering {
  private program: Program | null = null;
  private timer: NodeJS.Timeout | null = null;
  private lastSentMs = -Infinity;
  private lastStop: { at: number; why: string } | null = null;
  /** What a restart found stored and nothing has replaced since; never sent to the controller. */
  private restored: StoredProgram | null = null;
  private readonly tripListeners: ((program: Program) => void)[] = [];
  private readonly changeListeners: ((state: StoredSteering) => void)[] = [];
  private readonly now: () => number;

  constructor(private readonly deps: SteeringDeps) {
    this.now = deps.now ?? Date.now;
  }

  /** Starts the setpoint timer. */
  start(): void {
    this.timer ??= setInterval(() => this.tick(), RAMP_PERIOD_MS / 2);
  }

  close(): void {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
  }

  /** Calls `cb` with the program a trip ended (the run in force aborts). */
  onTripStop(cb: (program: Program) => void): void {
    this.tripListeners.push(cb);
  }

  /** Calls `cb` with the stored form of the state after each change. */
  onChange(cb: (state: StoredSteering) => void): void {
    this.changeListeners.push(cb);
  }

  /** Takes the state stored before a restart; sends nothing (see the file comment). */
  restore(state: StoredSteering): void {
    // A run in force at the stop has been ended as aborted (abortOrphanedRuns): nothing belongs to it any more.
    this.restored = state.program && { ...state.program, runId: null };
    this.lastStop = state.lastStop ? { at: Date.parse(state.lastStop.at), why: state.lastStop.why } : null;
  }

  /** The stored form of the state in force, or of `next` once it would be taken now. */
  stored(next?: Omit<Program, 'startMs'>): StoredSteering {
    const now = this.now();
    const p = next ? { ...next, startMs: now } : this.program;
    if (!p) return { program: this.restored, lastStop: this.lastStop ? { at: new Date(this.lastStop.at).toISOString(), why: this.lastStop.why } : null };
    const program = { target: { ...p.target }, to: p.to, startedAt: new Date(p.startMs).toISOString(), actor: p.actor, reason: p.reason, runId: p.runId, reached: now >= p.startMs + p.rampMs };
    return { program, lastStop: null };
  }

  /** The field the program commands now, or null when nothing steers. */
  fieldNow(): Vec3 | null {
    return this.program ? this.fieldAt(this.program, this.now()) : null;
  }

  /** A run that ended leaves its last target held, no longer tied to the run. */
  detachRun(runId: number): void {
    if (this.program?.runId !== runId) return;
    this.program = { ...this.program, runId: null };
    this.changed();
  }

  /** Takes a new program at once and sends its first setpoint. */
  run(program: Omit<Program, 'startMs'>): Program {
    const started: Program = { ...program, startMs: this.now() };
    this.program = started;
    this.restored = null;
    this.lastStop = null;
    this.send(this.now());
    this.changed();
    return started;
  }

  /** Ends the ramp where it is and holds that field; returns the held field, or null when nothing steers. */
  holdHere(actor: string, reason: string, runId: number | null = null): Vec3 | null {
    const hold = this.holdProgram(actor, reason, runId);
    if (!hold) return null;
    this.run(hold);
    return hold.to;
  }

  /** The program that holds the field the ramp has reached now, or null when nothing steers. */
  holdProgram(actor: string, reason: string, runId: number | null = null): Omit<Program, 'startMs'> | null {
    const p = this.program;
    if (!p) return null;
    const here = this.fieldAt(p, this.now());
    const angles = fieldAngles(here);
    return {
      ...p, from: here, to: here, rampMs: 0, actor, reason, runId,
      target: { magnitudeG: angles.magnitude, thetaDeg: angles.thetaDeg ?? 0, phiDeg: angles.phiDeg ?? 0, rampMs: 0 },
      path: [],
    };
  }

  /** Stops steering: no more setpoints; the controller keeps the last one until its demo program takes over. */
  release(why: string): void {
    this.program = null;
    this.restored = null;
    this.lastStop = { at: this.now(), why };
    this.changed();
  }

  /** The program in force, or null. */
  current(): Program | null {
    return this.program;
  }

  /** For the alarms: the target direction (null when none or |B| = 0) and whether a ramp is programmed. */
  alarmContext(nowMs: number = this.now()): { targetDirection: Vec3 | null; rampProgrammed: boolean } {
    const p = this.program;
    if (!p) return { targetDirection: this.restored?.reached ? unit(this.restored.to) : null, rampProgrammed: false };
    return { targetDirection: unit(p.to), rampProgrammed: nowMs < p.startMs + p.rampMs + SETTLE_MS };
  }

  status(): SteeringStatus {
    const p = this.program;
    const now = this.now();
    const r = this.restored;
    if (!p && r) {
      return {
        mode: r.reached ? 'restored' : 'interrupted',
        target: { ...r.target }, actor: r.actor, reason: r.reason, startedAt: r.startedAt, path: [], runId: r.runId, lastStop: null,
      };
    }
    return {
      mode: p ? (now < p.startMs + p.rampMs ? 'ramping' : 'holding') : 'idle',
      target: p ? { ...p.target } : null,
      actor: p?.actor ?? null,
      reason: p?.reason ?? null,
      startedAt: p ? new Date(p.startMs).toISOString() : null,
      path: p?.path ?? [],
      runId: p?.runId ?? null,
      lastStop: this.lastStop ? { at: new Date(this.lastStop.at).toISOString(), why: this.lastStop.why } : null,
    };
  }

  /** Runs on the timer; public for tests that drive the clock. */
  tick(): void {
    const p = this.program;
    if (!p && !this.restored) return;
    const now = this.now();
    if (this.deps.tripped()) {
      this.program = null;
      this.restored = null;
      this.lastStop = { at: now, why: 'the interlock tripped; the controller ramps to zero and holds' };
      if (p) for (const cb of this.tripListeners) cb(p);
      this.changed();
      return;
    }
    if (!p) return;
    const period = now < p.startMs + p.rampMs ? RAMP_PERIOD_MS : HOLD_PERIOD_MS;
    // A ramp's last setpoint goes out on time even when the hold period has begun.
    const rampEndedSinceLast = this.lastSentMs < p.startMs + p.rampMs && now >= p.startMs + p.rampMs;
    if (now - this.lastSentMs >= period || rampEndedSinceLast) this.send(now);
    if (rampEndedSinceLast) this.changed();
  }

  private changed(): void {
    if (this.changeListeners.length === 0) return;
    const state = this.stored();
    for (const cb of this.changeListeners) cb(state);
  }

  private fieldAt(p: Program, nowMs: number): Vec3 {
    const t = p.rampMs > 0 ? (nowMs - p.startMs) / p.rampMs : 1;
    return fieldAlongPath(p.from, p.to, t);
  }

  private send(nowMs: number): void {
    const p = this.program;
    if (!p) return;
    const setpointA = currentsForField(p.calibration, this.fieldAt(p, nowMs));
    const command: SetpointCommand = { tMs: nowMs, setpointA };
    this.deps.link.publish(TOPICS.setpoints, JSON.stringify(command), 0);
    this.lastSentMs = nowMs;
  }
}
