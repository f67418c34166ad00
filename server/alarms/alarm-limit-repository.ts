/**
 * Storage of the alarm limits in force (`alarm_limits`). The demo set seeds every id the
 * table does not have yet, so a lead's edits survive restarts and new demo limits still
 * appear; every edit is written with its audit entry in one transaction.
 */
import { and, asc, desc, eq, gte, lt } from 'drizzle-orm';
import type { HistoryAlarmLimits } from '../../shared/history/history-api.js';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { alarmLimits, auditLog } from '../db/schema.js';
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

const UPDATE = 'alarm-limit.update';
const SUBJECT = 'alarm-limit:';

/**
 * The alarm limits in force over `[fromMs, toMs)`: the set in force at its start, then the set
 * after each edit inside it. Limits are not versioned, so this walks back from today's limits
 * through the audited edits since `fromMs`: a limit's value at a moment is the value before the
 * first edit after it, else today's.
 */
export async function alarmLimitsOver(db: Db, fromMs: number, toMs: number): Promise<HistoryAlarmLimits[]> {
  const edit = { at: auditLog.at, subject: auditLog.subject, oldValue: auditLog.oldValue, actor: auditLog.actor, reason: auditLog.reason };
  const newestFirst = [desc(auditLog.at), desc(auditLog.id)];
  const [rows, [before], since] = await Promise.all([
    db.select({ definition: alarmLimits.definition }).from(alarmLimits).orderBy(asc(alarmLimits.id)),
    db.select(edit).from(auditLog).where(and(eq(auditLog.action, UPDATE), lt(auditLog.at, new Date(fromMs)))).orderBy(...newestFirst).limit(1),
    db.select(edit).from(auditLog).where(and(eq(auditLog.action, UPDATE), gte(auditLog.at, new Date(fromMs)))).orderBy(...newestFirst),
  ]);
  const inForce = new Map(rows.map(({ definition }) => [definition.id, levelsOf(definition)]));
  const inForceAfter = (change: AuditedEdit | null, t: number): HistoryAlarmLimits => ({
    t,
    changedId: change ? limitIdOf(change) : null,
    changedBy: change?.actor ?? null,
    reason: change?.reason ?? null,
    limits: [...inForce.values()],
  });
  const changes: HistoryAlarmLimits[] = [];
  for (const change of since) {
    if (change.at.getTime() < toMs) changes.unshift(inForceAfter(change, change.at.getTime()));
    inForce.set(limitIdOf(change), levelsOf(change.oldValue as AlarmLimit));
  }
  return [inForceAfter(before ?? null, before?.at.getTime() ?? fromMs), ...changes];
}

interface AuditedEdit {
  at: Date;
  subject: string;
  actor: string;
  reason: string | null;
}

function limitIdOf(change: AuditedEdit): string {
  return change.subject.slice(SUBJECT.length);
}

/** What the gauges mark of a limit. */
function levelsOf({ id, channel, level, limit }: AlarmLimit): HistoryAlarmLimits['limits'][number] {
  return { id, channel, level, limit };
}

/** Stores a lead's edit of one limit and its audit entry (old value, new value, reason) together. */
export async function saveAlarmLimit(db: Db, next: AlarmLimit, previous: AlarmLimit, actor: string, reason: string): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.update(alarmLimits).set({ definition: next, updatedBy: actor, updatedAt: new Date() }).where(eq(alarmLimits.id, next.id));
    await appendAudit(tx, { actor, action: UPDATE, subject: `${SUBJECT}${next.id}`, oldValue: previous, newValue: next, reason });
  });
}
