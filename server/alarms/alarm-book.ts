/**
 * All alarms of the apparatus: evaluates channel snapshots, applies operator requests and
 * groups cascades under their first-out alarm. Pure in-memory logic; the caller stores the
 * returned events (history and audit) and decides who may do what (roles).
 */
import type { ChannelId, ChannelValues } from './channels.js';
import { parseAlarmLimits, type AlarmLevel, type AlarmLimit, type AlarmPriority } from './alarm-limit.js';
import { AlarmStateMachine, type AlarmEvent, type AlarmMemory, type AlarmState, type Shelf } from './alarm-state.js';
import { AlarmRequestError } from './alarm-request-error.js';
import { FirstOutGrouper, DEFAULT_FIRST_OUT_WINDOW_MS } from './first-out.js';

/** Longest shelving an operator may ask for, minutes (one shift). */
export const DEFAULT_MAX_SHELVE_MINUTES = 8 * 60;
const MAX_REASON_CHARS = 500;

export interface AlarmBookOptions {
  /** Server clock for operator requests, Unix epoch ms (default `Date.now`). */
  clock?: () => number;
  firstOutWindowMs?: number;
  maxShelveMinutes?: number;
}

export interface EvaluationContext {
  /** True while a ramp or sequence is programmed: suppresses limits marked `suppressDuringRamp`. */
  rampProgrammed?: boolean;
}

/** One alarm as the Alarms page lists it. Times in Unix epoch ms. */
export interface AlarmStatus {
  id: string;
  channel: ChannelId;
  level: AlarmLevel;
  priority: AlarmPriority;
  state: AlarmState;
  /** Present value (channel unit), null before the first one. */
  value: number | null;
  /** Value when the present raise happened; null while normal. */
  valueAtRaise: number | null;
  limit: number;
  raisedAt: number | null;
  /** When the condition of the present raise began (before its on-delay); null while normal. */
  conditionSince: number | null;
  /** True when later active alarms are grouped under this one. */
  firstOut: boolean;
  firstOutOf?: string;
  shelf: Shelf | null;
}

/** Body item of `GET /api/alarms?state=active`. */
export interface ActiveAlarm {
  id: string;
  channel: ChannelId;
  priority: AlarmPriority;
  state: AlarmState;
  raisedAt: number;
  /** When the condition began, before the on-delay. */
  conditionSince: number;
  /** Present value. */
  value: number | null;
  valueAtRaise: number | null;
  limit: number;
  firstOut: boolean;
  firstOutOf?: string;
}

/** An operator request on one alarm (the body of its route, not yet checked). */
export type AlarmRequest =
  | { kind: 'acknowledge' }
  | { kind: 'shelve'; minutes?: unknown; reason?: unknown }
  | { kind: 'unshelve'; reason?: unknown }
  | { kind: 'out-of-service'; on: boolean; reason?: unknown }
  | { kind: 'reset'; reason?: unknown };

/**
 * An operator action worked out but not yet applied: store `event` and `memory` (the alarm's
 * state afterwards), then `commit()`; if storing fails, `cancel()` and nothing has changed.
 * Until one of them is called, the alarm is not evaluated (its value is still taken) and a
 * second request on it is refused.
 */
export interface PreparedAction {
  event: AlarmEvent;
  memory: AlarmMemory;
  commit(): void;
  cancel(): void;
}

const ANNUNCIATED_ACTIVE = new Set<AlarmState>(['unacknowledged', 'acknowledged', 'returned-unacknowledged', 'latched']);
const PRIORITY_RANK: Record<AlarmPriority, number> = { high: 0, medium: 1, low: 2 };

export class AlarmBook {
  private readonly alarms = new Map<string, AlarmStateMachine>();
  /** Alarms with an operator action being stored. */
  private readonly busy = new Set<string>();
  private readonly grouper: FirstOutGrouper;
  private readonly clock: () => number;
  private changes = 0;
  readonly maxShelveMinutes: number;

  /** @param limits validated limits (see `parseAlarmLimits`); ids must be unique. */
  constructor(limits: readonly AlarmLimit[], options: AlarmBookOptions = {}) {
    parseAlarmLimits(limits);
    for (const l of limits) this.alarms.set(l.id, new AlarmStateMachine(l));
    this.grouper = new FirstOutGrouper(options.firstOutWindowMs ?? DEFAULT_FIRST_OUT_WINDOW_MS);
    this.clock = options.clock ?? Date.now;
    this.maxShelveMinutes = options.maxShelveMinutes ?? DEFAULT_MAX_SHELVE_MINUTES;
    if (!(this.maxShelveMinutes > 0)) throw new Error(`maxShelveMinutes must be more than 0, got ${this.maxShelveMinutes}`);
  }

