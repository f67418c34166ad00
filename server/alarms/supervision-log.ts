/**
 * The writer of what alarms and the interlock produce, in two ways:
 *
 * * Records of actions by people — operator actions on alarms, interlock resets — are written
 *   at once, each in its own transaction with its audit entry (`recordAlarmAction`,
 *   `recordReset`). The caller reports an action done, or lets it take effect, only once its
 *   promise has resolved; when it rejects, nothing was stored.
 * * Supervision records — trips and the alarm transitions found by evaluation (raise, clear,
 *   shelf expiry) — go first into the journal in the data folder (`SupervisionJournal`,
 *   fsynced before the call returns, never waiting for the database), then into the database,
 *   each record in its own transaction: a trip at once, transitions at most `flushMs` later.
 *   While the database refuses them they stay in the journal and are written again with a
 *   growing pause (and at the next start, before anything is read back), in order, once each.
 *   The ids kept to make a replay store nothing twice are pruned at start and every ten
 *   minutes (`pruneApplied`): every id but those of the records the journal file still holds.
 *
 * Every write runs after the ones before it, in order; none shares a transaction with telemetry.
 */
import { appendAuditEntries, appendAudit, type AuditEntry } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { writeFailureText } from '../db/write-failure.js';
import type { ResetRecord, TripRecord } from '../interlock/interlock.js';
import { insertTrips, recordTripReset } from '../interlock/trip-repository.js';
import { insertAlarmEvents } from './alarm-event-repository.js';
import { upsertAlarmStates } from './alarm-state-repository.js';
import { forgetAppliedExcept, markApplied } from './applied-records.js';
import type { AlarmEvent, AlarmMemory } from './alarm-state.js';
import type { JournalCounters, SupervisionJournal, SupervisionRecord } from './supervision-journal.js';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

export interface SupervisionLogOptions {
  /** Where supervision records wait until the database has them. */
  journal: SupervisionJournal;
  /** Longest wait before journaled transitions are written, ms (default 250). */
  flushMs?: number;
  /** First pause before records the database refused are written again, ms (default 500; doubles up to 5 s). */
  retryMs?: number;
  /** The present states of the alarms named, to store with their transitions. */
  statesOf: (ids: ReadonlySet<string>) => Map<string, AlarmMemory>;
  /** Called with each failed write and each record refused by a full journal. */
  onError: (error: unknown) => void;
  /** Server clock, Unix epoch ms (default `Date.now`). */
  now?: () => number;
  /** How often the ids of applied records are pruned, ms (default ten minutes, as telemetry retention). */
  pruneEveryMs?: number;
}

/** The supervision records on `/api/health` (under `supervision`). */
export interface SupervisionCounters extends JournalCounters {
  /** Since when the database has refused the journaled records (ISO 8601); null while they are written. */
  failingSince: string | null;
  /** The newest reason the database gave; null while records are written. */
  lastError: string | null;
}

const MAX_RETRY_MS = 5000;
const PRUNE_EVERY_MS = 10 * 60_000;

export class SupervisionLog {
  private timer: NodeJS.Timeout | null = null;
  private retryTimer: NodeJS.Timeout | null = null;
  private readonly pruneTimer: NodeJS.Timeout;
  private retryDelayMs: number;
  private failure: { sinceMs: number; error: unknown } | null = null;
  private writing: Promise<unknown> = Promise.resolve();
  private closed = false;
  private readonly journal: SupervisionJournal;
  private readonly flushMs: number;
  private readonly now: () => number;

  constructor(
    private readonly db: Db,
    private readonly options: SupervisionLogOptions,
  ) {
    this.journal = options.journal;
    this.flushMs = options.flushMs ?? 250;
    this.retryDelayMs = options.retryMs ?? 500;
    this.now = options.now ?? Date.now;
    this.pruneTimer = setInterval(() => void this.pruneApplied(), options.pruneEveryMs ?? PRUNE_EVERY_MS);
    this.pruneTimer.unref();
  }

