import { randomBytes } from 'node:crypto';
import { desc, eq, inArray, isNull } from 'drizzle-orm';
import type { RunRecord, RunState, SequenceRecord, ShotRecord } from '../../shared/steering/steering-api.js';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { runs, runSteps, sequences, shots } from '../db/schema.js';

/** Runs listed by `GET /api/runs`. */
const LIST_LIMIT = 100;

/** Creates the run row and its audit entry in one transaction. */
export async function createRun(db: Db, run: { sequence: SequenceRecord; actor: string; reason: string; startedAt: Date }): Promise<number> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(runs)
      .values({ sequenceId: run.sequence.id, state: 'running', startedAt: run.startedAt, actor: run.actor, reason: run.reason })
      .returning({ id: runs.id });
    await appendAudit(tx, { actor: run.actor, action: 'run.start', subject: `run:${row.id}`, newValue: { sequenceId: run.sequence.id, name: run.sequence.name, version: run.sequence.version }, reason: run.reason });
    return row.id;
  });
}

/** Ends a run (done or aborted), with the audit entry of an abort in the same transaction. */
export async function endRun(db: Db, runId: number, end: { state: Exclude<RunState, 'running'>; at: Date; why: string | null; actor?: string; reason?: string }): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.update(runs).set({ state: end.state, endedAt: end.at, endReason: end.why }).where(eq(runs.id, runId));
    if (end.actor) await appendAudit(tx, { actor: end.actor, action: `run.${end.state === 'done' ? 'done' : 'abort'}`, subject: `run:${runId}`, newValue: { why: end.why }, reason: end.reason ?? null });
  });
}

/**
 * A shot id unique across the lab: UTC date and time, the run, and random bits; the primary
 * key refuses a repeat, in which case a new one is drawn.
 */
export function shotId(at: Date, runId: number): string {
  const stamp = at.toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z');
  return `shot-${stamp}-r${runId}-${randomBytes(3).toString('hex')}`;
}

export async function addShot(db: Db, shot: Omit<ShotRecord, 'at' | 'id'> & { runId: number; stepIndex: number; at: Date; profileId: number | null }): Promise<ShotRecord> {
  for (let attempt = 0; ; attempt++) {
    const id = shotId(shot.at, shot.runId);
    const [row] = await db
      .insert(shots)
      .values({ id, runId: shot.runId, stepIndex: shot.stepIndex, label: shot.label, at: shot.at, field: shot.field, prediction: shot.prediction, profileId: shot.profileId })
      .onConflictDoNothing()
      .returning({ id: shots.id });
    if (row) return { id, label: shot.label, at: shot.at.toISOString(), field: shot.field, prediction: shot.prediction };
    if (attempt >= 3) throw new Error('could not draw a unique shot id');
  }
}

type RunRow = typeof runs.$inferSelect & { name: string; version: number; steps: unknown[] };

function toRun(row: RunRow, shotRows: (typeof shots.$inferSelect)[]): RunRecord {
  return {
    id: row.id,
    sequenceId: row.sequenceId,
    sequenceName: row.name,
    sequenceVersion: row.version,
    state: row.state,
    startedAt: row.startedAt.toISOString(),
    endedAt: row.endedAt?.toISOString() ?? null,
    step: row.step,
    stepCount: row.steps.length,
    actor: row.actor,
    reason: row.reason,
    endReason: row.endReason,
    shots: shotRows.map((s) => ({ id: s.id, label: s.label, at: s.at.toISOString(), field: s.field, prediction: s.prediction ?? null })),
  };
}

const runColumns = {
  id: runs.id, sequenceId: runs.sequenceId, state: runs.state, startedAt: runs.startedAt, endedAt: runs.endedAt, step: runs.step,
  actor: runs.actor, reason: runs.reason, endReason: runs.endReason, name: sequences.name, version: sequences.version, steps: sequences.steps,
};

/** Runs newest first (at most 100), each with its shots. */
export async function listRuns(db: Db): Promise<RunRecord[]> {
  const rows = await db.select(runColumns).from(runs).innerJoin(sequences, eq(runs.sequenceId, sequences.id)).orderBy(desc(runs.id)).limit(LIST_LIMIT);
  if (rows.length === 0) return [];
  const shotRows = await db.select().from(shots).where(inArray(shots.runId, rows.map((r) => r.id))).orderBy(shots.at);
  return rows.map((r) => toRun(r as RunRow, shotRows.filter((s) => s.runId === r.id)));
}

export async function findRun(db: Db, id: number): Promise<RunRecord | null> {
  const [row] = await db.select(runColumns).from(runs).innerJoin(sequences, eq(runs.sequenceId, sequences.id)).where(eq(runs.id, id));
  if (!row) return null;
  const shotRows = await db.select().from(shots).where(eq(shots.runId, id)).orderBy(shots.at);
  return toRun(row as RunRow, shotRows);
}

/** Runs left `running` by a server that stopped, and the steps they were on: they cannot go on, so they end as aborted. */
export async function abortOrphanedRuns(db: Db, at: Date): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.update(runSteps).set({ endedAt: at, outcome: 'aborted' }).where(isNull(runSteps.endedAt));
    await tx.update(runs).set({ state: 'aborted', endedAt: at, endReason: 'the server stopped during the run' }).where(eq(runs.state, 'running'));
  });
}
