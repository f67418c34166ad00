/**
 * Background writer of what alarms and the interlock produce: alarm events (the history),
 * trips, and their audit entries (operator actions on alarms, trips). Evaluation only queues
 * (no await, no I/O); a timer writes the queue in one transaction every `flushMs`, so a slow
 * database can never delay a trip command. Writes run one after another, in queue order.
 */
import { appendAuditEntries, type AuditEntry } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import type { TripRecord } from '../interlock/interlock.js';
import { insertTrips } from '../interlock/trip-repository.js';
import { insertAlarmEvents } from './alarm-event-repository.js';
import type { AlarmEvent } from './alarm-state.js';

export interface SupervisionLogOptions {
  /** Longest wait before queued records are written, ms (default 250). */
  flushMs?: number;
  /** Alarm events waiting beyond this are dropped oldest first, reported to `onError` (default 10 000). */
  maxQueue?: number;
  /** Called with each failed write (its records are lost) and each drop. */
  onError: (error: unknown) => void;
}

export class SupervisionLog {
  private events: AlarmEvent[] = [];
  private trips: TripRecord[] = [];
  private audits: AuditEntry[] = [];
  private timer: NodeJS.Timeout | null = null;
  private writing: Promise<void> = Promise.resolve();
  private closed = false;
  private readonly flushMs: number;
  private readonly maxQueue: number;

  constructor(
    private readonly db: Db,
    private readonly options: SupervisionLogOptions,
  ) {
    this.flushMs = options.flushMs ?? 250;
    this.maxQueue = options.maxQueue ?? 10_000;
  }

  /** Queues alarm events; those with an actor (operator actions) also go to the audit trail. */
  addAlarmEvents(events: readonly AlarmEvent[]): void {
    if (this.closed || events.length === 0) return;
    for (const e of events) {
      this.events.push(e);
      if (e.actor !== undefined) {
        this.audits.push({
          actor: e.actor,
          action: `alarm.${e.kind}`,
          subject: `alarm:${e.alarmId}`,
          oldValue: { state: e.from },
          newValue: { state: e.to },
          reason: e.reason ?? null,
          at: new Date(e.at),
        });
      }
    }
    this.bound(this.events);
    this.schedule();
  }

  /** Queues a trip and its audit entry (actor `system`). */
  addTrip(trip: TripRecord): void {
    if (this.closed) return;
    this.trips.push(trip);
    this.audits.push({
      actor: 'system',
      action: 'interlock.trip',
      subject: 'interlock',
      oldValue: { state: 'ok' },
      newValue: { state: 'tripped', firstOut: trip.firstOut },
      reason: trip.reason,
      at: new Date(trip.at),
    });
    this.schedule();
  }

  /** Writes everything queued so far; resolves once it is stored (or the write failed, reported). */
  flush(): Promise<void> {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.writing = this.writing.then(() => this.writeQueued());
    return this.writing;
  }

  /** Writes what is queued and stops; later records are ignored. */
  async close(): Promise<void> {
    this.closed = true;
    await this.flush();
  }

  private schedule(): void {
    if (this.closed || this.timer) return;
    this.timer = setTimeout(() => void this.flush(), this.flushMs);
  }

  private bound(queue: unknown[]): void {
    const excess = queue.length - this.maxQueue;
    if (excess > 0) {
      queue.splice(0, excess);
      this.options.onError(new Error(`${excess} alarm events dropped: the database has not kept up with ${this.maxQueue} queued events`));
    }
  }

  private async writeQueued(): Promise<void> {
    const events = this.events;
    const trips = this.trips;
    const audits = this.audits;
    if (events.length + trips.length + audits.length === 0) return;
    this.events = [];
    this.trips = [];
    this.audits = [];
    try {
      await this.db.transaction(async (tx) => {
        await insertTrips(tx, trips);
        await insertAlarmEvents(tx, events);
        await appendAuditEntries(tx, audits);
      });
    } catch (error) {
      this.options.onError(error);
    }
  }
}
