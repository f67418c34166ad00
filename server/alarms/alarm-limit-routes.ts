/**
 * `GET /api/alarm-limits` (viewer) and `PUT /api/alarm-limits/:id` (lead): a lead edits one
 * limit's level, deadband, delays, priority, latching or rationale with a reason; the change
 * is validated against the whole set, stored with its audit entry (old value, new value,
 * reason), and the alarm keeps its state while the next evaluation applies the new level.
 */
import type { Db } from '../db/database.js';
import { z } from 'zod';
import { CHANGE_REASON_LABEL, changeReason } from '../http/change-reason.js';
import { labelledInside } from '../http/field-labels.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { alarmLimitProblem } from '../levels/level-checks.js';
import type { LevelStore } from '../levels/level-store.js';
import type { AlarmBook } from './alarm-book.js';
import { ALARM_LIMIT_LABELS, AlarmLimitError, parseAlarmLimit, type AlarmLimit } from './alarm-limit.js';
import { saveAlarmLimit } from './alarm-limit-repository.js';
import { actorOf, httpErrorOf } from './alarm-routes.js';

/** The labels of a limit edit as the limit editor shows them (the route checks the body itself). */
export const LimitEditBody = labelledInside(z.unknown(), 'Alarm limit', (path) =>
  path[0] === 'reason' ? CHANGE_REASON_LABEL : ((ALARM_LIMIT_LABELS as Readonly<Record<string, string>>)[path.join('.')] ?? null),
);

const EDITABLE = ['level', 'limit', 'deadband', 'onDelayMs', 'offDelayMs', 'priority', 'latching', 'suppressDuringRamp', 'rationale'] as const;

/**
 * @param levels the level set in force: an alarm limit beyond its trip level is refused.
 * @param changed called with nothing once an edit is stored (the display bands changed).
 */
export function alarmLimitHandlers(db: Db, book: AlarmBook, levels: LevelStore, changed: () => void): Pick<RouteHandlers, 'alarm-limits.list' | 'alarm-limits.update'> {
  return {
    'alarm-limits.list': (_req, res) => {
      res.json({ limits: book.limits() });
    },
    'alarm-limits.update': async (req, res) => {
      const id = String(req.params['id']);
      if (!book.limits().some((l) => l.id === id)) throw new HttpError(404, `no alarm limit with id "${id}"; GET /api/alarm-limits lists them`);
      const { reason, changes } = parseEdit(req.body);
      const actor = actorOf(req);
      const edited = await levels.exclusive(async () => {
        // Read inside the edit: another edit of this limit may have been stored meanwhile.
        const previous = book.limits().find((l) => l.id === id)!;
        const next = applyEdit(previous, changes);
        const problem = alarmLimitProblem(book.limits().map((l) => (l.id === id ? next : l)), next, levels.inForce().levels.trips);
        if (problem) throw new HttpError(400, problem.message, problem.field);
        try {
          book.updateLimit(next);
        } catch (error) {
          throw httpErrorOf(error);
        }
        try {
          await saveAlarmLimit(db, next, previous, actor, reason);
        } catch (error) {
          book.updateLimit(previous);
          throw error;
        }
        return { limit: next, previous };
      });
      changed();
      res.json(edited);
    },
  };
}

/** Splits the body into the reason and the changed fields; 400 for anything else. */
function parseEdit(body: unknown): { reason: string; changes: Record<string, unknown> } {
  if (typeof body !== 'object' || body === null || Array.isArray(body)) {
    throw new HttpError(400, `send a JSON object with the fields to change (${EDITABLE.join(', ')}) and a reason`);
  }
  const { reason, ...changes } = body as Record<string, unknown>;
  const text = changeReason(reason, 'the limit');
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
    throw error instanceof AlarmLimitError ? new HttpError(400, error.message, error.field) : error;
  }
}
