import { and, asc, desc, eq, sql } from 'drizzle-orm';
import type { SequenceRecord, SequenceStep } from '../../shared/steering/steering-api.js';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { sequences } from '../db/schema.js';
import { DEMO_SEQUENCES } from './demo-sequences.js';

type Row = typeof sequences.$inferSelect;

function toRecord(row: Row): SequenceRecord {
  return { id: row.id, name: row.name, version: row.version, steps: row.steps, createdBy: row.createdBy, createdAt: row.createdAt.toISOString(), reason: row.reason };
}

/** Every version, by name, oldest version first. */
export async function listSequences(db: Db): Promise<SequenceRecord[]> {
  return (await db.select().from(sequences).orderBy(asc(sequences.name), asc(sequences.version))).map(toRecord);
}

export async function findSequence(db: Db, id: number): Promise<SequenceRecord | null> {
  const [row] = await db.select().from(sequences).where(eq(sequences.id, id));
  return row ? toRecord(row) : null;
}

/** Stores the next version of `name` (or version 1) with its audit entry, in one transaction. */
export async function saveSequence(db: Db, request: { name: string; steps: SequenceStep[]; reason: string; actor: string }): Promise<SequenceRecord> {
  return db.transaction(async (tx) => {
    // One writer per name at a time: the version number is taken under a lock on the name.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${request.name}))`);
    const [previous] = await tx.select().from(sequences).where(eq(sequences.name, request.name)).orderBy(desc(sequences.version)).limit(1);
    const [row] = await tx
      .insert(sequences)
      .values({ name: request.name, version: (previous?.version ?? 0) + 1, steps: request.steps, createdBy: request.actor, reason: request.reason })
      .returning();
    await appendAudit(tx, {
      actor: request.actor,
      action: 'sequence.save',
      subject: `sequence:${row.id}`,
      oldValue: previous ? { id: previous.id, name: previous.name, version: previous.version, steps: previous.steps } : null,
      newValue: { id: row.id, name: row.name, version: row.version, steps: row.steps },
      reason: request.reason,
    });
    return toRecord(row);
  });
}

/** Stores the demo sequences on a database that has none of their names yet. */
export async function seedDemoSequences(db: Db): Promise<void> {
  for (const demo of DEMO_SEQUENCES) {
    const [existing] = await db.select({ id: sequences.id }).from(sequences).where(and(eq(sequences.name, demo.name))).limit(1);
    if (!existing) await saveSequence(db, { ...demo, actor: 'system' });
  }
}
