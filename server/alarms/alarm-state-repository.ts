/** Storage of the alarm states that survive a restart (`alarm_states`). */
import { sql } from 'drizzle-orm';
import type { Db } from '../db/database.js';
import { alarmStates } from '../db/schema.js';
import type { AlarmMemory } from './alarm-state.js';

type Writer = Pick<Db, 'insert'>;

/**
 * Writes the states given as they were at `atMs` (one row per alarm, replaced unless the row
 * holds a newer state: a journaled batch written late never undoes a later action); pass a
 * transaction to join a larger write.
 */
export async function upsertAlarmStates(db: Writer, states: ReadonlyMap<string, AlarmMemory>, atMs: number): Promise<void> {
  if (states.size === 0) return;
  await db
    .insert(alarmStates)
    .values([...states].map(([alarmId, memory]) => ({ alarmId, memory, updatedAtMs: atMs })))
    .onConflictDoUpdate({
      target: alarmStates.alarmId,
      set: { memory: sql`excluded.memory`, updatedAtMs: sql`excluded.updated_at_ms` },
      setWhere: sql`${alarmStates.updatedAtMs} <= excluded.updated_at_ms`,
    });
}

/** Every remembered alarm state, by alarm id. */
export async function loadAlarmStates(db: Db): Promise<Map<string, AlarmMemory>> {
  const rows = await db.select().from(alarmStates);
  return new Map(rows.map((r) => [r.alarmId, r.memory]));
}
