/** Storage of software-interlock trips (`interlock_trips`) and their resets. */
import { desc, eq, isNull } from 'drizzle-orm';
import type { InterlockTripRecord } from '../../shared/alarms/alarm-api.js';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { interlockTrips } from '../db/schema.js';
import type { ResetRecord, TripRecord } from './interlock.js';
import { conditionBody, firstOutBody } from './interlock-body.js';

type Writer = Pick<Db, 'insert'>;
type Updater = Pick<Db, 'insert' | 'update'>;

/** Appends trips; pass a transaction to join a larger write. A trip stored before is skipped. */
export async function insertTrips(db: Writer, trips: readonly TripRecord[]): Promise<void> {
  if (trips.length === 0) return;
  await db
    .insert(interlockTrips)
    .values(trips.map((t) => ({ trippedAtMs: t.at, firstOut: t.firstOut, valuesAtTrip: t.valuesAtTrip, reason: t.reason })))
    .onConflictDoNothing({ target: interlockTrips.trippedAtMs });
}

/**
 * Stores the reset on its trip's row and its audit entry; run it inside a transaction. A trip
 * row not stored yet (its write failed) is written first.
 */
export async function recordTripReset(tx: Updater, reset: ResetRecord): Promise<void> {
  await insertTrips(tx, [reset.trip]);
  await tx
    .update(interlockTrips)
    .set({ resetAtMs: reset.at, resetBy: reset.actor, resetReason: reset.reason })
    .where(eq(interlockTrips.trippedAtMs, reset.trip.at));
  await appendAudit(tx, {
    actor: reset.actor,
    action: 'interlock.reset',
    subject: 'interlock',
    oldValue: { state: 'tripped', firstOut: reset.trip.firstOut },
    newValue: { state: 'ok' },
    reason: reset.reason,
    at: new Date(reset.at),
  });
}

/** The newest trip not reset yet (a latch that outlives a restart), or null. */
export async function openTrip(db: Db): Promise<TripRecord | null> {
  const [row] = await db
    .select()
    .from(interlockTrips)
    .where(isNull(interlockTrips.resetAtMs))
    .orderBy(desc(interlockTrips.trippedAtMs))
    .limit(1);
  return row ? { at: row.trippedAtMs, firstOut: row.firstOut, valuesAtTrip: row.valuesAtTrip, reason: row.reason } : null;
}

/** The newest `limit` trips, newest first, as the API shows them. */
export async function recentTrips(db: Db, limit: number): Promise<InterlockTripRecord[]> {
  const rows = await db.select().from(interlockTrips).orderBy(desc(interlockTrips.trippedAtMs)).limit(limit);
  return rows.map((r) => ({
    trippedAt: new Date(r.trippedAtMs).toISOString(),
    firstOut: firstOutBody(r.firstOut),
    reason: r.reason,
    valuesAtTrip: r.valuesAtTrip.map(conditionBody),
    reset:
      r.resetAtMs === null || r.resetBy === null
        ? null
        : { at: new Date(r.resetAtMs).toISOString(), actor: r.resetBy, reason: r.resetReason ?? '' },
  }));
}
