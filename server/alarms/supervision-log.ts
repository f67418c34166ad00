/**
 * The writer of what alarms and the interlock produce, in two ways:
 *
 * * Records of actions — operator actions on alarms, trips, interlock resets — are written at
 *   once, each in its own transaction with its audit entry (`recordAlarmAction`, `recordTrip`,
 *   `recordReset`). The caller reports an action done, or lets it take effect, only once its
 *   promise has resolved; when it rejects, nothing was stored.
 * * Alarm transitions found by evaluation (raise, clear, shelf expiry) are queued and written
 *   in one transaction every `flushMs`, with the states of the alarms they changed, so a slow
 *   database never delays evaluation or a trip command.
 *
 * Every write runs after the ones before it, in order; none shares a transaction with telemetry.
 */
import { appendAuditEntries, appendAudit, type AuditEntry } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import type { ResetRecord, TripRecord } from '../interlock/interlock.js';
import { insertTrips, recordTripReset } from '../interlock/trip-repository.js';
import { insertAlarmEvents } from './alarm-event-repository.js';
import { upsertAlarmStates } from './alarm-state-repository.js';
import type { AlarmEvent, AlarmMemory } from './alarm-state.js';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

export interface SupervisionLogOptions {
  /** Longest wait before queued transitions are written, ms (default 250). */
  flushMs?: number;
  /** Transitions waiting beyond this are dropped oldest first, reported to `onError` (default 10 000). */
  maxQueue?: number;
  /** Pause before a trip whose record failed is written again, ms (default 1000). */
  retryMs?: number;
  /** The present states of the alarms named, to store with their transitions. */
  statesOf: (ids: ReadonlySet<string>) => Map<string, AlarmMemory>;
  /** Called with each failed write and each drop. */
  onError: (error: unknown) => void;
  /** Server clock, Unix epoch ms (default `Date.now`). */
  now?: () => number;
}

export class SupervisionLog {
  private events: AlarmEvent[] = [];
  private timer: NodeJS.Timeout | null = null;
  private retryTimer: NodeJS.Timeout | null = null;
  /** Trips whose record could not be written yet; retried until stored. */
  private unstoredTrips: TripRecord[] = [];
  private writing: Promise<unknown> = Promise.resolve();
  private closed = false;
  private readonly flushMs: number;
  private readonly maxQueue: number;
  private readonly now: () => number;

  constructor(
    private readonly db: Db,
    private readonly options: SupervisionLogOptions,
  ) {
    this.flushMs = options.flushMs ?? 250;
    this.maxQueue = options.maxQueue ?? 10_000;
    this.now = options.now ?? Date.now;
  }

  /** Queues transitions found by evaluation; those with an actor also go to the audit trail. */
  addAlarmEvents(events: readonly AlarmEvent[]): void {
    if (this.closed || events.length === 0) return;
    this.events.push(...events);
    const excess = this.events.length - this.maxQueue;
    if (excess > 0) {
      this.events.splice(0, excess);
      this.options.onError(new Error(`${excess} alarm events dropped: the database has not kept up with ${this.maxQueue} queued events`));
    }
    this.schedule();
  }

  /** Stores an operator action on an alarm: its event, its audit entry and the alarm's new state. */
  recordAlarmAction(event: AlarmEvent, memory: AlarmMemory): Promise<void> {
    return this.transaction(async (tx) => {
      await insertAlarmEvents(tx, [event]);
      await appendAuditEntries(tx, auditOfEvents([event]));
      await upsertAlarmStates(tx, new Map([[event.alarmId, memory]]), this.now());
    });
  }

  /**
   * Stores a trip and its audit entry (actor `system`). When the write fails the promise
   * rejects, and the trip is written again every `retryMs` until it is stored: the latch it
   * records is in force whether or not the database answers.
   */
  async recordTrip(trip: TripRecord): Promise<void> {
    try {
      await this.transaction((tx) => writeTrip(tx, trip));
    } catch (error) {
      this.unstoredTrips.push(trip);
      this.scheduleRetry();
      throw error;
    }
  }

  /** Stores a reset on its trip's row, with its audit entry, in one transaction. */
  recordReset(reset: ResetRecord): Promise<void> {
    return this.transaction((tx) => recordTripReset(tx, reset));
  }

  /** Writes everything queued so far; resolves once it is stored (or the write failed, reported). */
  flush(): Promise<void> {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    const done = this.writing.then(() => this.writeQueued());
    this.writing = done;
    return done;
  }

  /** Writes what is queued and stops; later records are ignored. */
  async close(): Promise<void> {
    this.closed = true;
    if (this.retryTimer) clearTimeout(this.retryTimer);
    this.retryTimer = null;
    await this.flush();
  }

  /** Runs `write` in its own transaction after every write before it (queued transitions first). */
  private transaction(write: (tx: Tx) => Promise<void>): Promise<void> {
    if (this.closed) return Promise.reject(new Error('the server is shutting down; nothing was recorded'));
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    const done = this.writing.then(() => this.writeQueued()).then(() => this.db.transaction(write));
    this.writing = done.catch(() => undefined);
    return done;
  }

  private schedule(): void {
    if (this.closed || this.timer) return;
    this.timer = setTimeout(() => void this.flush(), this.flushMs);
  }

  private scheduleRetry(): void {
    if (this.closed || this.retryTimer) return;
    this.retryTimer = setTimeout(() => {
      this.retryTimer = null;
      const trips = this.unstoredTrips;
      this.unstoredTrips = [];
      for (const trip of trips) this.recordTrip(trip).catch((error) => this.options.onError(error));
    }, this.options.retryMs ?? 1000);
  }

  private async writeQueued(): Promise<void> {
    const events = this.events;
    if (events.length === 0) return;
    this.events = [];
    try {
      const states = this.options.statesOf(new Set(events.map((e) => e.alarmId)));
      await this.db.transaction(async (tx) => {
        await insertAlarmEvents(tx, events);
        await appendAuditEntries(tx, auditOfEvents(events));
        await upsertAlarmStates(tx, states, this.now());
      });
    } catch (error) {
      this.options.onError(error);
    }
  }
}

async function writeTrip(tx: Tx, trip: TripRecord): Promise<void> {
  await insertTrips(tx, [trip]);
  await appendAudit(tx, {
    actor: 'system',
    action: 'interlock.trip',
    subject: 'interlock',
    oldValue: { state: 'ok' },
    newValue: { state: 'tripped', firstOut: trip.firstOut },
    reason: trip.reason,
    at: new Date(trip.at),
  });
}

/** Audit entries of the events that carry an actor (operator actions). */
function auditOfEvents(events: readonly AlarmEvent[]): AuditEntry[] {
  return events
    .filter((e) => e.actor !== undefined)
    .map((e) => ({
      actor: e.actor!,
      action: `alarm.${e.kind}`,
      subject: `alarm:${e.alarmId}`,
      oldValue: { state: e.from },
      newValue: { state: e.to },
      reason: e.reason ?? null,
      at: new Date(e.at),
    }));
}
