/**
 * `GET /api/interlock` (viewer): state, first-out, every condition with its value and margin,
 * the controller's hardware trip (shown apart, never reset from here) and the trip history.
 * `POST /api/interlock/reset` (operator) `{ reason }`: the reset is decided, stored with its
 * audit entry, and only then the ReleaseCommand goes out (200). 409 with the conditions still
 * active, while the controller's own hardware trip is latched, or when nothing is tripped; 400
 * without a reason; 503 when the reset could not be stored (the interlock stays tripped).
 */
import type { InterlockResetRefusal, InterlockStatus } from '../../shared/alarms/alarm-api.js';
import type { SupervisionLog } from '../alarms/supervision-log.js';
import { actorOf } from '../alarms/alarm-routes.js';
import type { Db } from '../db/database.js';
import { z } from 'zod';
import { labelled } from '../http/field-labels.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import type { LiveStore } from '../live/live-store.js';
import type { Interlock } from './interlock.js';
import { conditionBody, interlockBody } from './interlock-body.js';
import type { Supervisor } from './supervisor.js';
import { recentTrips } from './trip-repository.js';
import { unlessDatabaseDown } from '../db/database-health.js';

/** Trips listed in `history`. */
const HISTORY_TRIPS = 20;

/** How the Interlocks page labels the reason of a reset. */
const RESET_REASON_LABEL = 'Reason for the reset';
/** The labels of a reset request (the interlock itself checks the reason). */
export const ResetBody = z.object({ reason: labelled(z.unknown(), RESET_REASON_LABEL) });

export interface InterlockRouteDeps {
  db: Db;
  interlock: Interlock;
  live: LiveStore;
  supervisor: Supervisor;
  records: SupervisionLog;
}

export function interlockHandlers(deps: InterlockRouteDeps): Pick<RouteHandlers, 'interlock.status' | 'interlock.reset'> {
  const { db, interlock, live, supervisor, records } = deps;
  const body = () => interlockBody(interlock.state(), live.snapshot().controller);
  return {
    'interlock.status': async (_req, res) => {
      // The live state comes from memory: it still answers while the database is unreachable.
      const history = await unlessDatabaseDown(async () => {
        await records.flush();
        return recentTrips(db, HISTORY_TRIPS);
      }, null);
      const status: InterlockStatus = { ...body(), history: history ?? [] };
      if (history === null) status.historyUnavailable = true;
      res.json(status);
    },
    'interlock.reset': async (req, res) => {
      const result = await supervisor.resetInterlock(actorOf(req), (req.body as { reason?: unknown } | undefined)?.reason);
      if (!result.ok) {
        if (result.code === 'reason-required') throw new HttpError(400, `${RESET_REASON_LABEL}: ${result.message}`, 'reason');
        if (result.code === 'not-recorded') throw new HttpError(503, result.message);
        const refusal: InterlockResetRefusal = {
          error: result.message,
          code: result.code,
          conditions: result.code === 'conditions-active' ? result.active.map(conditionBody) : [],
        };
        res.status(409).json(refusal);
        return;
      }
      res.json({
        reset: { at: new Date(result.reset.at).toISOString(), actor: result.reset.actor, reason: result.reset.reason, trippedAt: new Date(result.reset.trip.at).toISOString() },
        interlock: body(),
      });
    },
  };
}
