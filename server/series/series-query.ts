import { fieldAngles, fieldFromCurrents } from '../../shared/field/field-vector.js';
import type { Calibration } from '../../shared/field/calibration.js';
import type { SeriesChunk, SlowChunk } from '../../shared/live/live-state.js';
import type { CalibrationCache } from '../field/calibration-cache.js';
import { appendSeriesPoint, appendSlowPoint, DECIMATION_BLOCK_MS, emptySeriesChunk, emptySlowChunk } from '../live/series-chunk.js';
import type { RollupBlock, TelemetryReader } from '../storage/storage-protocol.js';

/** Windows up to this long are read from the raw batches, longer ones from the 1 s roll-ups (s). */
export const RAW_WINDOW_MAX_S = 300;
/** Most points per series in one answer. */
export const MAX_POINTS = 5000;

export interface SeriesWindow {
  series: SeriesChunk;
  slow: SlowChunk;
}

/**
 * Chart points for [fromMs, toMs] (epoch ms). Short windows come from the raw 1 kHz batches
 * as block means (10 ms blocks, longer when needed to stay under `MAX_POINTS`), with the field
 * through the calibration each batch was recorded with; long windows come from the roll-ups.
 * The reading and decoding happen in the storage worker; only the field math runs here.
 */
export async function querySeries(reader: TelemetryReader, calibrations: CalibrationCache, fromMs: number, toMs: number): Promise<SeriesWindow> {
  if (toMs - fromMs <= RAW_WINDOW_MAX_S * 1000) {
    const raw = await rawSeries(reader, calibrations, fromMs, toMs, blockLength(fromMs, toMs, DECIMATION_BLOCK_MS));
    return { series: raw.series, slow: await reader.slowRows(fromMs, toMs) };
  }
  const blockMs = blockLength(fromMs, toMs, 1000);
  const { series, slow } = rollupSeries(await reader.rollupBlocks(fromMs, toMs, blockMs), blockMs);
  return { series, slow };
}

/** Block length (ms): a multiple of `unitMs`, at least `unitMs`, giving ≤ MAX_POINTS blocks. */
function blockLength(fromMs: number, toMs: number, unitMs: number): number {
  return Math.max(1, Math.ceil((toMs - fromMs) / MAX_POINTS / unitMs)) * unitMs;
}

/**
 * Block means (`blockMs`) of the stored raw currents in [fromMs, toMs) with their field, each
 * through the calibration its batch was recorded with (returned per point).
 */
export async function rawSeries(
  reader: TelemetryReader,
  calibrations: CalibrationCache,
  fromMs: number,
  toMs: number,
  blockMs: number,
): Promise<{ series: SeriesChunk; calibrations: Calibration[] }> {
  const raw = await reader.rawCurrents(fromMs, toMs, blockMs);
  const series = emptySeriesChunk();
  const used: Calibration[] = [];
  const byId = new Map<number, Calibration>();
  for (let i = 0; i < raw.t.length; i++) {
    const id = raw.calibrationId[i];
    let calibration = byId.get(id);
    if (!calibration) {
      calibration = (id >= 0 && (await calibrations.byId(id))) || calibrations.active();
      byId.set(id, calibration);
    }
    const current = { x: raw.x[i], y: raw.y[i], z: raw.z[i] };
    appendSeriesPoint(series, raw.t[i], current, fieldFromCurrents(calibration, current));
    used.push(calibration);
  }
  return { series, calibrations: used };
}

/** Chart points from roll-up blocks of `blockMs`, each at its block's middle, with the blocks they came from. */
export function rollupSeries(blocks: RollupBlock[], blockMs: number): SeriesWindow & { blocks: RollupBlock[] } {
  const series = emptySeriesChunk();
  const slow = emptySlowChunk();
  const kept: RollupBlock[] = [];
  for (const r of blocks) {
    const tMs = r.t + blockMs / 2;
    if (r.ix === null || r.iy === null || r.iz === null || r.bx === null || r.by === null || r.bz === null || r.bMag === null) continue;
    kept.push(r);
    // θ and φ of the mean vector; |B| stays the mean magnitude (the chart shows that).
    appendSeriesPoint(series, tMs, { x: r.ix, y: r.iy, z: r.iz }, { ...fieldAngles({ x: r.bx, y: r.by, z: r.bz }), magnitude: r.bMag });
    if (r.tx !== null && r.ty !== null && r.tz !== null && r.fx !== null && r.fy !== null && r.fz !== null) {
      appendSlowPoint(slow, tMs, { x: r.tx, y: r.ty, z: r.tz }, { x: r.fx, y: r.fy, z: r.fz });
    }
  }
  return { series, slow, blocks: kept };
}
