/**
 * History benchmark with real parts (server, storage worker, PGlite, simulated controller):
 * the telemetry cluster is filled with ten minutes of demo-rate telemetry (1 kHz currents and
 * voltages in 0.5 s batches, 10 Hz slow readings, a prediction every 2 s) through the storage
 * code itself before the server starts; then a ten-minute raw window is loaded through
 * `GET /api/history`, against the live path's cost in the same run (`GET /api/series?seconds=60`,
 * the Live charts' first load, and `GET /api/live`).
 */
import { availableParallelism, loadavg } from 'node:os';
import { openDatabase } from '../../server/db/database.js';
import type { AppendInput, BatchInput, PredictionRow } from '../../server/storage/storage-protocol.js';
import { TelemetryStore } from '../../server/storage/telemetry-store.js';
import type { SlowFrame } from '../../shared/telemetry/messages.js';
import { signIn, startStack } from '../support/stack.js';
import { quantile, type Figure } from './figures.js';

const WINDOW_MS = 10 * 60_000;
const TARGET_MS = 300;
const RUNS = 7;
const BATCH_SAMPLES = 500;
const RATE_HZ = 1000;

export async function benchHistory(): Promise<Figure[]> {
  // The stored window ends before the server starts, so live telemetry does not mix into it.
  const toMs = Math.floor(Date.now() / 1000) * 1000 - 5000;
  const fromMs = toMs - WINDOW_MS;
  let fillMs = 0;
  const stack = await startStack({
    env: { LOG_LEVEL: 'error' },
    beforeServer: async (dataDir) => {
      const started = performance.now();
      await fill(dataDir, fromMs, toMs);
      fillMs = performance.now() - started;
    },
  });
  try {
    const token = await signIn(stack.server.url, 'viewer');
    const get = async (path: string) => {
      const started = performance.now();
      const res = await fetch(`${stack.server.url}${path}`, { headers: { authorization: `Bearer ${token}` } });
      const bytes = (await res.arrayBuffer()).byteLength;
      if (res.status !== 200) throw new Error(`${path}: ${res.status}`);
      return { ms: performance.now() - started, bytes };
    };
    const historyPath = `/api/history?from=${new Date(fromMs).toISOString()}&to=${new Date(toMs).toISOString()}`;
    // Let the live charts' minute fill with real telemetry, then warm both paths once.
    await new Promise((r) => setTimeout(r, 5000));
    const first = await get(historyPath);
    await get('/api/series?seconds=60');
    const history: number[] = [];
    const series: number[] = [];
    const live: number[] = [];
    for (let i = 0; i < RUNS; i++) {
      history.push((await get(historyPath)).ms);
      series.push((await get('/api/series?seconds=60')).ms);
      live.push((await get('/api/live')).ms);
    }
    const historyMs = quantile(history, 0.5);
    const seriesMs = quantile(series, 0.5);
    return [
      { name: 'fill: 10 min of demo-rate telemetry written', value: fillMs / 1000, unit: 's' },
      { name: '10-min raw window, GET /api/history (median)', value: historyMs, unit: 'ms', note: `target ≤ ${TARGET_MS} ms: ${historyMs <= TARGET_MS ? 'met' : 'NOT met'}; first load ${first.ms.toFixed(0)} ms, ${(first.bytes / 1e6).toFixed(2)} MB` },
      { name: 'live charts, GET /api/series?seconds=60 (median)', value: seriesMs, unit: 'ms' },
      { name: 'latest state, GET /api/live (median)', value: quantile(live, 0.5), unit: 'ms' },
      { name: 'history window / live charts', value: historyMs / seriesMs, unit: '×', note: `1-min load average ${loadavg()[0].toFixed(1)} on ${availableParallelism()} cores` },
    ];
  } finally {
    await stack.close();
  }
}

/** Writes [fromMs, toMs) of demo-like telemetry into the data folder's telemetry cluster, a minute per transaction. */
async function fill(dataDir: string, fromMs: number, toMs: number): Promise<void> {
  const database = await openDatabase({ dataDir, databaseUrl: null, pgliteFolder: 'telemetry' });
  try {
    const store = new TelemetryStore(() => database.db, { maxPendingSamples: 120_000 });
    let seq = 0;
    for (let minute = fromMs; minute < toMs; minute += 60_000) {
      const input: AppendInput = { batches: [], slow: [], rollups: [], predictions: [], frames: 0, samples: 0 };
      for (let t0 = minute; t0 < minute + 60_000; t0 += BATCH_SAMPLES) {
        input.batches.push(batch(t0, seq));
        seq += BATCH_SAMPLES / 20;
        input.frames += BATCH_SAMPLES / 20;
        input.samples += BATCH_SAMPLES;
      }
      for (let t = minute; t < minute + 60_000; t += 100) input.slow.push(slowFrame(t, t / 100));
      for (let t = minute; t < minute + 60_000; t += 2000) input.predictions.push(prediction(t));
      store.append(input);
      await store.flush();
    }
    if (store.state().framesDropped > 0) throw new Error('the fill did not fit in the write queue');
  } finally {
    await database.close();
  }
}

/** A slow turn of the field at about 7 G with converter-like noise on every sample. */
function currentsAt(tMs: number): [number, number, number] {
  const phase = (2 * Math.PI * tMs) / 120_000;
  const noise = () => (Math.random() - 0.5) * 4e-3;
  return [4 + 1.5 * Math.cos(phase) + noise(), 1.5 * Math.sin(phase) + noise(), 3.6 + noise()];
}

function batch(t0Ms: number, seqFirst: number): BatchInput {
  const n = BATCH_SAMPLES;
  const samples = new Float64Array(6 * n);
  for (let i = 0; i < n; i++) {
    const [x, y, z] = currentsAt(t0Ms + (i * 1000) / RATE_HZ);
    samples[i] = x;
    samples[n + i] = y;
    samples[2 * n + i] = z;
    samples[3 * n + i] = 0.05 * x;
    samples[4 * n + i] = 0.05 * y;
    samples[5 * n + i] = 0.05 * z;
  }
  // Calibration id 1: the demo calibration, the first row the server seeds.
  return { t0Ms, rateHz: RATE_HZ, seqFirst, seqLast: seqFirst + n / 20 - 1, calibrationId: 1, setpoint: { x: 4, y: 0, z: 3.6 }, n, samples };
}

function slowFrame(tMs: number, seq: number): SlowFrame {
  return { seq, tMs, coilTempC: { x: 24, y: 23.5, z: 25 }, flowLpm: { x: 3.2, y: 3, z: 2.8 }, waterSupplyC: 18, waterReturnC: { x: 21, y: 20.5, z: 22 } };
}

function prediction(tMs: number): PredictionRow {
  return {
    tMs, profileId: 1, thetaDeg: 30, phiDeg: 20, stable: true, reason: null, epsDd: 0.15,
    fermiSurfaceAspect: 0.93, cloudAspect: 1.05, tofAspect: 1.08, tofMajorAngleDeg: 12, collapseRatio: 0.4, camera: null,
  };
}
