/**
 * `GET /api/history?…&format=csv`: the same series points as the JSON answer, one row each,
 * streamed chunk by chunk (csv-stringify, with back-pressure), so a day exports without being
 * held in memory. The slow readings, the prediction in force and whether it applied then (its
 * state and, when it did not apply, why, as Live said it) are carried alongside each row (the
 * latest at or before its time). Units are named in every header.
 */
import { once } from 'node:events';
import type { Writable } from 'node:stream';
import { stringify } from 'csv-stringify';
import type { HistoryPrediction, HistoryPredictionStatus } from '../../shared/history/history-api.js';
import type { SlowChunk } from '../../shared/live/live-state.js';
import { historyChunks, type HistoryChunk, type HistoryPlan, type HistorySources } from './history-series.js';

export const HISTORY_CSV_COLUMNS = [
  'time_utc',
  'time_unix_ms',
  'current_x_A',
  'current_y_A',
  'current_z_A',
  'field_magnitude_G',
  'field_theta_deg',
  'field_phi_deg',
  'sigma_field_magnitude_G',
  'sigma_field_theta_deg',
  'sigma_field_phi_deg',
  'coil_temperature_x_degC',
  'coil_temperature_y_degC',
  'coil_temperature_z_degC',
  'coolant_flow_x_L_per_min',
  'coolant_flow_y_L_per_min',
  'coolant_flow_z_L_per_min',
  'predicted_fermi_surface_aspect_1',
  'predicted_cloud_aspect_1',
  'predicted_tof_aspect_1',
  'predicted_tof_major_angle_deg',
  'predicted_collapse_ratio_1',
  'prediction_state',
  'prediction_not_applying_because',
] as const;

type Cell = string | number | null;

/** Writes the CSV of `plan` to `out` (the HTTP response), ending it; `status` holds the prediction's state changes over the window. */
export async function writeHistoryCsv(out: Writable, sources: HistorySources, plan: HistoryPlan, status: HistoryPredictionStatus): Promise<void> {
  const csv = stringify({ header: true, columns: [...HISTORY_CSV_COLUMNS], cast: { number: (n) => String(n) } });
  csv.pipe(out);
  const held: Held = { slow: null, prediction: null, status: null, nextStatus: 0 };
  for await (const chunk of historyChunks(sources, plan)) {
    if (chunk.series.t.length === 0) continue;
    // Every prediction of the chunk: at most ten a second, a few thousand per chunk.
    const predictions = await sources.reader.predictions(chunk.fromMs, chunk.toMs, Number.MAX_SAFE_INTEGER);
    for (const row of rows(chunk, predictions, status, held)) {
      if (!csv.write(row)) await once(csv, 'drain');
    }
  }
  csv.end();
  await once(out, 'finish');
}

/** The latest cells at or before the row being written, kept across chunks. */
interface Held {
  slow: Cell[] | null;
  prediction: Cell[] | null;
  status: Cell[] | null;
  /** Index of the next status change not yet in force. */
  nextStatus: number;
}

/** The chunk's rows, with the latest slow reading, prediction and prediction state at or before each row's time. */
function* rows(chunk: HistoryChunk, predictions: HistoryPrediction, status: HistoryPredictionStatus, held: Held): Generator<Cell[]> {
  const { series, slow } = chunk;
  let s = 0;
  let p = 0;
  for (let i = 0; i < series.t.length; i++) {
    const t = series.t[i];
    for (; s < slow.t.length && slow.t[s] <= t; s++) held.slow = slowCells(slow, s);
    for (; p < predictions.t.length && predictions.t[p] <= t; p++) held.prediction = predictionCells(predictions, p);
    for (; held.nextStatus < status.t.length && status.t[held.nextStatus] <= t; held.nextStatus++) {
      held.status = [status.state[held.nextStatus], status.reason[held.nextStatus]];
    }
    yield [
      new Date(t).toISOString(),
      t,
      series.currentA.x[i],
      series.currentA.y[i],
      series.currentA.z[i],
      series.bMagG[i],
      series.thetaDeg[i],
      series.phiDeg[i],
      series.sigmaBMagG[i],
      series.sigmaThetaDeg[i],
      series.sigmaPhiDeg[i],
      ...(held.slow ?? [null, null, null, null, null, null]),
      ...(held.prediction ?? [null, null, null, null, null]),
      ...(held.status ?? [null, null]),
    ];
  }
}

function slowCells(slow: SlowChunk, i: number): Cell[] {
  return [slow.temperatureC.x[i], slow.temperatureC.y[i], slow.temperatureC.z[i], slow.flowLpm.x[i], slow.flowLpm.y[i], slow.flowLpm.z[i]];
}

function predictionCells(p: HistoryPrediction, i: number): Cell[] {
  return [p.fermiSurfaceAspect[i], p.cloudAspect[i], p.tofAspect[i], p.tofMajorAngleDeg[i], p.collapseRatio[i]];
}
