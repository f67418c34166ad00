/**
 * The state of one alarm, after the alarm state model of ISA-18.2 / IEC 62682: the annunciated
 * states (normal, unacknowledged, acknowledged, returned-to-normal unacknowledged, latched)
 * and the suppression states laid over them (shelved, suppressed by design, out of service).
 *
 * Shelved and suppressed alarms are still evaluated: their raises and clears are logged with
 * `hidden` set but not annunciated. Out-of-service alarms are not evaluated at all (their
 * instrument is under maintenance) and restart from normal when returned to service.
 */
import type { AlarmEventKind, AlarmProcessState, AlarmStateName, AlarmSuppression } from '../../shared/alarms/alarm-api.js';
import type { ChannelId } from './channels.js';
import { isHighLevel, type AlarmLimit, type AlarmPriority } from './alarm-limit.js';
import { AlarmRequestError } from './alarm-request-error.js';

/** What the operator sees: the suppression when one applies, the annunciated state otherwise. */
export type AlarmState = AlarmStateName;

/** One transition, for the alarm history and the audit trail. Times in Unix epoch ms. */
export interface AlarmEvent {
  alarmId: string;
  channel: ChannelId;
  priority: AlarmPriority;
  kind: AlarmEventKind;
  at: number;
  from: AlarmState;
  to: AlarmState;
  /** Channel value at the transition (channel unit), null when no value has arrived. */
  value: number | null;
  limit: number;
  actor?: string;
  reason?: string;
  /** Set when a raise or clear happened under a suppression and was not annunciated. */
  hidden?: AlarmSuppression;
  /** On annunciated raises grouped under an earlier root alarm: that alarm's id. */
  firstOutOf?: string;
  /** On raises: when the condition began (before any on-delay), Unix epoch ms. */
  conditionSince?: number;
}

export interface Shelf {
  by: string;
  reason: string;
  /** Unix epoch ms. */
  since: number;
  until: number;
}

interface EventDetails {
  actor?: string;
  reason?: string;
}

/**
 * What an alarm must remember across a restart: its annunciated state, the suppressions laid
 * over it, when and at which value it was raised, and its first-out group. The present value,
 * pending delays and suppression by design are measured again after a restart.
 */
export interface AlarmMemory {
  process: AlarmProcessState;
  conditionActive: boolean;
  outOfService: boolean;
  shelf: Shelf | null;
  /** Unix epoch ms; null while normal. */
  raisedAt: number | null;
  /** Channel value when the alarm was raised; null while normal. */
  valueAtRaise: number | null;
  /** When the condition of the present raise began (before the on-delay), Unix epoch ms. */
  conditionSince: number | null;
  firstOutOf: string | null;
}

/** State machine of one alarm. Times are Unix epoch ms, always passed in. */
export class AlarmStateMachine {
  private process: AlarmProcessState = 'normal';
  private conditionActive = false;
  /** Since when the raw condition has wanted a change (raise when clear, clear when active). */
  private pendingSince: number | null = null;
  private rampSuppressed = false;
  private outOfService = false;
  private shelfRecord: Shelf | null = null;
  private raisedAtMs: number | null = null;
  private raisedValue: number | null = null;
  private conditionSinceMs: number | null = null;
  private lastValue: number | null = null;
  private groupHead: string | null = null;

  constructor(private def: AlarmLimit) {}

  /** The state to keep across a restart (see `AlarmMemory`). */
  memory(): AlarmMemory {
    return {
      process: this.process,
      conditionActive: this.conditionActive,
      outOfService: this.outOfService,
      shelf: this.shelfRecord && { ...this.shelfRecord },
      raisedAt: this.raisedAtMs,
      valueAtRaise: this.raisedValue,
      conditionSince: this.conditionSinceMs,
      firstOutOf: this.groupHead,
    };
  }

  /**
   * Takes over a remembered state (after a restart, or an operator action once it is stored).
   * The present value stays; delays and suppression by design start afresh.
   */
  adopt(memory: AlarmMemory): void {
    this.process = memory.process;
    this.conditionActive = memory.conditionActive;
    this.outOfService = memory.outOfService;
    this.shelfRecord = memory.shelf && { ...memory.shelf };
    this.raisedAtMs = memory.raisedAt;
    this.raisedValue = memory.valueAtRaise;
    this.conditionSinceMs = memory.conditionSince;
    this.groupHead = memory.firstOutOf;
    this.pendingSince = null;
  }

  /** A copy to try an operator action on before it is stored. */
  copy(): AlarmStateMachine {
    const twin = new AlarmStateMachine(this.def);
    twin.adopt(this.memory());
    twin.lastValue = this.lastValue;
    twin.rampSuppressed = this.rampSuppressed;
    twin.pendingSince = this.pendingSince;
    return twin;
  }

