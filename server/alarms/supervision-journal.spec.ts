import { appendFileSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { auditLog, alarmEvents, alarmStates, interlockTrips, supervisionRecordsApplied } from '../db/schema.js';
import { openDatabase, type OpenDatabase } from '../db/database.js';
import { Interlock } from '../interlock/interlock.js';
import { testDatabaseUrl } from '../testing/external-services.js';
import { refuseWrites } from '../testing/refuse-writes.js';
import { useTempDatabase } from '../testing/temp-database.js';
import { makeDataDir, removeDataDir } from '../testing/test-server.js';
import type { AlarmEvent, AlarmMemory } from './alarm-state.js';
import { SUPERVISION_JOURNAL_FILE, SupervisionJournal } from './supervision-journal.js';
import { SupervisionLog } from './supervision-log.js';

const T0 = Date.UTC(2026, 11, 2, 9, 0, 0);

const raise: AlarmEvent = {
  alarmId: 'flow.x.LL',
  channel: 'flow.x',
  priority: 'high',
  kind: 'raise',
  at: T0,
  from: 'normal',
  to: 'unacknowledged',
  value: 0.5,
  limit: 1.5,
};
const raised: AlarmMemory = {
  process: 'unacknowledged',
  conditionActive: true,
  outOfService: false,
  shelf: null,
  raisedAt: T0,
  valueAtRaise: 0.5,
  conditionSince: T0,
  firstOutOf: null,
};

/**
 * The supervision journal with a real database (PGlite, or PostgreSQL in the external pass),
 * which refuses writes through a trigger (as during an outage). A "restart" is a new journal
 * and log on the same data folder.
 */
describe('supervision journal', () => {
  let dir: string;
  let database: OpenDatabase;
  let now = T0;
  const errors: unknown[] = [];

  beforeEach(async () => {
    dir = await makeDataDir();
    database = await openDatabase({ dataDir: dir, databaseUrl: await testDatabaseUrl(dir) });
    errors.length = 0;
  });
  afterEach(async () => {
    await database.close();
    removeDataDir(dir);
  });

  /** A journal and its writer on the data folder, as the server starts them. */
  function open(maxBytes?: number) {
    const journal = new SupervisionJournal(dir, { maxBytes });
    // Retries far off: each test writes with `flush()` when it wants to.
    const log = new SupervisionLog(database.db, { journal, statesOf: () => new Map([['flow.x.LL', raised]]), onError: (e) => errors.push(e), retryMs: 3_600_000, now: () => now });
    return { journal, log };
  }
  const trip = () => new Interlock().foundAtStart(T0 + 100)!;
  const rows = async () => ({
    trips: await database.db.select().from(interlockTrips),
    events: await database.db.select().from(alarmEvents),
    audit: (await database.db.select().from(auditLog)).filter((a) => a.action === 'interlock.trip'),
    states: await database.db.select().from(alarmStates),
  });
  const fileBytes = () => statSync(path.join(dir, SUPERVISION_JOURNAL_FILE)).size;

  it('keeps a trip and alarm transitions the database refuses through a restart, and stores them once, in order, when it takes them', async () => {
    const refusal = await refuseWrites(database.db, 'alarm_events');
    const first = open();
    first.log.addAlarmEvents([raise]);
    // The trip waits behind the refused transitions: records are written in order.
    await expect(first.log.recordTrip(trip())).rejects.toThrow(/insert into "alarm_events"/);
    expect(first.log.counters()).toMatchObject({ journalPending: 2, failingSince: new Date(T0).toISOString(), lastError: 'storage refused for the test' });
    expect(fileBytes()).toBeGreaterThan(0);
    expect((await rows()).trips).toEqual([]);
    await first.log.close();

    await refusal.allow();
    const second = open();
    expect(second.journal.pending().map((r) => r.kind)).toEqual(['alarm-events', 'trip']);
    await second.log.flush();
    const stored = await rows();
    expect(stored.trips).toHaveLength(1);
    expect(stored.trips[0]).toMatchObject({ trippedAtMs: T0 + 100, firstOut: { condition: 'found-at-start' } });
    expect(stored.audit).toHaveLength(1);
    expect(stored.events).toHaveLength(1);
    expect(stored.events[0]).toMatchObject({ alarmId: 'flow.x.LL', kind: 'raise', atMs: T0 });
    expect(stored.states).toEqual([expect.objectContaining({ alarmId: 'flow.x.LL', memory: raised })]);
    expect(second.log.counters()).toMatchObject({ journalPending: 0, journalBytes: 0, failingSince: null });
    expect(fileBytes()).toBe(0);
    await second.log.close();
  });

  it('does not store a record twice when it is replayed after a write whose confirmation was lost', async () => {
    const first = open();
    first.log.addAlarmEvents([raise]);
    const journaled = readFileSync(path.join(dir, SUPERVISION_JOURNAL_FILE));
    await first.log.flush();
    expect((await rows()).events).toHaveLength(1);
    await first.log.close();
    // As if the process had died after the commit and before the journal was emptied.
    writeFileSync(path.join(dir, SUPERVISION_JOURNAL_FILE), journaled);

    const second = open();
    expect(second.journal.pending()).toHaveLength(1);
    await second.log.flush();
    expect((await rows()).events).toHaveLength(1);
    expect(second.journal.pending()).toHaveLength(0);
    await second.log.close();
  });

  it('drops a line cut off by a crash and keeps the whole lines before it', async () => {
    const first = open();
    first.log.addAlarmEvents([raise]);
    first.journal.close();
    const file = path.join(dir, SUPERVISION_JOURNAL_FILE);
    const whole = fileBytes();
    appendFileSync(file, '{"id":"cut-off","kind":"tr');

    const second = open();
    expect(second.journal.counters()).toMatchObject({ journalPending: 1, journalUnreadable: 1, journalBytes: whole });
    second.log.addAlarmEvents([{ ...raise, at: T0 + 1, kind: 'clear', from: 'unacknowledged', to: 'normal' }]);
    await second.log.flush();
    expect((await rows()).events.map((e) => e.kind).sort()).toEqual(['clear', 'raise']);
    await second.log.close();
  });

  it('refuses alarm transitions beyond its size, counted, and still keeps a trip', async () => {
    await refuseWrites(database.db, 'alarm_events');
    const { journal, log } = open(1000);
    for (let i = 0; i < 5; i++) log.addAlarmEvents([{ ...raise, at: T0 + i }]);
    expect(journal.counters().journalDropped).toBeGreaterThan(0);
    expect(errors.some((e) => /journal is full/.test(String(e)))).toBe(true);
    const before = journal.counters().journalPending;
    await expect(log.recordTrip(trip())).rejects.toThrow();
    expect(journal.counters().journalPending).toBe(before + 1);
    expect(journal.counters().journalBytes).toBeGreaterThan(1000);
    await log.close();
  });

  it('never lets a journaled state written late undo a newer state stored by an action', async () => {
    // The journaled batch is refused (its id cannot be stored) while the action goes through.
    const refusal = await refuseWrites(database.db, 'supervision_records_applied');
    const { log } = open();
    log.addAlarmEvents([raise]);
    now = T0 + 5000;
    const acknowledged: AlarmMemory = { ...raised, process: 'acknowledged' };
    await log.recordAlarmAction({ ...raise, kind: 'acknowledge', at: now, from: 'unacknowledged', to: 'acknowledged', actor: 'operator@tiltwatch.example' }, acknowledged);
    await refusal.allow();
    await log.close(); // writes what is journaled
    const stored = await rows();
    expect(stored.events.map((e) => e.kind).sort()).toEqual(['acknowledge', 'raise']);
    expect(stored.states[0].memory.process).toBe('acknowledged');
    now = T0;
  });
});

/**
 * Pruning the ids that keep a replay from storing a record twice (real PGlite): an id goes only
 * once its record has left the journal file.
 */
describe('forgetting the ids of stored supervision records', () => {
  const temp = useTempDatabase();
  let dir: string;
  const errors: unknown[] = [];

  beforeEach(async () => {
    dir = await makeDataDir();
    errors.length = 0;
  });
  afterEach(() => removeDataDir(dir));

  function open(pruneEveryMs?: number) {
    const journal = new SupervisionJournal(dir);
    const log = new SupervisionLog(temp.db, { journal, statesOf: () => new Map([['flow.x.LL', raised]]), onError: (e) => errors.push(e), retryMs: 3_600_000, pruneEveryMs });
    return { journal, log };
  }
  const appliedIds = async () => (await temp.db.select().from(supervisionRecordsApplied)).map((r) => r.id).sort();
  const eventsAt = async (atMs: number) => (await temp.db.select().from(alarmEvents)).filter((e) => e.atMs === atMs);
  const tripsAt = async (atMs: number) => (await temp.db.select().from(interlockTrips)).filter((t) => t.trippedAtMs === atMs);

  it('forgets ids of records gone from the journal, keeps those it still holds, and a replay after pruning stores nothing twice', async () => {
    const first = open();
    // Stored, and the file emptied: no replay can take this record again.
    first.log.addAlarmEvents([{ ...raise, at: T0 + 10 }]);
    await first.log.flush();
    const [gone] = await appliedIds();
    expect(first.journal.recordIds()).toEqual([]);

    // Stored, but still in the file behind a trip the database refuses.
    const refusal = await refuseWrites(temp.db, 'interlock_trips');
    first.log.addAlarmEvents([{ ...raise, at: T0 + 20 }]);
    await expect(first.log.recordTrip(new Interlock().foundAtStart(T0 + 30)!)).rejects.toThrow(/insert into "interlock_trips"/);
    const [written, refused] = first.journal.recordIds();
    expect(first.journal.pending().map((r) => r.id)).toEqual([refused]);
    expect(await appliedIds()).toEqual([gone, written].sort());

    await first.log.pruneApplied();
    expect(await appliedIds()).toEqual([written]);
    await first.log.close(); // the trip is still refused: both records stay in the file, as after a crash

    await refusal.allow();
    const second = open();
    expect(second.journal.pending().map((r) => r.id)).toEqual([written, refused]);
    await second.log.pruneApplied();
    expect(await appliedIds()).toEqual([written]);
    await second.log.flush();
    expect(await eventsAt(T0 + 20)).toHaveLength(1);
    expect(await tripsAt(T0 + 30)).toHaveLength(1);
    expect(second.journal.recordIds()).toEqual([]);

    await second.log.pruneApplied();
    expect(await appliedIds()).toEqual([]);
    expect(errors.filter((e) => /forgetting/.test(String(e)))).toEqual([]);
    await second.log.close();
  });

  it('keeps the id of a record appended while pruning runs, so it is not stored twice', async () => {
    const { journal, log } = open();
    const pruning = log.pruneApplied();
    log.addAlarmEvents([{ ...raise, at: T0 + 40 }]);
    const journaled = readFileSync(path.join(dir, SUPERVISION_JOURNAL_FILE));
    const writing = log.flush();
    await Promise.all([pruning, writing]);
    expect(journal.recordIds()).toEqual([]);
    expect(await appliedIds()).toHaveLength(1);
    await log.close();
    // As if the process had died after the commit and before the journal was emptied.
    writeFileSync(path.join(dir, SUPERVISION_JOURNAL_FILE), journaled);
    const again = open();
    await again.log.pruneApplied();
    await again.log.flush();
    expect(await eventsAt(T0 + 40)).toHaveLength(1);
    await again.log.pruneApplied();
    expect(await appliedIds()).toEqual([]);
    await again.log.close();
  });

  it('prunes on its schedule until closed', async () => {
    const { log } = open(20);
    log.addAlarmEvents([{ ...raise, at: T0 + 50 }]);
    await log.flush();
    expect(await appliedIds()).toHaveLength(1);
    await vi.waitFor(async () => expect(await appliedIds()).toEqual([]), { timeout: 10_000, interval: 20 });
    await log.close();
    expect(errors).toEqual([]);
  });
});

