import { z } from 'zod';
import { isoTime, queryNumber } from '../http/fields.js';
import { HttpError } from '../http/http-error.js';
import { parseInput } from '../http/validate.js';

/** Points per series in a JSON answer unless `points` asks for fewer. */
export const HISTORY_DEFAULT_POINTS = 5000;
/** Most points per series in a JSON answer. */
export const HISTORY_MAX_POINTS = 20_000;
/** Most rows of a CSV export (its default): a day at 1 s, ten minutes at 10 ms. */
export const CSV_MAX_POINTS = 100_000;
/** Longest window one request covers, ms (7 days). */
export const HISTORY_MAX_WINDOW_MS = 7 * 86_400_000;

const Query = z.object({
  from: isoTime().optional(),
  to: isoTime().optional(),
  run: queryNumber({ min: 1, max: 2_147_483_647, integer: true }).optional(),
  points: queryNumber({ min: 2, max: CSV_MAX_POINTS, integer: true }).optional(),
  format: z.enum(['json', 'csv'], { error: 'must be json or csv' }).default('json'),
});

export type HistoryTarget = { kind: 'window'; fromMs: number; toMs: number } | { kind: 'run'; runId: number };

export interface HistoryRequest {
  target: HistoryTarget;
  /** Most points per series. */
  points: number;
  format: 'json' | 'csv';
}

const bad = (message: string) => new HttpError(400, `Invalid request query: ${message}`);

/** Reads `from`, `to` (ISO 8601) or `run`, `points`, `format` of `GET /api/history`; 400 naming the parameter. */
export function parseHistoryRequest(query: unknown): HistoryRequest {
  const q = parseInput(Query, query, 'query');
  const maxPoints = q.format === 'csv' ? CSV_MAX_POINTS : HISTORY_MAX_POINTS;
  if (q.points !== undefined && q.points > maxPoints) throw bad(`points: must be a whole number from 2 to ${maxPoints}`);
  const points = q.points ?? (q.format === 'csv' ? CSV_MAX_POINTS : HISTORY_DEFAULT_POINTS);
  if (q.run !== undefined) {
    if (q.from || q.to) throw bad('run: give either run or from and to, not both');
    return { target: { kind: 'run', runId: q.run }, points, format: q.format };
  }
  if (!q.from && !q.to) throw bad('from, to: give a window (from and to, ISO 8601 times such as 2026-12-02T06:00:00Z) or a run (run=ID)');
  if (!q.from) throw bad('from: missing (a window needs from and to)');
  if (!q.to) throw bad('to: missing (a window needs from and to)');
  const fromMs = q.from.getTime();
  const toMs = q.to.getTime();
  checkWindow(fromMs, toMs, 'to');
  return { target: { kind: 'window', fromMs, toMs }, points, format: q.format };
}

/** A window must run forwards and be at most `HISTORY_MAX_WINDOW_MS` long; `field` is named in the 400. */
export function checkWindow(fromMs: number, toMs: number, field: string): void {
  if (toMs <= fromMs) throw bad(`${field}: must be later than from (${new Date(fromMs).toISOString()})`);
  if (toMs - fromMs > HISTORY_MAX_WINDOW_MS) {
    throw bad(`${field}: the window may be at most ${HISTORY_MAX_WINDOW_MS / 86_400_000} days long (asked for ${((toMs - fromMs) / 86_400_000).toFixed(1)} days)`);
  }
}