  /**
   * Evaluates every alarm against `values` at server time `nowMs` (Unix epoch ms) and returns
   * the transitions. Call it on every frame and also on a timer (a few hertz) so that stale
   * data, off-delays and shelf expiry progress when no frames arrive.
   */
  evaluate(values: ChannelValues, nowMs: number, context: EvaluationContext = {}): AlarmEvent[] {
    const ramp = context.rampProgrammed ?? false;
    const events: AlarmEvent[] = [];
    for (const alarm of this.alarms.values()) {
      const value = values[alarm.limit.channel];
      if (this.busy.has(alarm.limit.id)) {
        alarm.observe(value);
        continue;
      }
      for (const event of alarm.evaluate(value, nowMs, ramp)) {
        if (event.kind === 'raise' && !event.hidden) this.group(alarm, event);
        events.push(event);
      }
    }
    this.changes += events.length;
    return events;
  }

  /** Places an annunciated raise in its first-out group, by the time its condition began. */
  private group(alarm: AlarmStateMachine, event: AlarmEvent): void {
    const open = this.grouper.head();
    if (open && !this.groupHolds(open, alarm)) this.grouper.close();
    const { head, replaced } = this.grouper.assign(event.alarmId, event.conditionSince ?? event.at);
    if (head) {
      alarm.groupUnder(head);
      event.firstOutOf = head;
    }
    if (!replaced) return;
    this.changes++;
    for (const other of this.alarms.values()) {
      if (other.raisedAt !== null && (other.limit.id === replaced || other.firstOutOf === replaced)) other.groupUnder(event.alarmId);
    }
  }

  /** True while the condition of the group's head or of an alarm grouped under it (other than `raising`) still holds. */
  private groupHolds(headId: string, raising: AlarmStateMachine): boolean {
    for (const a of this.alarms.values()) {
      if (a !== raising && a.conditionHolds && (a.limit.id === headId || a.firstOutOf === headId)) return true;
    }
    return false;
  }

  /**
   * Works out an operator request on alarm `id` without applying it (see `PreparedAction`).
   * Throws `AlarmRequestError` when it is refused; null when it would change nothing.
   */
  prepare(id: string, actor: string, request: AlarmRequest): PreparedAction | null {
    const alarm = this.get(id);
    if (this.busy.has(id)) throw new AlarmRequestError('conflict', `another action on alarm ${id} is being recorded; look again and retry`);
    const twin = alarm.copy();
    const event = this.run(twin, checkActor(actor), request);
    if (!event) return null;
    this.busy.add(id);
    let open = true;
    const close = () => {
      if (!open) throw new Error(`the action on alarm ${id} was already committed or cancelled`);
      open = false;
      this.busy.delete(id);
    };
    return {
      event,
      memory: twin.memory(),
      commit: () => {
        close();
        alarm.takeOver(twin);
        this.changes++;
      },
      cancel: close,
    };
  }

  /** Applies a request at once (no storage in between); null when it changed nothing. */
  request(id: string, actor: string, request: AlarmRequest): AlarmEvent | null {
    const prepared = this.prepare(id, actor, request);
    prepared?.commit();
    return prepared?.event ?? null;
  }

  /** The state of every alarm to keep across a restart, by id. */
  memories(ids?: Iterable<string>): Map<string, AlarmMemory> {
    const out = new Map<string, AlarmMemory>();
    for (const id of ids ?? this.alarms.keys()) {
      const alarm = this.alarms.get(id);
      if (alarm && !this.busy.has(id)) out.set(id, alarm.memory());
    }
    return out;
  }

  /** Takes over states remembered before a restart; ids no longer defined are ignored. */
  restore(memories: ReadonlyMap<string, AlarmMemory>): void {
    for (const [id, memory] of memories) this.alarms.get(id)?.adopt(memory);
    this.changes++;
  }

  private run(alarm: AlarmStateMachine, actor: string, request: AlarmRequest): AlarmEvent | null {
    const now = this.clock();
    switch (request.kind) {
      case 'acknowledge':
        return alarm.acknowledge(actor, now);
      case 'shelve': {
        const { minutes } = request;
        if (typeof minutes !== 'number' || !Number.isFinite(minutes) || minutes <= 0 || minutes > this.maxShelveMinutes) {
          throw new AlarmRequestError(
            'invalid',
            `Minutes: must be a number of minutes above 0 and at most ${this.maxShelveMinutes}; got ${JSON.stringify(minutes) ?? String(minutes)}`,
            'minutes',
          );
        }
        return alarm.shelve(actor, minutes, checkReason(request.reason, 'shelving'), now);
      }
      case 'unshelve': {
        const why = typeof request.reason === 'string' && request.reason.trim() !== '' ? checkReason(request.reason, 'unshelving') : undefined;
        return alarm.unshelve(actor, now, why);
      }
      case 'out-of-service':
        return alarm.setOutOfService(
          actor,
          checkReason(request.reason, request.on ? 'taking an alarm out of service' : 'returning an alarm to service'),
          request.on,
          now,
        );
      case 'reset':
        return alarm.resetLatched(actor, checkReason(request.reason, 'a reset'), now);
    }
  }

  /**
   * A number that changes whenever an alarm changes state, grouping or definition (every
   * transition is an event), not on mere value changes: lets a caller tell in constant time
   * whether the active list has news.
   */
  revision(): number {
    return this.changes;
  }

