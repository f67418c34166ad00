import { eq } from 'drizzle-orm';
import type { Response } from 'express';
import type { HistoryPredictionStatus, HistoryResponse, HistoryRun } from '../../shared/history/history-api.js';
import type { ServerConfig } from '../config.js';
import type { Db } from '../db/database.js';
import { runs, sequences } from '../db/schema.js';
import type { CalibrationCache } from '../field/calibration-cache.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { predictionStatusOver, type PredictionStatusLog } from '../prediction/prediction-status-log.js';
import { storageReadError } from '../storage/read-error.js';
import type { TelemetryWriter } from '../storage/telemetry-writer.js';
import { writeHistoryCsv } from './history-csv.js';
import { historyEvents } from './history-events.js';
import { historyInForce, type InForceSources } from './history-in-force.js';
import { checkWindow, parseHistoryRequest, type HistoryTarget } from './history-request.js';
import { historyWindow, planHistory, type HistoryPlan, type HistorySources } from './history-series.js';

/** Time shown before a run's start and after its end, ms. */
export const RUN_MARGIN_MS = 5000;
/** Windows ending this close to now first hand the writer's queued frames to storage, ms. */
const RECENT_MS = 5000;

export interface HistoryDeps extends InForceSources {
  db: Db;
  writer: Pick<TelemetryWriter, 'flush'> & HistorySources['reader'];
  /** Changes of whether the prediction applied, written before a recent window is read. */
  statusLog: Pick<PredictionStatusLog, 'flush'>;
  calibrations: CalibrationCache;
  retention: ServerConfig['retention'];
  now?: () => number;
}

/**
 * `GET /api/history?from=ISO&to=ISO` or `?run=ID` (`&points=N`, `&format=csv`): the stored
 * telemetry, predictions and records of a window (shared/history/history-api.ts).
 */
export function historyHandlers(deps: HistoryDeps): Pick<RouteHandlers, 'history'> {
  const now = deps.now ?? Date.now;
  const sources: HistorySources = { reader: deps.writer, calibrations: deps.calibrations };
  return {
    history: async (req, res) => {
      const request = parseHistoryRequest(req.query);
      const { fromMs, toMs, run } = await resolveTarget(deps.db, request.target, now());
      const plan = planHistory(fromMs, toMs, request.points, now(), deps.retention.rawHours);
      await unavailableAs503(async () => {
        if (toMs > now() - RECENT_MS) await Promise.all([deps.writer.flush(), deps.statusLog.flush()]);
      });
      if (request.format === 'csv') {
        const status = await unavailableAs503(() => predictionStatusOver(deps.db, fromMs, toMs));
        return streamCsv(res, sources, plan, run, status);
      }
      const body = await unavailableAs503(async (): Promise<HistoryResponse> => {
        // The main database (events, status, versions) and the storage worker (the rest) answer side by side.
        const [window, prediction, status, inForce, events] = await Promise.all([
          historyWindow(sources, plan),
          deps.writer.predictions(fromMs, toMs, request.points),
          predictionStatusOver(deps.db, fromMs, toMs),
          historyInForce(deps, fromMs, toMs),
          historyEvents(deps.db, fromMs, toMs),
        ]);
        return {
          from: new Date(fromMs).toISOString(),
          to: new Date(toMs).toISOString(),
          resolutionMs: plan.blockMs,
          source: plan.source,
          series: window.series,
          slow: window.slow,
          prediction: { ...prediction, status },
          inForce,
          events,
          run,
        };
      });
      res.json(body);
    },
  };
}

/** The window asked for, or the run's with a margin either side (404 for an unknown run). */
async function resolveTarget(db: Db, target: HistoryTarget, nowMs: number): Promise<{ fromMs: number; toMs: number; run: HistoryRun | null }> {
  if (target.kind === 'window') return { fromMs: target.fromMs, toMs: target.toMs, run: null };
  const [row] = await db
    .select({ id: runs.id, state: runs.state, startedAt: runs.startedAt, endedAt: runs.endedAt, name: sequences.name, version: sequences.version })
    .from(runs)
    .innerJoin(sequences, eq(runs.sequenceId, sequences.id))
    .where(eq(runs.id, target.runId));
  if (!row) throw new HttpError(404, `No run with id ${target.runId}: see GET /api/runs`);
  const fromMs = row.startedAt.getTime() - RUN_MARGIN_MS;
  // A run still going is shown up to now.
  const toMs = row.endedAt ? row.endedAt.getTime() + RUN_MARGIN_MS : Math.max(nowMs, fromMs + 1);
  checkWindow(fromMs, toMs, 'run');
  return {
    fromMs,
    toMs,
    run: { id: row.id, label: `Run ${row.id}: sequence "${row.name}" version ${row.version}`, state: row.state, startedAt: row.startedAt.toISOString(), endedAt: row.endedAt?.toISOString() ?? null },
  };
}

async function streamCsv(res: Response, sources: HistorySources, plan: HistoryPlan, run: HistoryRun | null, status: HistoryPredictionStatus): Promise<void> {
  const stamp = (ms: number) => new Date(ms).toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z');
  const name = run ? `tiltwatch-run-${run.id}.csv` : `tiltwatch-history-${stamp(plan.fromMs)}-${stamp(plan.toMs)}.csv`;
  res.attachment(name);
  res.type('text/csv; charset=utf-8');
  try {
    await writeHistoryCsv(res, sources, plan, status);
  } catch (error) {
    // The header is out already: end the download broken rather than pretend it is complete.
    res.destroy(error as Error);
  }
}

/** Read failures become 503: live data goes on, the history comes back when storage does. */
async function unavailableAs503<T>(read: () => Promise<T>): Promise<T> {
  try {
    return await read();
  } catch (error) {
    if (error instanceof HttpError) throw error;
    throw storageReadError(error);
  }
}
