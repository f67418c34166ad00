/**
 * The latched software interlock. It watches the trip conditions on every evaluation; the
 * first violation trips it once (the caller publishes the TripCommand at once, the controller
 * ramps to zero), latches it, and records the first-out condition with the values of every
 * condition at that moment. It resets only with a reason and only when no condition holds.
 *
 * Supervisory only: this software can fail, so the apparatus keeps its own hardware,
 * safety-rated interlocks, which Tiltwatch shows (`hardwareTripped`) but never resets.
 */
import { FIRST_OUT_FOUND_AT_START } from '../../shared/alarms/alarm-api.js';
import { DEMO_INTERLOCK_CONFIG, type InterlockConfig } from './interlock-config.js';
import { FrameLossWindow } from './frame-loss.js';
import {
  conditionStatus,
  describeCondition,
  tripConditions,
  violates,
  type ConditionStatus,
  type InterlockInputs,
  type TripCondition,
} from './trip-conditions.js';

/** The condition that tripped the interlock. Times in Unix epoch ms. */
export interface FirstOut {
  condition: string;
  channel: string;
  value: number | null;
  limit: number;
  at: number;
}

export interface TripRecord {
  at: number;
  firstOut: FirstOut;
  /** Every condition at the moment of the trip. */
  valuesAtTrip: ConditionStatus[];
  /** Text for the TripCommand and the history (at most 500 characters). */
  reason: string;
}

export interface ResetRecord {
  at: number;
  actor: string;
  reason: string;
  trip: TripRecord;
}

/** Body of `GET /api/interlock`. */
export interface InterlockState {
  state: 'ok' | 'tripped';
  firstOut: FirstOut | null;
  conditions: ConditionStatus[];
  hardwareTripped: boolean;
  /** The trip in force, null while ok. */
  trip: TripRecord | null;
  lastReset: ResetRecord | null;
}

/** Why a reset was refused: 400 for a missing reason, 409 for the others. */
export type ResetRefusal =
  | { ok: false; code: 'reason-required' | 'not-tripped' | 'hardware-tripped' | 'reset-in-progress'; message: string }
  | { ok: false; code: 'conditions-active'; message: string; active: ConditionStatus[] };

/**
 * A reset decided but not yet in effect: store `reset` (with its audit entry), then `commit()`
 * to open the latch, or `cancel()` when storing failed — the latch then stays closed.
 */
export interface PreparedReset {
  ok: true;
  reset: ResetRecord;
  commit(): void;
  cancel(): void;
}

export type ResetResult = { ok: true; reset: ResetRecord } | ResetRefusal;


const MAX_TRIP_REASON_CHARS = 500;
const MAX_RESET_REASON_CHARS = 500;

export class Interlock {
  private defs: TripCondition[];
  /** Present value of each condition, parallel to `defs`; updated in place on every evaluation. */
  private readonly values: (number | null)[];
  private readonly frameLoss: FrameLossWindow;
  private inputs: InterlockInputs | null = null;
  private trip: TripRecord | null = null;
  private lastReset: ResetRecord | null = null;
  private resetting = false;
  /** Which conditions held at the last evaluation, one flag per condition. */
  private readonly holding: boolean[];
  private changes = 0;

  constructor(private settings: InterlockConfig = DEMO_INTERLOCK_CONFIG) {
    this.defs = tripConditions(settings);
    this.values = this.defs.map(() => null);
    this.holding = this.defs.map(() => false);
    this.frameLoss = new FrameLossWindow(settings.lostFrameWindowMs);
  }

  get config(): Readonly<InterlockConfig> {
    return this.settings;
  }

  /**
   * Applies the trip levels of a new level set; the next evaluation compares against them. A
   * latched trip stays latched (it resets only with a reason once no condition holds).
   */
  retune(trips: Pick<InterlockConfig, 'currentTripA' | 'temperatureTripC' | 'flowTripLpm'>): void {
    this.settings = { ...this.settings, ...trips };
    this.defs = tripConditions(this.settings);
    this.changes++;
  }

  /** Records a fast frame's sequence number, seen at server time `atMs` (Unix epoch ms). */
  observeFrame(seq: number, atMs: number): void {
    this.frameLoss.observe(seq, atMs);
  }

  /**
   * Evaluates every condition at server time `nowMs` (Unix epoch ms). Returns the trip record
   * on the evaluation that trips the interlock, and null otherwise — also while it stays
   * tripped, so the caller publishes exactly one TripCommand per trip. Call it on every frame
   * and on a timer, so that silence (stale telemetry) is noticed without frames.
   */
  evaluate(inputs: InterlockInputs, nowMs: number): TripRecord | null {
    this.inputs = inputs;
    let first = -1;
    const lost = this.frameLoss.lostWithin(nowMs);
    for (let i = 0; i < this.defs.length; i++) {
      const value = this.defs[i].measure(inputs, nowMs, lost);
      this.values[i] = value;
      const holds = violates(this.defs[i], value);
      if (holds !== this.holding[i]) {
        this.holding[i] = holds;
        this.changes++;
      }
      if (first < 0 && holds) first = i;
    }
    if (this.trip || first < 0) return null;
    const valuesAtTrip = this.conditions();
    const cause = valuesAtTrip[first];
    this.trip = {
      at: nowMs,
      firstOut: { condition: cause.name, channel: cause.channel, value: cause.value, limit: cause.limit, at: nowMs },
      valuesAtTrip,
      reason: `Software interlock tripped by ${cause.name}: ${describeCondition(cause)}`.slice(0, MAX_TRIP_REASON_CHARS),
    };
    this.changes++;
    return this.trip;
  }

