/**
 * `GET /api/alarm-limits` (viewer) and `PUT /api/alarm-limits/:id` (lead): a lead edits one
 * limit's level, deadband, delays, priority, latching or rationale with a reason; the change
 * is validated against the whole set, stored with its audit entry (old value, new value,
 * reason), and the alarm keeps its state while the next evaluation applies the new level.
 */
import type { Db } from '../db/database.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import type { AlarmBook } from './alarm-book.js';
import { parseAlarmLimit, type AlarmLimit } from './alarm-limit.js';
import { saveAlarmLimit } from './alarm-limit-repository.js';
import { actorOf, httpErrorOf } from './alarm-routes.js';

const EDITABLE = ['level', 'limit', 'deadband', 'onDelayMs', 'offDelayMs', 'priority', 'latching', 'suppressDuringRamp', 'rationale'] as const;
const MAX_REASON_CHARS = 500;

export function alarmLimitHandlers(db: Db, book: AlarmBook): Pick<RouteHandlers, 'alarm-limits.list' | 'alarm-limits.update'> {
  return {
    'alarm-limits.list': (_req, res) => {
      res.json({ limits: book.limits() });
    },
    'alarm-limits.update': async (req, res) => {
      const id = String(req.params['id']);
      const previous = book.limits().find((l) => l.id === id);
      if (!previous) throw new HttpError(404, `no alarm limit with id "${id}"; GET /api/alarm-limits lists them`);
      const { reason, changes } = parseEdit(req.body);
      const next = applyEdit(previous, changes);
      try {
        book.updateLimit(next);
      } catch (error) {
        throw httpErrorOf(error);
      }
      const actor = actorOf(req);
      try {
        await saveAlarmLimit(db, next, previous, actor, reason);
      } catch (error) {
        book.updateLimit(previous);
        throw error;
      }
      res.json({ limit: next, previous });
    },
  };
}

/** Splits the body into the reason and the changed fields; 400 for anything else. */
function parseEdit(body: unknown): { reason: string; changes: Record<string, unknown> } {
  if (typeof body !== 'object' || body === null || Array.isArray(body)) {
    throw new HttpError(400, `send a JSON object with the fields to change (${EDITABLE.join(', ')}) and a reason`);
  }
  const { reason, ...changes } = body as Record<string, unknown>;
  const text = typeof reason === 'string' ? reason.trim() : '';
  if (text === '') throw new HttpError(400, 'reason is required: say why the limit changes (it goes into the audit trail)');
  if (text.length > MAX_REASON_CHARS) throw new HttpError(400, `reason must be at most ${MAX_REASON_CHARS} characters`);
  const unknown = Object.keys(changes).filter((k) => !(EDITABLE as readonly string[]).includes(k));
  if (unknown.length > 0) {
    throw new HttpError(400, `cannot change ${unknown.join(', ')}: id and channel identify the alarm; editable fields are ${EDITABLE.join(', ')}`);
  }
  if (Object.keys(changes).length === 0) throw new HttpError(400, `nothing to change: send at least one of ${EDITABLE.join(', ')}`);
  return { reason: text, changes };
}

/** The edited limit, validated; a partial `rationale` keeps the parts not sent. */
function applyEdit(previous: AlarmLimit, changes: Record<string, unknown>): AlarmLimit {
  const rationale = changes['rationale'];
  const merged = {
    ...previous,
    ...changes,
    rationale: typeof rationale === 'object' && rationale !== null && !Array.isArray(rationale) ? { ...previous.rationale, ...rationale } : (rationale ?? previous.rationale),
  };
  try {
    return parseAlarmLimit(merged);
  } catch (error) {
    throw new HttpError(400, (error as Error).message);
  }
}
