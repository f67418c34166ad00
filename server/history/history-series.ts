/**
 * The series part of a history window: the resolution (raw block means while the 1 kHz
 * samples are kept, 1 s roll-ups after), read chunk by chunk from the storage worker so a
 * long export never sits in memory and the field math never holds the event loop for long.
 */
import type { Calibration } from '../../shared/field/calibration.js';
import { fieldUncertainty } from '../../shared/field/field-uncertainty.js';
import type { HistorySeries } from '../../shared/history/history-api.js';
import type { SlowChunk } from '../../shared/live/live-state.js';
import type { CalibrationCache } from '../field/calibration-cache.js';
import { appendSeriesChunk, appendSlowChunk, DECIMATION_BLOCK_MS, emptySeriesChunk, emptySlowChunk } from '../live/series-chunk.js';
import { rawSeries, rollupSeries } from '../series/series-query.js';
import { MEANS_BLOCK_MS } from '../storage/block-means.js';
import type { TelemetryReader } from '../storage/storage-protocol.js';

/** Points per chunk read from the storage worker. */
const CHUNK_POINTS = 5000;
/** Points whose σ are computed between two turns of the event loop. */
const SIGMA_SLICE = 500;
/**
 * Raw windows give the slow readings (10 Hz, slowly changing) blocks this many times longer
 * than the fast ones: a tenth of the points, every reading for windows under a minute.
 */
const SLOW_BLOCK_FACTOR = 10;

export interface HistoryPlan {
  fromMs: number;
  toMs: number;
  source: 'raw' | 'rollup';
  /** Each point is the mean of a block this long, ms (blocks aligned to the epoch). */
  blockMs: number;
  /** The same for the slow readings. */
  slowBlockMs: number;
}

export interface HistoryChunk {
  /** The part of the window the chunk covers, [fromMs, toMs). */
  fromMs: number;
  toMs: number;
  series: HistorySeries;
  slow: SlowChunk;
}

export interface HistorySources {
  reader: TelemetryReader;
  calibrations: CalibrationCache;
}

/** Longest raw block, ms: coarser points come from the 1 s roll-ups (at most half as many points as asked, far less to read). */
const RAW_MAX_BLOCK_MS = 500;

/**
 * Raw block means while the window lies within raw retention and blocks of at most
 * `RAW_MAX_BLOCK_MS` are asked for; otherwise roll-ups in whole seconds. Raw blocks are 10 ms, 20 ms, … up to
 * 100 ms, then whole multiples of 100 ms read from the stored block means (block-means.ts);
 * a raw window is read from whole blocks of the stored means' length (its ends rounded outwards).
 */
export function planHistory(fromMs: number, toMs: number, points: number, nowMs: number, rawHours: number): HistoryPlan {
  const spanMs = toMs - fromMs;
  const fineMs = Math.max(1, Math.ceil(spanMs / points / DECIMATION_BLOCK_MS)) * DECIMATION_BLOCK_MS;
  const rawBlockMs = fineMs > MEANS_BLOCK_MS ? Math.ceil(fineMs / MEANS_BLOCK_MS) * MEANS_BLOCK_MS : fineMs;
  const unitMs = rawBlockMs % MEANS_BLOCK_MS === 0 ? MEANS_BLOCK_MS : DECIMATION_BLOCK_MS;
  if (fromMs >= nowMs - rawHours * 3600_000 && rawBlockMs <= RAW_MAX_BLOCK_MS) {
    const snap = (ms: number, round: (v: number) => number) => round(ms / unitMs) * unitMs;
    return { fromMs: snap(fromMs, Math.floor), toMs: snap(toMs, Math.ceil), source: 'raw', blockMs: rawBlockMs, slowBlockMs: rawBlockMs * SLOW_BLOCK_FACTOR };
  }
  const blockMs = Math.max(1, Math.ceil(spanMs / points / 1000)) * 1000;
  return { fromMs, toMs, source: 'rollup', blockMs, slowBlockMs: blockMs };
}

/** The window's points in time order, a chunk (≤ CHUNK_POINTS blocks, aligned to blocks) at a time. */
export async function* historyChunks(sources: HistorySources, plan: HistoryPlan): AsyncGenerator<HistoryChunk> {
  const chunkMs = plan.blockMs * CHUNK_POINTS;
  for (let a = plan.fromMs; a < plan.toMs; ) {
    const b = Math.min(plan.toMs, (Math.floor(a / chunkMs) + 1) * chunkMs);
    yield plan.source === 'raw' ? await rawChunk(sources, a, b, plan.blockMs, plan.slowBlockMs) : await rollupChunk(sources.reader, a, b, plan.blockMs);
    a = b;
  }
}

/** The whole window in one answer (bounded by the plan's points). */
export async function historyWindow(sources: HistorySources, plan: HistoryPlan): Promise<HistoryChunk> {
  const out: HistoryChunk = { fromMs: plan.fromMs, toMs: plan.toMs, series: emptyHistorySeries(), slow: emptySlowChunk() };
  for await (const chunk of historyChunks(sources, plan)) {
    appendSeriesChunk(out.series, chunk.series);
    out.series.sigmaBMagG.push(...chunk.series.sigmaBMagG);
    out.series.sigmaThetaDeg.push(...chunk.series.sigmaThetaDeg);
    out.series.sigmaPhiDeg.push(...chunk.series.sigmaPhiDeg);
    appendSlowChunk(out.slow, chunk.slow);
  }
  return out;
}

function emptyHistorySeries(): HistorySeries {
  return { ...emptySeriesChunk(), sigmaBMagG: [], sigmaThetaDeg: [], sigmaPhiDeg: [] };
}

/** Raw block means; σ of each point from its batch's calibration covariance at the point's currents. */
async function rawChunk(sources: HistorySources, fromMs: number, toMs: number, blockMs: number, slowBlockMs: number): Promise<HistoryChunk> {
  const raw = await rawSeries(sources.reader, sources.calibrations, fromMs, toMs, blockMs);
  const slow = await sources.reader.slowRows(fromMs, toMs, slowBlockMs);
  const series: HistorySeries = { ...raw.series, sigmaBMagG: [], sigmaThetaDeg: [], sigmaPhiDeg: [] };
  const { x, y, z } = raw.series.currentA;
  for (let i = 0; i < raw.series.t.length; i++) {
    if (i > 0 && i % SIGMA_SLICE === 0) await new Promise((resolve) => setImmediate(resolve));
    const u = uncertaintyOf(raw.calibrations[i], { x: x[i], y: y[i], z: z[i] });
    series.sigmaBMagG.push(u?.magnitudeGauss ?? null);
    series.sigmaThetaDeg.push(u?.thetaDeg ?? null);
    series.sigmaPhiDeg.push(u?.phiDeg ?? null);
  }
  return { fromMs, toMs, series, slow };
}

function uncertaintyOf(calibration: Calibration, current: { x: number; y: number; z: number }) {
  return calibration.covariance ? fieldUncertainty(calibration, calibration.covariance, current) : null;
}

/** Roll-up block means, σ the mean of the stored per-second σ. */
async function rollupChunk(reader: TelemetryReader, fromMs: number, toMs: number, blockMs: number): Promise<HistoryChunk> {
  const { series, slow, blocks } = rollupSeries(await reader.rollupBlocks(fromMs, toMs, blockMs), blockMs);
  return {
    fromMs,
    toMs,
    series: { ...series, sigmaBMagG: blocks.map((b) => b.sigmaBMag), sigmaThetaDeg: blocks.map((b) => b.sigmaTheta), sigmaPhiDeg: blocks.map((b) => b.sigmaPhi) },
    slow,
  };
}
