/**
 * `GET /api/levels` (viewer): the level set in force; `GET /api/levels/history` (viewer): its
 * stored versions; `PUT /api/levels` (lead): `{ levels, reason }` stores the next version,
 * audited, once it validates and no alarm limit lies beyond a trip level; `GET /api/channels`
 * (viewer): the display bands composed from the level set and the alarm limits in force.
 */
import { z } from 'zod';
import { composeChannelBands } from '../../shared/levels/channel-bands.js';
import { levelFieldLabel } from '../../shared/levels/level-set.js';
import type { AlarmBook } from '../alarms/alarm-book.js';
import { actorOf } from '../alarms/alarm-routes.js';
import { CHANGE_REASON_LABEL, changeReason } from '../http/change-reason.js';
import { labelled, labelledInside } from '../http/field-labels.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { tripLevelProblem } from './level-checks.js';
import { LevelSetError, parseLevelSet } from './level-set-schema.js';
import type { LevelStore } from './level-store.js';

/** The labels of a level-set change as the levels form shows them (the route checks the body itself). */
export const LevelsBody = z.object({ levels: labelledInside(z.unknown(), 'Levels', levelFieldLabel), reason: labelled(z.unknown(), CHANGE_REASON_LABEL) });

export type LevelRoutes = 'levels.get' | 'levels.history' | 'levels.update' | 'channels';

export function levelHandlers(levels: LevelStore, book: AlarmBook): Pick<RouteHandlers, LevelRoutes> {
  return {
    'levels.get': (_req, res) => {
      res.json(levels.inForce());
    },
    'levels.history': async (_req, res) => {
      res.json({ versions: await levels.history() });
    },
    'levels.update': async (req, res) => {
      const body: unknown = req.body;
      if (typeof body !== 'object' || body === null || Array.isArray(body)) {
        throw new HttpError(400, 'send a JSON object { levels, reason } with the whole level set and why it changes');
      }
      const { levels: input, reason: reasonInput, ...rest } = body as Record<string, unknown>;
      const extra = Object.keys(rest);
      if (extra.length > 0) throw new HttpError(400, `unknown fields ${extra.join(', ')}: send { levels, reason }`);
      const reason = changeReason(reasonInput, 'the level set');
      let next;
      try {
        next = parseLevelSet(input);
      } catch (error) {
        if (error instanceof LevelSetError) throw new HttpError(400, error.message, error.field === '' ? null : `levels.${error.field}`);
        throw error;
      }
      const levelSet = next;
      const saved = await levels.exclusive(async () => {
        const problem = tripLevelProblem(book.limits(), levelSet.trips);
        if (problem) throw new HttpError(400, problem.message, `levels.${problem.field}`);
        return levels.save(levelSet, actorOf(req), reason);
      });
      res.json(saved);
    },
    channels: (_req, res) => {
      res.json(composeChannelBands(levels.inForce(), book.limits()));
    },
  };
}
