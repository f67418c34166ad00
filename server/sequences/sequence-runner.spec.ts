import { sql } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import type { LiveState } from '../../shared/live/live-state.js';
import type { SequenceStep } from '../../shared/steering/steering-api.js';
import { runs, runSteps } from '../db/schema.js';
import { historyEvents } from '../history/history-events.js';
import type { SteerDesk } from '../steering/steer-desk.js';
import type { Steering } from '../steering/steering.js';
import { useTempDatabase } from '../testing/temp-database.js';
import { SequenceRunner, type RunnerDeps } from './sequence-runner.js';
import { saveSequence } from './sequence-repository.js';

const HERE = { x: 0, y: 0, z: 7 };

/** The runner on a real database, with a steering stand-in that only notes what it was told. */
function makeRunner(db: RunnerDeps['db']) {
  let tripStop: ((program: { runId: number | null }) => void) | null = null;
  const held: string[] = [];
  const steering = {
    onTripStop: (cb: typeof tripStop) => (tripStop = cb),
    fieldNow: () => HERE,
    run: () => undefined,
    holdHere: (_actor: string, reason: string) => held.push(reason),
    detachRun: () => undefined,
    status: () => ({ path: [] }),
  } as unknown as Steering;
  const desk = {
    serial: <T>(fn: () => Promise<T>) => fn(),
    check: async () => ({ ok: true, from: HERE, calibration: null, checks: [], path: [] }),
    refuseWhileTripped: () => undefined,
  } as unknown as SteerDesk;
  const live = { field: { magnitude: 7, thetaDeg: 0, phiDeg: 0 }, currents: { x: 0, y: 0, z: 1 } } as unknown as LiveState;
  const runner = new SequenceRunner({
    db, desk, steering, predictor: { evaluate: async () => [] }, calibration: () => null as never, live: () => live, profile: () => null,
    log: { info: () => undefined, warn: () => undefined, error: () => undefined },
  });
  return { runner, held, trip: (runId: number) => tripStop?.({ runId }) };
}

describe('SequenceRunner step records', () => {
  const temp = useTempDatabase();

  async function start(runner: SequenceRunner, steps: SequenceStep[]): Promise<number> {
    const sequence = await saveSequence(temp.db, { name: `Steps ${Math.random()}`, steps, reason: 'test', actor: 'lead' });
    return (await runner.start('operator', sequence.id, 'test')).runId;
  }

  async function stepsOf(runId: number) {
    const rows = await temp.db.select().from(runSteps).where(sql`${runSteps.runId} = ${runId}`).orderBy(runSteps.stepIndex);
    return rows.map((r) => ({ index: r.stepIndex, kind: r.step.kind, outcome: r.outcome, ms: r.endedAt!.getTime() - r.startedAt.getTime() }));
  }

  it('records each step as it begins and how it ended, and gives them as timeline marks', async () => {
    const { runner } = makeRunner(temp.db);
    const before = Date.now();
    const runId = await start(runner, [{ kind: 'ramp', magnitudeG: 7, thetaDeg: 50, phiDeg: 0, durationMs: 200 }, { kind: 'hold', durationMs: 100 }, { kind: 'shot', label: 'θ 50°' }]);
    await runner.settled();
    const steps = await stepsOf(runId);
    expect(steps.map(({ index, kind, outcome }) => [index, kind, outcome])).toEqual([[0, 'ramp', 'done'], [1, 'hold', 'done'], [2, 'shot', 'done']]);
    expect(steps[0].ms).toBeGreaterThanOrEqual(195);
    expect((await temp.db.select().from(runs).where(sql`${runs.id} = ${runId}`))[0]).toMatchObject({ state: 'done', step: 2 });
    const marks = (await historyEvents(temp.db, before - 1000, Date.now() + 1000)).filter((e) => e.kind === 'step');
    expect(marks.map((e) => [e.id, e.label])).toEqual([
      [`${runId}.1`, `Run ${runId} step 1: ramp to |B| 7 G, θ 50°, φ 0° over 0.2 s`],
      [`${runId}.2`, `Run ${runId} step 2: hold for 0.1 s`],
      [`${runId}.3`, `Run ${runId} step 3: shot "θ 50°"`],
    ]);
    expect(marks[0].detail).toMatch(/^Done after 0\.\d s$/);
  });

  it('ends the step a trip or an abort cut short as tripped or aborted', async () => {
    const { runner, trip } = makeRunner(temp.db);
    const tripped = await start(runner, [{ kind: 'hold', durationMs: 50 }, { kind: 'hold', durationMs: 10_000 }, { kind: 'shot', label: 'never' }]);
    await new Promise((r) => setTimeout(r, 150));
    trip(tripped);
    await runner.settled();
    expect((await stepsOf(tripped)).map((s) => s.outcome)).toEqual(['done', 'tripped']);
    const aborted = await start(runner, [{ kind: 'ramp', magnitudeG: 7, thetaDeg: 80, phiDeg: 90, durationMs: 10_000 }]);
    await new Promise((r) => setTimeout(r, 50));
    await runner.abort(aborted, 'operator', 'wrong angle');
    expect((await stepsOf(aborted)).map((s) => s.outcome)).toEqual(['aborted']);
    const mark = (await historyEvents(temp.db, Date.now() - 60_000, Date.now() + 1000)).find((e) => e.id === `${tripped}.2`);
    expect(mark?.detail).toMatch(/^Interrupted by an interlock trip after 0\.\d s$/);
  });

  it('stops the run, holding the field, when the start of a step cannot be recorded', async () => {
    const { runner, held } = makeRunner(temp.db);
    await temp.db.execute(sql`create function refuse_second_step() returns trigger language plpgsql as $$
      begin if new.step_index = 1 then raise exception 'disk full'; end if; return new; end $$`);
    await temp.db.execute(sql`create trigger refuse_second_step before insert on run_steps for each row execute function refuse_second_step()`);
    try {
      const runId = await start(runner, [{ kind: 'hold', durationMs: 20 }, { kind: 'hold', durationMs: 10_000 }, { kind: 'shot', label: 'never' }]);
      const began = Date.now();
      await runner.settled();
      expect(Date.now() - began).toBeLessThan(5000);
      const [run] = await temp.db.select().from(runs).where(sql`${runs.id} = ${runId}`);
      expect(run).toMatchObject({ state: 'aborted', endReason: 'the start of step 2 could not be recorded (disk full)' });
      expect(held).toEqual([`run ${runId} stopped: the start of step 2 could not be recorded (disk full)`]);
      expect((await stepsOf(runId)).map(({ index, outcome }) => [index, outcome])).toEqual([[0, 'done']]);
    } finally {
      await temp.db.execute(sql`drop trigger refuse_second_step on run_steps`);
    }
  });
});
