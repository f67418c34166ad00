import { and, eq, isNull, lt } from 'drizzle-orm';
import type { SequenceStep, StepOutcome } from '../../shared/steering/steering-api.js';
import type { Db } from '../db/database.js';
import { runs, runSteps } from '../db/schema.js';

/**
 * Records that a run reached a step, in one transaction: the step before it ends `done` at the
 * same moment, and the run's step index moves on.
 */
export async function startStep(db: Db, start: { runId: number; index: number; step: SequenceStep; at: Date }): Promise<void> {
  await db.transaction(async (tx) => {
    if (start.index > 0) await tx.update(runSteps).set({ endedAt: start.at, outcome: 'done' }).where(and(eq(runSteps.runId, start.runId), eq(runSteps.stepIndex, start.index - 1)));
    await tx.insert(runSteps).values({ runId: start.runId, stepIndex: start.index, step: start.step, startedAt: start.at });
    await tx.update(runs).set({ step: start.index }).where(eq(runs.id, start.runId));
  });
}

/**
 * Records how the step a run ended on ended; a step before it still open (the start of the last
 * one could not be recorded) ran its course until the last one began.
 */
export async function endSteps(db: Db, runId: number, last: { index: number; startedAt: Date }, end: { at: Date; outcome: StepOutcome }): Promise<void> {
  const open = and(eq(runSteps.runId, runId), isNull(runSteps.endedAt));
  await db.transaction(async (tx) => {
    await tx.update(runSteps).set({ endedAt: last.startedAt, outcome: 'done' }).where(and(open, lt(runSteps.stepIndex, last.index)));
    await tx.update(runSteps).set({ endedAt: end.at, outcome: end.outcome }).where(and(open, eq(runSteps.stepIndex, last.index)));
  });
}