  /** Takes over the state of `twin` (a `copy()` an operator action was applied to), keeping the present value. */
  takeOver(twin: AlarmStateMachine): void {
    this.adopt(twin.memory());
    this.pendingSince = twin.pendingSince;
  }

  /** Takes the present value without evaluating (while an operator action on it is being stored). */
  observe(value: number | undefined): void {
    if (value !== undefined && Number.isFinite(value)) this.lastValue = value;
  }

  get limit(): AlarmLimit {
    return this.def;
  }

  /** State shown to the operator. */
  get state(): AlarmState {
    return this.suppression() ?? this.process;
  }

  /** Annunciated state underneath any suppression. */
  get processState(): AlarmProcessState {
    return this.process;
  }

  get raisedAt(): number | null {
    return this.raisedAtMs;
  }

  /** True while the alarm's condition holds (after its on-delay, until its off-delay ran out). */
  get conditionHolds(): boolean {
    return this.conditionActive;
  }

  /** Present value (the newest one evaluated). */
  get value(): number | null {
    return this.lastValue;
  }

  /** Value when the present raise happened; null while normal. */
  get valueAtRaise(): number | null {
    return this.raisedValue;
  }

  /** When the condition of the present raise began (before its on-delay); null while normal. */
  get conditionSince(): number | null {
    return this.conditionSinceMs;
  }

  get shelf(): Shelf | null {
    return this.shelfRecord;
  }

  get firstOutOf(): string | null {
    return this.groupHead;
  }

  /** Replaces the definition (same id) and keeps the state; the next evaluation uses it. */
  redefine(next: AlarmLimit): void {
    this.def = next;
  }

  /** Groups the present raise under the first-out alarm `headId`. */
  groupUnder(headId: string): void {
    this.groupHead = headId;
  }

  /**
   * Evaluates one value at `nowMs`: shelf expiry, suppression by design (`rampProgrammed`),
   * then the condition with deadband, on-delay and off-delay. A missing value leaves the
   * condition as it was. Returns the transitions in the order they happened.
   */
  evaluate(value: number | undefined, nowMs: number, rampProgrammed: boolean): AlarmEvent[] {
    const events: AlarmEvent[] = [];
    this.observe(value);
    if (this.shelfRecord && nowMs >= this.shelfRecord.until) {
      push(events, this.change('shelve-expired', nowMs, {}, () => this.updateSuppression(() => (this.shelfRecord = null))));
    }
    const suppress = rampProgrammed && this.def.suppressDuringRamp;
    if (suppress !== this.rampSuppressed) {
      const kind = suppress ? 'suppress' : 'unsuppress';
      push(events, this.change(kind, nowMs, {}, () => this.updateSuppression(() => (this.rampSuppressed = suppress))));
    }
    if (this.outOfService || value === undefined || !Number.isFinite(value)) return events;
    const edge = this.conditionEdge(value, nowMs);
    if (edge?.kind === 'raise') {
      const raise = this.change('raise', nowMs, {}, () => this.raise(nowMs, edge.since, value));
      if (raise) raise.conditionSince = edge.since;
      push(events, raise);
    }
    if (edge?.kind === 'clear') push(events, this.change('clear', nowMs, {}, () => this.clear()));
    return events;
  }

  /** Operator acknowledgement. Returns null when there is nothing to acknowledge. */
  acknowledge(actor: string, nowMs: number): AlarmEvent | null {
    const hidden = this.suppression();
    if (hidden) throw new AlarmRequestError('conflict', `alarm ${this.def.id} is ${hidden}; it cannot be acknowledged while hidden`);
    if (this.process === 'latched') {
      throw new AlarmRequestError('conflict', `alarm ${this.def.id} is latched: it clears with a reset (with a reason), not an acknowledgement`);
    }
    if (this.process !== 'unacknowledged' && this.process !== 'returned-unacknowledged') return null;
    return this.change('acknowledge', nowMs, { actor }, () => {
      this.setProcess(this.process === 'unacknowledged' ? 'acknowledged' : 'normal');
    });
  }

  /** Shelves for `minutes` (validated by the caller). Refused out of service or when already shelved. */
  shelve(actor: string, minutes: number, reason: string, nowMs: number): AlarmEvent | null {
    if (this.outOfService) throw new AlarmRequestError('conflict', `alarm ${this.def.id} is out of service; return it to service before shelving`);
    if (this.shelfRecord) {
      throw new AlarmRequestError('conflict', `alarm ${this.def.id} is already shelved until ${new Date(this.shelfRecord.until).toISOString()}; unshelve it first`);
    }
    return this.change('shelve', nowMs, { actor, reason }, () => {
      this.shelfRecord = { by: actor, reason, since: nowMs, until: nowMs + minutes * 60_000 };
    });
  }

