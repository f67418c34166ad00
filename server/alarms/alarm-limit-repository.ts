/**
 * Storage of the alarm limits in force (`alarm_limits`). The demo set seeds every id the
 * table does not have yet, so a lead's edits survive restarts and new demo limits still
 * appear; every edit is written with its audit entry in one transaction.
 */
import { asc, eq } from 'drizzle-orm';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { alarmLimits } from '../db/schema.js';
import { parseAlarmLimits, type AlarmLimit } from './alarm-limit.js';
import { DEMO_ALARM_LIMITS } from './demo-alarm-limits.js';

/** Actor of rows the server writes itself (the seed). */
const SYSTEM = 'system';

/**
 * Seeds the demo limits missing from the table and returns the whole stored set, validated.
 * Throws an Error naming the bad limit when a stored set no longer validates.
 */
export async function loadAlarmLimits(db: Db): Promise<AlarmLimit[]> {
  await db
    .insert(alarmLimits)
    .values(DEMO_ALARM_LIMITS.map((limit) => ({ id: limit.id, definition: limit, updatedBy: SYSTEM })))
    .onConflictDoNothing({ target: alarmLimits.id });
  const rows = await db.select().from(alarmLimits).orderBy(asc(alarmLimits.id));
  const byId = new Map(rows.map((r) => [r.id, r.definition]));
  // Demo order first (channel by channel, as the lead reads them), then any others.
  const ordered = [...DEMO_ALARM_LIMITS.map((l) => byId.get(l.id)), ...rows.filter((r) => !DEMO_ALARM_LIMITS.some((l) => l.id === r.id)).map((r) => r.definition)];
  try {
    return parseAlarmLimits(ordered.filter((l) => l !== undefined));
  } catch (error) {
    throw new Error(`The stored alarm limits (table alarm_limits) are not valid: ${(error as Error).message}`);
  }
}

/** Stores a lead's edit of one limit and its audit entry (old value, new value, reason) together. */
export async function saveAlarmLimit(db: Db, next: AlarmLimit, previous: AlarmLimit, actor: string, reason: string): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.update(alarmLimits).set({ definition: next, updatedBy: actor, updatedAt: new Date() }).where(eq(alarmLimits.id, next.id));
    await appendAudit(tx, { actor, action: 'alarm-limit.update', subject: `alarm-limit:${next.id}`, oldValue: previous, newValue: next, reason });
  });
}
