/**
 * The ids of supervision records stored from the journal (`supervision_records_applied`): a
 * replay of a record whose id is here stores nothing. Only records the journal file still holds
 * can be replayed, so every other id can be forgotten (`forgetAppliedExcept`).
 */
import { sql } from 'drizzle-orm';
import type { Db } from '../db/database.js';
import { supervisionRecordsApplied } from '../db/schema.js';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** Notes `id` as stored, in the record's own transaction; false when it was stored before. */
export async function markApplied(tx: Tx, id: string, nowMs: number): Promise<boolean> {
  const [fresh] = await tx
    .insert(supervisionRecordsApplied)
    .values({ id, appliedAtMs: nowMs })
    .onConflictDoNothing()
    .returning({ id: supervisionRecordsApplied.id });
  return fresh !== undefined;
}

/** Forgets every id except those in `keep` (the records the journal file still holds). */
export async function forgetAppliedExcept(db: Db, keep: readonly string[]): Promise<void> {
  // One array parameter, however many records the journal holds.
  await db.delete(supervisionRecordsApplied).where(sql`${supervisionRecordsApplied.id} <> all(${sql.param([...keep])}::text[])`);
}