  /** Acknowledges an alarm; null when it had nothing to acknowledge. */
  acknowledge(id: string, actor: string): AlarmEvent | null {
    return this.request(id, actor, { kind: 'acknowledge' });
  }

  /** Shelves an alarm for `minutes` (0 < minutes ≤ `maxShelveMinutes`) with a required reason. */
  shelve(id: string, actor: string, minutes: unknown, reason: unknown): AlarmEvent | null {
    return this.request(id, actor, { kind: 'shelve', minutes, reason });
  }

  /** Ends shelving before its time. */
  unshelve(id: string, actor: string, reason?: unknown): AlarmEvent | null {
    return this.request(id, actor, { kind: 'unshelve', reason });
  }

  /** Takes an alarm out of service (`on`) or returns it to service; a reason is required. */
  setOutOfService(id: string, actor: string, reason: unknown, on: boolean): AlarmEvent | null {
    return this.request(id, actor, { kind: 'out-of-service', on, reason });
  }

  /** Resets a latched alarm whose condition has cleared; a reason is required. */
  resetLatched(id: string, actor: string, reason: unknown): AlarmEvent | null {
    return this.request(id, actor, { kind: 'reset', reason });
  }

  /**
   * Replaces the definition of an existing alarm (a lead's edit) and returns the old one for
   * the audit trail. The whole set is re-validated (level order on the channel); the alarm
   * keeps its state and the next evaluation applies the new levels.
   */
  updateLimit(next: AlarmLimit): AlarmLimit {
    const alarm = this.get(next.id);
    const previous = alarm.limit;
    if (next.channel !== previous.channel) {
      throw new AlarmRequestError('invalid', `alarm ${next.id} watches ${previous.channel}; a limit on ${next.channel} needs a new id`);
    }
    const set = [...this.alarms.values()].map((a) => (a === alarm ? next : a.limit));
    try {
      parseAlarmLimits(set);
    } catch (err) {
      throw new AlarmRequestError('invalid', (err as Error).message);
    }
    alarm.redefine(next);
    this.changes++;
    return previous;
  }

  limits(): AlarmLimit[] {
    return [...this.alarms.values()].map((a) => a.limit);
  }

  /** Every alarm with its state, in definition order. */
  list(): AlarmStatus[] {
    const heads = this.heads();
    return [...this.alarms.values()].map((a) => {
      const status: AlarmStatus = {
        id: a.limit.id,
        channel: a.limit.channel,
        level: a.limit.level,
        priority: a.limit.priority,
        state: a.state,
        value: a.value,
        valueAtRaise: a.valueAtRaise,
        limit: a.limit.limit,
        raisedAt: a.raisedAt,
        conditionSince: a.conditionSince,
        firstOut: heads.has(a.limit.id),
        shelf: a.shelf,
      };
      if (a.firstOutOf) status.firstOutOf = a.firstOutOf;
      return status;
    });
  }

  /**
   * Annunciated alarms that need the operator (unacknowledged, acknowledged, returned
   * unacknowledged, latched), highest priority first, then by the time their condition began. Shelved, suppressed
   * and out-of-service alarms are listed by `list()` only.
   */
  active(): ActiveAlarm[] {
    const out: ActiveAlarm[] = [];
    for (const s of this.list()) {
      if (!ANNUNCIATED_ACTIVE.has(s.state) || s.raisedAt === null) continue;
      const item: ActiveAlarm = {
        id: s.id,
        channel: s.channel,
        priority: s.priority,
        state: s.state,
        raisedAt: s.raisedAt,
        conditionSince: s.conditionSince ?? s.raisedAt,
        value: s.value,
        valueAtRaise: s.valueAtRaise,
        limit: s.limit,
        firstOut: s.firstOut,
      };
      if (s.firstOutOf) item.firstOutOf = s.firstOutOf;
      out.push(item);
    }
    return out.sort((a, b) => PRIORITY_RANK[a.priority] - PRIORITY_RANK[b.priority] || a.conditionSince - b.conditionSince);
  }

  private get(id: string): AlarmStateMachine {
    const alarm = this.alarms.get(id);
    if (!alarm) throw new AlarmRequestError('not-found', `no alarm with id "${id}"`);
    return alarm;
  }

  /** Ids of alarms that at least one other alarm is grouped under. */
  private heads(): Set<string> {
    const heads = new Set<string>();
    for (const a of this.alarms.values()) if (a.firstOutOf) heads.add(a.firstOutOf);
    return heads;
  }
}

function checkActor(actor: string): string {
  if (typeof actor !== 'string' || actor.trim() === '') throw new AlarmRequestError('invalid', 'actor must name the signed-in user');
  return actor;
}

function checkReason(reason: unknown, purpose: string): string {
  const text = typeof reason === 'string' ? reason.trim() : '';
  if (text === '') throw new AlarmRequestError('invalid', `Reason: is required for ${purpose}: say why in a few words`, 'reason');
  if (text.length > MAX_REASON_CHARS) throw new AlarmRequestError('invalid', `Reason: must be at most ${MAX_REASON_CHARS} characters`, 'reason');
  return text;
}
