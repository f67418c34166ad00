/**
 * Sequences and runs: `GET /api/sequences`, `POST /api/sequences` (lead),
 * `POST /api/sequences/preview` (operator: the planned path and its checks, nothing sent),
 * `POST /api/sequences/:id/run` (operator), `GET /api/runs`, `GET /api/runs/:id`,
 * `POST /api/runs/:id/abort` (operator).
 */
import { actorOf } from '../alarms/alarm-routes.js';
import type { Db } from '../db/database.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { parseInput } from '../http/validate.js';
import { rampsOfSequence } from '../steering/planner.js';
import type { SteerDesk } from '../steering/steer-desk.js';
import { answerRefusal } from '../steering/steering-routes.js';
import { findRun, listRuns } from './run-repository.js';
import { IdParam, parseSteps, PreviewBody, RunAbortBody, RunBody, SaveSequenceBody } from './sequence-request.js';
import { listSequences, saveSequence } from './sequence-repository.js';
import type { SequenceRunner } from './sequence-runner.js';

export type SequenceRoutes = 'sequences.list' | 'sequences.save' | 'sequences.preview' | 'sequences.run' | 'runs.list' | 'runs.get' | 'runs.abort';

export function sequenceHandlers(deps: { db: Db; desk: SteerDesk; runner: SequenceRunner }): Pick<RouteHandlers, SequenceRoutes> {
  const { db, desk, runner } = deps;
  return {
    'sequences.list': async (_req, res) => {
      res.json({ sequences: await listSequences(db) });
    },
    'sequences.save': async (req, res) => {
      const body = parseInput(SaveSequenceBody, req.body, 'body');
      const steps = parseSteps(body.steps);
      const saved = await saveSequence(db, { name: body.name, steps, reason: body.reason, actor: actorOf(req) });
      res.status(201).json({ id: saved.id, version: saved.version, sequence: saved });
    },
    'sequences.preview': async (req, res) => {
      const steps = parseSteps(parseInput(PreviewBody, req.body, 'body').steps);
      const plan = await desk.check((from) => rampsOfSequence(steps, from).ramps);
      res.json({ ok: plan.ok, checks: plan.checks, path: plan.path, durationMs: rampsOfSequence(steps, { x: 0, y: 0, z: 0 }).durationMs });
    },
    'sequences.run': async (req, res) => {
      const { id } = parseInput(IdParam, req.params, 'path');
      const { reason } = parseInput(RunBody, req.body, 'body');
      await answerRefusal(res, () => runner.start(actorOf(req), id, reason), 201);
    },
    'runs.list': async (_req, res) => {
      res.json({ runs: await listRuns(db) });
    },
    'runs.get': async (req, res) => {
      const { id } = parseInput(IdParam, req.params, 'path');
      const run = await findRun(db, id);
      if (!run) throw new HttpError(404, `No run with id ${id}: see GET /api/runs`);
      res.json(run);
    },
    'runs.abort': async (req, res) => {
      const { id } = parseInput(IdParam, req.params, 'path');
      const { reason } = parseInput(RunAbortBody, req.body, 'body');
      if (!(await findRun(db, id))) throw new HttpError(404, `No run with id ${id}: see GET /api/runs`);
      await runner.abort(id, actorOf(req), reason);
      res.json(await findRun(db, id));
    },
  };
}