  /** Ends shelving early. Refused when the alarm is not shelved. */
  unshelve(actor: string, nowMs: number, reason?: string): AlarmEvent | null {
    if (!this.shelfRecord) throw new AlarmRequestError('conflict', `alarm ${this.def.id} is not shelved`);
    return this.change('unshelve', nowMs, { actor, reason }, () => this.updateSuppression(() => (this.shelfRecord = null)));
  }

  /** Takes the alarm out of service (stops evaluating it) or returns it to service, from normal. */
  setOutOfService(actor: string, reason: string, on: boolean, nowMs: number): AlarmEvent | null {
    if (on === this.outOfService) {
      throw new AlarmRequestError('conflict', `alarm ${this.def.id} is already ${on ? 'out of service' : 'in service'}`);
    }
    return this.change(on ? 'out-of-service' : 'return-to-service', nowMs, { actor, reason }, () => {
      this.outOfService = on;
      this.shelfRecord = null;
      this.conditionActive = false;
      this.pendingSince = null;
      this.setProcess('normal');
    });
  }

  /** Clears a latched alarm whose condition has cleared; the reset also acknowledges it. */
  resetLatched(actor: string, reason: string, nowMs: number): AlarmEvent | null {
    if (this.process !== 'latched') {
      const why = this.def.latching && this.conditionActive ? 'its condition still holds' : 'it is not latched';
      throw new AlarmRequestError('conflict', `alarm ${this.def.id} cannot be reset: ${why}`);
    }
    return this.change('reset', nowMs, { actor, reason }, () => this.setProcess('normal'));
  }

  private suppression(): AlarmSuppression | null {
    if (this.outOfService) return 'out-of-service';
    if (this.shelfRecord) return 'shelved';
    if (this.rampSuppressed) return 'suppressed';
    return null;
  }

  /**
   * Applies `mutate` (which sets or lifts a suppression) and, when no suppression remains, drops a
   * return-to-normal nobody saw: the operator need not acknowledge what was never shown.
   */
  private updateSuppression(mutate: () => void): void {
    mutate();
    if (this.suppression() === null && this.process === 'returned-unacknowledged') this.setProcess('normal');
  }

  /** A raise or clear once its delay has passed; `since` is when the condition first wanted it. */
  private conditionEdge(value: number, nowMs: number): { kind: 'raise' | 'clear'; since: number } | null {
    const { limit, deadband, level, onDelayMs, offDelayMs } = this.def;
    const high = isHighLevel(level);
    const wantsChange = this.conditionActive
      ? high
        ? value <= limit - deadband
        : value >= limit + deadband
      : high
        ? value > limit
        : value < limit;
    if (!wantsChange) {
      this.pendingSince = null;
      return null;
    }
    const since = (this.pendingSince ??= nowMs);
    if (nowMs - since < (this.conditionActive ? offDelayMs : onDelayMs)) return null;
    this.pendingSince = null;
    this.conditionActive = !this.conditionActive;
    return { kind: this.conditionActive ? 'raise' : 'clear', since };
  }

  private raise(nowMs: number, since: number, value: number): void {
    this.raisedAtMs = nowMs;
    this.raisedValue = value;
    this.conditionSinceMs = since;
    this.groupHead = null;
    this.setProcess('unacknowledged');
  }

  private clear(): void {
    if (this.def.latching && (this.process === 'unacknowledged' || this.process === 'acknowledged')) {
      this.setProcess('latched');
    } else {
      this.setProcess(this.process === 'unacknowledged' ? 'returned-unacknowledged' : 'normal');
    }
  }

  private setProcess(next: AlarmProcessState): void {
    this.process = next;
    if (next === 'normal') {
      this.raisedAtMs = null;
      this.raisedValue = null;
      this.conditionSinceMs = null;
      this.groupHead = null;
    }
  }

  /** Runs `mutate` and describes the visible change as one event (null when nothing changed). */
  private change(kind: AlarmEventKind, at: number, details: EventDetails, mutate: () => void): AlarmEvent | null {
    const overlayBefore = this.suppression();
    const processBefore = this.process;
    mutate();
    const overlayAfter = this.suppression();
    let from: AlarmState;
    let to: AlarmState;
    let hidden: AlarmSuppression | undefined;
    if (overlayBefore !== overlayAfter) {
      from = overlayBefore ?? processBefore;
      to = overlayAfter ?? this.process;
    } else if (processBefore !== this.process) {
      from = processBefore;
      to = this.process;
      hidden = overlayAfter ?? undefined;
    } else {
      return null;
    }
    const event: AlarmEvent = {
      alarmId: this.def.id,
      channel: this.def.channel,
      priority: this.def.priority,
      kind,
      at,
      from,
      to,
      value: this.lastValue,
      limit: this.def.limit,
    };
    if (details.actor !== undefined) event.actor = details.actor;
    if (details.reason !== undefined) event.reason = details.reason;
    if (hidden) event.hidden = hidden;
    return event;
  }
}

function push(events: AlarmEvent[], event: AlarmEvent | null): void {
  if (event) events.push(event);
}