  /**
   * Latches a trip recorded before a restart, so that the latch outlives the server process:
   * the interlock stays tripped until reset, as if it had tripped in this process. Evaluations
   * do not return it again (its TripCommand went out when it happened).
   */
  restore(trip: TripRecord): void {
    if (this.trip) throw new Error(`the interlock is already tripped (since ${new Date(this.trip.at).toISOString()})`);
    this.trip = trip;
    this.changes++;
  }

  /**
   * A number that changes whenever the latch or the set of holding conditions changes (not on
   * mere value changes), so a caller can tell in constant time whether there is news to announce.
   */
  revision(): number {
    return this.changes;
  }

  /**
   * Latches a trip for a controller found holding at start with no trip on record (its record
   * was lost, or it was tripped by a server that stopped before storing it). The cause is
   * unknown; the returned record is stored like any trip. Null when already tripped.
   */
  foundAtStart(nowMs: number): TripRecord | null {
    if (this.trip) return null;
    this.trip = {
      at: nowMs,
      firstOut: { condition: FIRST_OUT_FOUND_AT_START, channel: 'controller.softwareHold', value: null, limit: 0, at: nowMs },
      valuesAtTrip: this.conditions(),
      reason: 'Software interlock tripped: the controller was found holding at start with no trip on record (first-out unknown, found at start)',
    };
    this.changes++;
    return this.trip;
  }

  /** Every condition as of the last evaluation. */
  conditions(): ConditionStatus[] {
    return this.defs.map((def, i) => conditionStatus(def, this.values[i]));
  }

  state(): InterlockState {
    return {
      state: this.trip ? 'tripped' : 'ok',
      firstOut: this.trip?.firstOut ?? null,
      conditions: this.conditions(),
      hardwareTripped: this.inputs?.hardwareTripped ?? false,
      trip: this.trip,
      lastReset: this.lastReset,
    };
  }

  /**
   * Decides a reset at `nowMs` (Unix epoch ms) without opening the latch (see `PreparedReset`).
   * Refused without a reason, when not tripped, while the controller's own hardware trip is
   * latched (it must be cleared at the apparatus first, see server/alarms/README.md "Safe order
   * of resets"), while another reset is being stored, or while any condition holds — measured
   * again at `nowMs` from the last inputs, so time spent without telemetry counts. Role checks
   * are the caller's (operator or above).
   */
  prepareReset(actor: string, reason: unknown, nowMs: number): PreparedReset | ResetRefusal {
    const why = typeof reason === 'string' ? reason.trim() : '';
    if (why === '') {
      return { ok: false, code: 'reason-required', message: 'is required to reset the interlock: say what caused the trip and what was done' };
    }
    if (why.length > MAX_RESET_REASON_CHARS) {
      return { ok: false, code: 'reason-required', message: `must be at most ${MAX_RESET_REASON_CHARS} characters` };
    }
    const trip = this.trip;
    if (!trip) return { ok: false, code: 'not-tripped', message: 'the interlock is not tripped; there is nothing to reset' };
    if (this.resetting) return { ok: false, code: 'reset-in-progress', message: 'another reset of the interlock is being recorded; look again in a moment' };
    if (this.inputs?.hardwareTripped) {
      return {
        ok: false,
        code: 'hardware-tripped',
        message:
          "the controller's own hardware trip is latched: clear its cause and reset the hardware trip at the apparatus first (Tiltwatch never resets it), then reset the software interlock here",
      };
    }
    if (this.inputs) this.evaluate(this.inputs, nowMs);
    const active = this.conditions().filter((c) => c.active);
    if (active.length > 0) {
      return {
        ok: false,
        code: 'conditions-active',
        message: `cannot reset while a trip condition holds: ${active.map(describeCondition).join('; ')}. Clear the cause first.`,
        active,
      };
    }
    const record: ResetRecord = { at: nowMs, actor, reason: why, trip };
    this.resetting = true;
    const settle = () => {
      if (!this.resetting) throw new Error('this reset was already committed or cancelled');
      this.resetting = false;
    };
    return {
      ok: true,
      reset: record,
      commit: () => {
        settle();
        if (this.trip === trip) this.trip = null;
        this.lastReset = record;
        this.changes++;
      },
      cancel: settle,
    };
  }

  /** Decides and applies a reset at once, with nothing stored in between (tests, tools). */
  reset(actor: string, reason: unknown, nowMs: number): ResetResult {
    const prepared = this.prepareReset(actor, reason, nowMs);
    if (!prepared.ok) return prepared;
    prepared.commit();
    return { ok: true, reset: prepared.reset };
  }
}
