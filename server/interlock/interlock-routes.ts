/**
 * `GET /api/interlock` (viewer): state, first-out, every condition with its value and margin,
 * the controller's hardware trip (shown apart, never reset from here) and the trip history.
 * `POST /api/interlock/reset` (operator) `{ reason }`: 200 and the ReleaseCommand once every
 * condition has cleared; 409 with the conditions still active; 400 without a reason.
 */
import type { InterlockResetRefusal, InterlockStatus } from '../../shared/alarms/alarm-api.js';
import type { SupervisionLog } from '../alarms/supervision-log.js';
import { actorOf } from '../alarms/alarm-routes.js';
import type { Db } from '../db/database.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import type { LiveStore } from '../live/live-store.js';
import type { Interlock } from './interlock.js';
import { conditionBody, interlockBody } from './interlock-body.js';
import type { Supervisor } from './supervisor.js';
import { recentTrips, recordTripReset } from './trip-repository.js';
import { unlessDatabaseDown } from '../db/database-health.js';

/** Trips listed in `history`. */
const HISTORY_TRIPS = 20;

export interface InterlockRouteDeps {
  db: Db;
  interlock: Interlock;
  live: LiveStore;
  supervisor: Supervisor;
  records: SupervisionLog;
}

export function interlockHandlers(deps: InterlockRouteDeps): Pick<RouteHandlers, 'interlock.status' | 'interlock.reset'> {
  const { db, interlock, live, supervisor, records } = deps;
  return {
    'interlock.status': async (_req, res) => {
      // The live state comes from memory: it still answers while the database is unreachable.
      const history = await unlessDatabaseDown(async () => {
        await records.flush();
        return recentTrips(db, HISTORY_TRIPS);
      }, null);
      const body: InterlockStatus = { ...interlockBody(interlock.state(), live.snapshot().controller), history: history ?? [] };
      if (history === null) body.historyUnavailable = true;
      res.json(body);
    },
    'interlock.reset': async (req, res) => {
      const result = supervisor.resetInterlock(actorOf(req), (req.body as { reason?: unknown } | undefined)?.reason);
      if (!result.ok) {
        if (result.code === 'reason-required') throw new HttpError(400, result.message);
        const refusal: InterlockResetRefusal = { error: result.message, conditions: result.code === 'conditions-active' ? result.active.map(conditionBody) : [] };
        res.status(409).json(refusal);
        return;
      }
      // The trip row may still wait in the queue: write it first, then the reset on it.
      await records.flush();
      await recordTripReset(db, result.reset);
      res.json({
        reset: { at: new Date(result.reset.at).toISOString(), actor: result.reset.actor, reason: result.reset.reason, trippedAt: new Date(result.reset.trip.at).toISOString() },
        interlock: interlockBody(interlock.state(), live.snapshot().controller),
      });
    },
  };
}
