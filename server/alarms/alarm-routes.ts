/**
 * The alarm API: lists, history, health figures and the operator actions (acknowledge,
 * shelve, unshelve, out of service, reset of latched alarms). Each action is worked out, then
 * stored in its own transaction (event, audit entry, the alarm's new state), and only then
 * takes effect and is answered; when the write fails the alarm is left as it was and the
 * answer is 503. The WebSocket `alarms` message follows.
 */
import type { Request, RequestHandler } from 'express';
import { z } from 'zod';
import type { AlarmActionResult, AlarmHealthReport } from '../../shared/alarms/alarm-api.js';
import type { Db } from '../db/database.js';
import { writeFailureText } from '../db/write-failure.js';
import { labelled } from '../http/field-labels.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { parseInput } from '../http/validate.js';
import type { AlarmBook, AlarmRequest } from './alarm-book.js';
import { activeAlarms, alarmItem, allAlarms } from './alarm-body.js';
import { alarmHistory, raisesBetween } from './alarm-event-repository.js';
import { alarmHealth, DEFAULT_HEALTH_RULES } from './alarm-health.js';
import { AlarmRequestError } from './alarm-request-error.js';
import type { SupervisionLog } from './supervision-log.js';

/** Most events one history request returns. */
const MAX_HISTORY_EVENTS = 5000;
/** Longest history window, h (30 days). */
const MAX_HISTORY_HOURS = 24 * 30;
const HISTORY_DEFAULT_HOURS = 24;

const ListQuery = z.object({
  state: z.enum(['active', 'all'], { error: 'state must be "active" or "all"' }).default('active'),
});
const HoursQuery = z.object({
  hours: z.coerce
    .number({ error: `hours must be a number of hours above 0 and at most ${MAX_HISTORY_HOURS}` })
    .refine((h) => Number.isFinite(h) && h > 0 && h <= MAX_HISTORY_HOURS, `hours must be a number of hours above 0 and at most ${MAX_HISTORY_HOURS}`)
    .default(HISTORY_DEFAULT_HOURS),
});
/** Shapes only; the book checks reasons and the minutes range and says what to fix. Labels as the reason dialog shows them. */
const reason = labelled(z.unknown(), 'Reason').optional();
export const ShelveBody = z.object({ minutes: labelled(z.unknown(), 'Minutes').optional(), reason });
export const ReasonBody = z.object({ reason });
export const OutOfServiceBody = z.object({
  on: labelled(z.boolean({ error: 'must be true (take out of service) or false (return to service)' }), 'Out of service'),
  reason,
});

export interface AlarmRouteDeps {
  db: Db;
  book: AlarmBook;
  records: SupervisionLog;
  /** Publishes the WebSocket `alarms` message when the active list changed. */
  announce: () => void;
  now?: () => number;
}

/** The routes `alarmHandlers` answers. */
export type AlarmRoutes =
  | 'alarms.list'
  | 'alarms.history'
  | 'alarms.health'
  | 'alarms.acknowledge'
  | 'alarms.shelve'
  | 'alarms.unshelve'
  | 'alarms.out-of-service'
  | 'alarms.reset';

export function alarmHandlers(deps: AlarmRouteDeps): Pick<RouteHandlers, AlarmRoutes> {
  const { db, book, records } = deps;
  const now = deps.now ?? Date.now;

  /** Works out an operator action on alarm `:id`, stores it, applies it, then answers with the alarm. */
  const action = (request: (body: unknown) => AlarmRequest): RequestHandler => {
    return async (req, res) => {
      const id = String(req.params['id']);
      const actor = actorOf(req);
      let prepared;
      try {
        prepared = book.prepare(id, actor, request(req.body));
      } catch (error) {
        throw httpErrorOf(error);
      }
      if (prepared) {
        try {
          await records.recordAlarmAction(prepared.event, prepared.memory);
        } catch (error) {
          prepared.cancel();
          throw new HttpError(503, `The ${prepared.event.kind} of alarm ${id} could not be recorded (${writeFailureText(error)}); nothing was changed. Try again.`);
        }
        prepared.commit();
        deps.announce();
      }
      const result: AlarmActionResult = { alarm: alarmItem(book, id)!, changed: prepared !== null };
      res.json(result);
    };
  };

  return {
    'alarms.list': (req, res) => {
      const { state } = parseInput(ListQuery, req.query, 'query');
      res.json({ alarms: state === 'active' ? activeAlarms(book) : allAlarms(book) });
    },
    'alarms.history': async (req, res) => {
      const { hours } = parseInput(HoursQuery, req.query, 'query');
      await records.flush();
      const to = now();
      res.json({ events: await alarmHistory(db, to - hours * 3_600_000, to, MAX_HISTORY_EVENTS) });
    },
    'alarms.health': async (req, res) => {
      const { hours } = parseInput(HoursQuery, req.query, 'query');
      await records.flush();
      const to = now();
      const from = to - hours * 3_600_000;
      const health = alarmHealth(await raisesBetween(db, from, to), book.active(), from, to);
      const iso = (ms: number) => new Date(ms).toISOString();
      const rules = DEFAULT_HEALTH_RULES;
      const body: AlarmHealthReport = {
        from: iso(from),
        to: iso(to),
        recentCount: health.recentCount,
        flooding: health.flooding,
        averagePerInterval: health.averagePerInterval,
        intervals: health.intervals.map((i) => ({ start: iso(i.start), count: i.count, flood: i.flood })),
        chattering: health.chattering.map((c) => ({ alarmId: c.alarmId, raises: c.raises, since: iso(c.since) })),
        stale: health.stale.map((s) => ({ alarmId: s.alarmId, raisedAt: iso(s.raisedAt), activeForMs: s.activeForMs })),
        rules: {
          intervalMinutes: rules.intervalMs / 60_000,
          floodAbove: rules.floodAbove,
          chatterRaises: rules.chatterRaises,
          chatterWindowS: rules.chatterWindowMs / 1000,
          staleAfterHours: rules.staleAfterMs / 3_600_000,
        },
      };
      res.json(body);
    },
    'alarms.acknowledge': action(() => ({ kind: 'acknowledge' })),
    'alarms.shelve': action((body) => ({ kind: 'shelve', ...parseInput(ShelveBody, body, 'body') })),
    'alarms.unshelve': action((body) => ({ kind: 'unshelve', reason: parseInput(ReasonBody, body, 'body').reason })),
    'alarms.out-of-service': action((body) => ({ kind: 'out-of-service', ...parseInput(OutOfServiceBody, body, 'body') })),
    'alarms.reset': action((body) => ({ kind: 'reset', reason: parseInput(ReasonBody, body, 'body').reason })),
  };
}

/** The signed-in user's e-mail (the route guard put the user on the request). */
export function actorOf(req: Request): string {
  if (!req.user) throw new HttpError(401, 'Sign in first');
  return req.user.email;
}

/** AlarmRequestError → 404 / 400 / 409 with its message; anything else unchanged. */
export function httpErrorOf(error: unknown): unknown {
  if (!(error instanceof AlarmRequestError)) return error;
  const status = error.code === 'not-found' ? 404 : error.code === 'invalid' ? 400 : 409;
  return new HttpError(status, error.message, error.field);
}
