/**
 * All alarms of the apparatus: evaluates channel snapshots, applies operator requests and
 * groups cascades under their first-out alarm. Pure in-memory logic; the caller stores the
 * returned events (history and audit) and decides who may do what (roles).
 */
import type { ChannelId, ChannelValues } from './channels.js';
import { parseAlarmLimits, type AlarmLevel, type AlarmLimit, type AlarmPriority } from './alarm-limit.js';
import { AlarmStateMachine, type AlarmEvent, type AlarmState, type Shelf } from './alarm-state.js';
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
  limit: number;
  raisedAt: number | null;
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
  value: number | null;
  limit: number;
  firstOut: boolean;
  firstOutOf?: string;
}

const ANNUNCIATED_ACTIVE = new Set<AlarmState>(['unacknowledged', 'acknowledged', 'returned-unacknowledged', 'latched']);
const PRIORITY_RANK: Record<AlarmPriority, number> = { high: 0, medium: 1, low: 2 };

export class AlarmBook {
  private readonly alarms = new Map<string, AlarmStateMachine>();
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
      for (const event of alarm.evaluate(values[alarm.limit.channel], nowMs, ramp)) {
        if (event.kind === 'raise' && !event.hidden) {
          const head = this.grouper.assign(event.alarmId, event.at);
          if (head) {
            alarm.groupUnder(head);
            event.firstOutOf = head;
          }
        }
        events.push(event);
      }
    }
    this.changes += events.length;
    return events;
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
    return this.counted(this.get(id).acknowledge(checkActor(actor), this.clock()));
  }

  /** Shelves an alarm for `minutes` (0 < minutes ≤ `maxShelveMinutes`) with a required reason. */
  shelve(id: string, actor: string, minutes: unknown, reason: unknown): AlarmEvent | null {
    const alarm = this.get(id);
    if (typeof minutes !== 'number' || !Number.isFinite(minutes) || minutes <= 0 || minutes > this.maxShelveMinutes) {
      throw new AlarmRequestError(
        'invalid',
        `minutes must be a number of minutes above 0 and at most ${this.maxShelveMinutes}; got ${JSON.stringify(minutes) ?? String(minutes)}`,
      );
    }
    return this.counted(alarm.shelve(checkActor(actor), minutes, checkReason(reason, 'shelving'), this.clock()));
  }

  /** Ends shelving before its time. */
  unshelve(id: string, actor: string, reason?: unknown): AlarmEvent | null {
    const alarm = this.get(id);
    const why = typeof reason === 'string' && reason.trim() !== '' ? checkReason(reason, 'unshelving') : undefined;
    return this.counted(alarm.unshelve(checkActor(actor), this.clock(), why));
  }

  /** Takes an alarm out of service (`on`) or returns it to service; a reason is required. */
  setOutOfService(id: string, actor: string, reason: unknown, on: boolean): AlarmEvent | null {
    const alarm = this.get(id);
    return this.counted(
      alarm.setOutOfService(checkActor(actor), checkReason(reason, on ? 'taking an alarm out of service' : 'returning an alarm to service'), on, this.clock()),
    );
  }

  /** Resets a latched alarm whose condition has cleared; a reason is required. */
  resetLatched(id: string, actor: string, reason: unknown): AlarmEvent | null {
    const alarm = this.get(id);
    return this.counted(alarm.resetLatched(checkActor(actor), checkReason(reason, 'a reset'), this.clock()));
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
        limit: a.limit.limit,
        raisedAt: a.raisedAt,
        firstOut: heads.has(a.limit.id),
        shelf: a.shelf,
      };
      if (a.firstOutOf) status.firstOutOf = a.firstOutOf;
      return status;
    });
  }

  /**
   * Annunciated alarms that need the operator (unacknowledged, acknowledged, returned
   * unacknowledged, latched), highest priority first, then oldest first. Shelved, suppressed
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
        value: s.value,
        limit: s.limit,
        firstOut: s.firstOut,
      };
      if (s.firstOutOf) item.firstOutOf = s.firstOutOf;
      out.push(item);
    }
    return out.sort((a, b) => PRIORITY_RANK[a.priority] - PRIORITY_RANK[b.priority] || a.raisedAt - b.raisedAt);
  }

  private counted(event: AlarmEvent | null): AlarmEvent | null {
    if (event) this.changes++;
    return event;
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
  if (text === '') throw new AlarmRequestError('invalid', `reason is required for ${purpose}: say why in a few words`);
  if (text.length > MAX_REASON_CHARS) throw new AlarmRequestError('invalid', `reason must be at most ${MAX_REASON_CHARS} characters`);
  return text;
}
