import { and, asc, avg, gt, gte, lte, sql } from 'drizzle-orm';
import { fieldAngles, fieldFromCurrents } from '../../shared/field/field-vector.js';
import type { SeriesChunk, SlowChunk } from '../../shared/live/live-state.js';
import type { Db } from '../db/database.js';
import { fastBatches, rollups1s, slowSamples } from '../db/schema.js';
import type { CalibrationCache } from '../field/calibration-cache.js';
import { BlockDecimator } from '../live/block-decimator.js';
import { appendSeriesPoint, appendSlowPoint, DECIMATION_BLOCK_MS, emptySeriesChunk, emptySlowChunk } from '../live/series-chunk.js';
import { decodeSamples } from '../storage/sample-codec.js';

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
 */
export async function querySeries(db: Db, calibrations: CalibrationCache, fromMs: number, toMs: number): Promise<SeriesWindow> {
  return toMs - fromMs <= RAW_WINDOW_MAX_S * 1000
    ? { series: await rawSeries(db, calibrations, fromMs, toMs), slow: await rawSlow(db, fromMs, toMs) }
    : rollupSeries(db, fromMs, toMs);
}

/** Block length (ms): a multiple of `unitMs`, at least `unitMs`, giving ≤ MAX_POINTS blocks. */
function blockLength(fromMs: number, toMs: number, unitMs: number): number {
  return Math.max(1, Math.ceil((toMs - fromMs) / MAX_POINTS / unitMs)) * unitMs;
}

async function rawSeries(db: Db, calibrations: CalibrationCache, fromMs: number, toMs: number): Promise<SeriesChunk> {
  const rows = await db
    .select({
      t0Ms: fastBatches.t0Ms,
      rateHz: fastBatches.rateHz,
      calibrationId: fastBatches.calibrationId,
      x: fastBatches.currentX,
      y: fastBatches.currentY,
      z: fastBatches.currentZ,
    })
    .from(fastBatches)
    .where(and(gt(fastBatches.t1Ms, fromMs), lte(fastBatches.t0Ms, toMs)))
    .orderBy(asc(fastBatches.t0Ms));
  const series = emptySeriesChunk();
  const decimator = new BlockDecimator(blockLength(fromMs, toMs, DECIMATION_BLOCK_MS));
  for (const row of rows) {
    const calibration = (row.calibrationId !== null && (await calibrations.byId(row.calibrationId))) || calibrations.active();
    const periodMs = 1000 / row.rateHz;
    const x = decodeSamples(row.x);
    const first = Math.max(0, Math.ceil((fromMs - row.t0Ms) / periodMs));
    const end = Math.min(x.length, Math.floor((toMs - row.t0Ms) / periodMs) + 1);
    if (first >= end) continue;
    decimator.push(
      row.t0Ms + first * periodMs,
      row.rateHz,
      x.subarray(first, end),
      decodeSamples(row.y).subarray(first, end),
      decodeSamples(row.z).subarray(first, end),
      (tMs, ix, iy, iz) => {
        const current = { x: ix, y: iy, z: iz };
        appendSeriesPoint(series, tMs, current, fieldFromCurrents(calibration, current));
      },
    );
  }
  decimator.flush((tMs, ix, iy, iz) => {
    const current = { x: ix, y: iy, z: iz };
    appendSeriesPoint(series, tMs, current, fieldFromCurrents(calibrations.active(), current));
  });
  return series;
}

async function rawSlow(db: Db, fromMs: number, toMs: number): Promise<SlowChunk> {
  // 10 Hz over at most RAW_WINDOW_MAX_S stays under MAX_POINTS without thinning.
  const rows = await db
    .select()
    .from(slowSamples)
    .where(and(gte(slowSamples.tMs, fromMs), lte(slowSamples.tMs, toMs)))
    .orderBy(asc(slowSamples.tMs));
  const slow = emptySlowChunk();
  for (const r of rows) {
    appendSlowPoint(slow, r.tMs, { x: r.coilTempX, y: r.coilTempY, z: r.coilTempZ }, { x: r.flowX, y: r.flowY, z: r.flowZ });
  }
  return slow;
}

async function rollupSeries(db: Db, fromMs: number, toMs: number): Promise<SeriesWindow> {
  const blockMs = blockLength(fromMs, toMs, 1000);
  // Inlined (a whole number we computed), so SELECT and GROUP BY are the same expression to PostgreSQL.
  const width = sql.raw(String(Math.trunc(blockMs)));
  const block = sql`(${rollups1s.tMs} / ${width}) * ${width}`;
  const num = (column: Parameters<typeof avg>[0]) => avg(column).mapWith(Number);
  const rows = await db
    .select({
      t: sql<number>`${block}`.mapWith(Number),
      ix: num(rollups1s.currentXMean),
      iy: num(rollups1s.currentYMean),
      iz: num(rollups1s.currentZMean),
      bx: num(rollups1s.bXMean),
      by: num(rollups1s.bYMean),
      bz: num(rollups1s.bZMean),
      bMag: num(rollups1s.bMagMean),
      tx: num(rollups1s.tempXMean),
      ty: num(rollups1s.tempYMean),
      tz: num(rollups1s.tempZMean),
      fx: num(rollups1s.flowXMean),
      fy: num(rollups1s.flowYMean),
      fz: num(rollups1s.flowZMean),
    })
    .from(rollups1s)
    .where(and(gte(rollups1s.tMs, fromMs), lte(rollups1s.tMs, toMs)))
    .groupBy(block)
    .orderBy(block);
  const series = emptySeriesChunk();
  const slow = emptySlowChunk();
  for (const r of rows) {
    const tMs = r.t + blockMs / 2;
    if (r.ix === null || r.iy === null || r.iz === null || r.bx === null || r.by === null || r.bz === null || r.bMag === null) continue;
    // θ and φ of the mean vector; |B| stays the mean magnitude (the chart shows that).
    appendSeriesPoint(series, tMs, { x: r.ix, y: r.iy, z: r.iz }, { ...fieldAngles({ x: r.bx, y: r.by, z: r.bz }), magnitude: r.bMag });
    if (r.tx !== null && r.ty !== null && r.tz !== null && r.fx !== null && r.fy !== null && r.fz !== null) {
      appendSlowPoint(slow, tMs, { x: r.tx, y: r.ty, z: r.tz }, { x: r.fx, y: r.fy, z: r.fz });
    }
  }
  return { series, slow };
}
