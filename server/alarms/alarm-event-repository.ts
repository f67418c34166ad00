/** Storage of the alarm history (`alarm_events`): every transition of every alarm. */
import { and, desc, eq, gte, lte } from 'drizzle-orm';
import type { AlarmHistoryEvent } from '../../shared/alarms/alarm-api.js';
import type { Db } from '../db/database.js';
import { alarmEvents } from '../db/schema.js';
import type { HealthEvent } from './alarm-health.js';
import type { AlarmEvent } from './alarm-state.js';

type Writer = Pick<Db, 'insert'>;

/** Appends events in one statement; pass a transaction to join a larger write. */
export async function insertAlarmEvents(db: Writer, events: readonly AlarmEvent[]): Promise<void> {
  if (events.length === 0) return;
  await db.insert(alarmEvents).values(
    events.map((e) => ({
      atMs: e.at,
      alarmId: e.alarmId,
      channel: e.channel,
      priority: e.priority,
      kind: e.kind,
      fromState: e.from,
      toState: e.to,
      value: e.value,
      limitValue: e.limit,
      actor: e.actor ?? null,
      reason: e.reason ?? null,
      hidden: e.hidden ?? null,
      firstOutOf: e.firstOutOf ?? null,
    })),
  );
}

/** Events between `fromMs` and `toMs` (Unix epoch ms, inclusive), newest first, at most `limit`. */
export async function alarmHistory(db: Db, fromMs: number, toMs: number, limit: number): Promise<AlarmHistoryEvent[]> {
  const rows = await db
    .select()
    .from(alarmEvents)
    .where(and(gte(alarmEvents.atMs, fromMs), lte(alarmEvents.atMs, toMs)))
    .orderBy(desc(alarmEvents.atMs), desc(alarmEvents.id))
    .limit(limit);
  return rows.map((r) => {
    const event: AlarmHistoryEvent = {
      alarmId: r.alarmId,
      channel: r.channel,
      priority: r.priority,
      kind: r.kind,
      at: new Date(r.atMs).toISOString(),
      from: r.fromState,
      to: r.toState,
      value: r.value,
      limit: r.limitValue,
    };
    if (r.actor !== null) event.actor = r.actor;
    if (r.reason !== null) event.reason = r.reason;
    if (r.hidden !== null) event.hidden = r.hidden;
    if (r.firstOutOf !== null) event.firstOutOf = r.firstOutOf;
    return event;
  });
}

/** Raises between `fromMs` and `toMs` (Unix epoch ms), only the columns the health figures use. */
export async function raisesBetween(db: Db, fromMs: number, toMs: number): Promise<HealthEvent[]> {
  const rows = await db
    .select({ alarmId: alarmEvents.alarmId, at: alarmEvents.atMs, hidden: alarmEvents.hidden })
    .from(alarmEvents)
    .where(and(eq(alarmEvents.kind, 'raise'), gte(alarmEvents.atMs, fromMs), lte(alarmEvents.atMs, toMs)));
  return rows.map((r) => ({ alarmId: r.alarmId, at: r.at, kind: 'raise', ...(r.hidden ? { hidden: r.hidden } : {}) }));
}
