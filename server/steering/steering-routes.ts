/**
 * `GET /api/steering` (viewer), `POST /api/steering/preflight` and `/target` (operator),
 * `POST /api/steering/abort` and `/release` (operator).
 */
import type { Response } from 'express';
import { actorOf } from '../alarms/alarm-routes.js';
import type { RouteHandlers } from '../http/route-table.js';
import { parseInput } from '../http/validate.js';
import { PreflightRefusal, type SteerDesk } from './steer-desk.js';
import { ReasonBody, SteerRequestBody } from './steer-request.js';
import type { Steering } from './steering.js';

export type SteeringRoutes =
  | 'steering.status'
  | 'steering.preflight'
  | 'steering.target'
  | 'steering.abort'
  | 'steering.release';

export function steeringHandlers(deps: { desk: SteerDesk; steering: Steering }): Pick<RouteHandlers, SteeringRoutes> {
  const { desk, steering } = deps;
  return {
    'steering.status': (_req, res) => {
      res.json(steering.status());
    },
    'steering.preflight': async (req, res) => {
      const body = parseInput(SteerRequestBody, req.body, 'body');
      res.json(await desk.preflightTarget(body));
    },
    'steering.target': async (req, res) => {
      const body = parseInput(SteerRequestBody, req.body, 'body');
      await answerRefusal(res, () => desk.setTarget(actorOf(req), body));
    },
    'steering.abort': async (req, res) => {
      const { reason } = parseInput(ReasonBody, req.body, 'body');
      await desk.abort(actorOf(req), reason);
      res.json(steering.status());
    },
    'steering.release': async (req, res) => {
      const { reason } = parseInput(ReasonBody, req.body, 'body');
      await desk.release(actorOf(req), reason);
      res.json(steering.status());
    },
  };
}

/** Sends the result of `command`, or 422 with the failed pre-flight. */
export async function answerRefusal(res: Response, command: () => Promise<unknown>, status = 200): Promise<void> {
  try {
    res.status(status).json(await command());
  } catch (error) {
    if (!(error instanceof PreflightRefusal)) throw error;
    res.status(422).json({ error: 'The pre-flight failed: nothing was sent', ...error.result });
  }
}