  /** Journals transitions found by evaluation with the states they left; the database gets them within `flushMs`. */
  addAlarmEvents(events: readonly AlarmEvent[]): void {
    if (this.closed || events.length === 0) return;
    const states = this.options.statesOf(new Set(events.map((e) => e.alarmId)));
    const stored = this.journal.append({ kind: 'alarm-events', atMs: this.now(), events: [...events], states: [...states] });
    if (!stored) this.options.onError(new Error(`${events.length} alarm transitions not recorded: the supervision journal is full`));
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
   * Journals a trip and writes it with its audit entry (actor `system`). Resolves once the
   * database has it; when the write fails the promise rejects, and the trip stays in the journal
   * and is written again until stored: the latch it records is in force whether or not the
   * database answers.
   */
  async recordTrip(trip: TripRecord): Promise<void> {
    if (this.closed) throw new Error('the server is shutting down; the trip was not recorded');
    const record = this.journal.append({ kind: 'trip', trip })!;
    await this.flush();
    if (this.journal.pending().some((r) => r.id === record.id)) throw this.failure?.error ?? new Error('the trip was not written');
  }

  /** Stores a reset on its trip's row, with its audit entry, in one transaction. */
  recordReset(reset: ResetRecord): Promise<void> {
    return this.transaction((tx) => recordTripReset(tx, reset));
  }

  /**
   * Writes every journaled record; resolves once done (what the database refused stays
   * journaled, reported). While the database refuses them and a retry is due, readers that
   * flush before reading back do not try again each time: the retry does.
   */
  flush(): Promise<void> {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    const done = this.writing.then(() => (this.retryTimer ? undefined : this.writeJournaled()));
    this.writing = done;
    return done;
  }

  /**
   * Forgets the ids of applied records that no replay can take any more: all but those of the
   * records the journal file holds. Runs between writes, so no id is stored meanwhile, and after
   * the file is flushed to the disk, so a record emptied out of it counts as gone only once the
   * disk agrees. A failure is reported; the next round tries again.
   */
  pruneApplied(): Promise<void> {
    if (this.closed) return Promise.resolve();
    const done = this.writing
      .then(async () => {
        await this.journal.sync();
        await forgetAppliedExcept(this.db, this.journal.recordIds());
      })
      .catch((error: unknown) => this.options.onError(new Error(`forgetting the ids of stored supervision records failed: ${writeFailureText(error)}`, { cause: error })));
    this.writing = done;
    return done;
  }

  counters(): SupervisionCounters {
    return {
      ...this.journal.counters(),
      failingSince: this.failure ? new Date(this.failure.sinceMs).toISOString() : null,
      lastError: this.failure ? writeFailureText(this.failure.error) : null,
    };
  }

  /** Writes what is journaled and stops; what the database still refuses waits in the journal for the next start. */
  async close(): Promise<void> {
    this.closed = true;
    clearInterval(this.pruneTimer);
    if (this.retryTimer) clearTimeout(this.retryTimer);
    this.retryTimer = null;
    await this.flush();
    this.journal.close();
  }

  /** Runs `write` in its own transaction after every write before it (journaled records first). */
  private transaction(write: (tx: Tx) => Promise<void>): Promise<void> {
    if (this.closed) return Promise.reject(new Error('the server is shutting down; nothing was recorded'));
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    const done = this.writing.then(() => this.writeJournaled()).then(() => this.db.transaction(write));
    this.writing = done.catch(() => undefined);
    return done;
  }

  private schedule(): void {
    if (this.closed || this.timer) return;
    this.timer = setTimeout(() => void this.flush(), this.flushMs);
  }

  /** Writes the journaled records in order, each once; stops at the first the database refuses and tries again later. */
  private async writeJournaled(): Promise<void> {
    for (const record of [...this.journal.pending()]) {
      try {
        await this.db.transaction((tx) => writeRecord(tx, record, this.now()));
      } catch (error) {
        this.failure = { sinceMs: this.failure?.sinceMs ?? this.now(), error };
        this.options.onError(error);
        this.scheduleRetry();
        return;
      }
      this.journal.written(record.id);
    }
    this.failure = null;
    this.retryDelayMs = this.options.retryMs ?? 500;
  }

  private scheduleRetry(): void {
    if (this.closed || this.retryTimer) return;
    this.retryTimer = setTimeout(() => {
      this.retryTimer = null;
      void this.flush();
    }, this.retryDelayMs);
    this.retryTimer.unref();
    this.retryDelayMs = Math.min(MAX_RETRY_MS, this.retryDelayMs * 2);
  }
}

/** Writes one journaled record with its id; a record whose id is on record already is skipped. */
async function writeRecord(tx: Tx, record: SupervisionRecord, nowMs: number): Promise<void> {
  if (!(await markApplied(tx, record.id, nowMs))) return;
  if (record.kind === 'trip') return writeTrip(tx, record.trip);
  await insertAlarmEvents(tx, record.events);
  await appendAuditEntries(tx, auditOfEvents(record.events));
  await upsertAlarmStates(tx, new Map(record.states), record.atMs);
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
