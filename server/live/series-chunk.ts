import type { FieldState, Vec3 } from '../../shared/field/field-vector.js';
import type { PerAxis, SeriesChunk, SlowChunk } from '../../shared/live/live-state.js';

/** Chart points are 100 Hz block means of the 1 kHz samples. */
export const DECIMATED_RATE_HZ = 100;
export const DECIMATION_BLOCK_MS = 1000 / DECIMATED_RATE_HZ;

export function emptySeriesChunk(): SeriesChunk {
  return { t: [], currentA: { x: [], y: [], z: [] }, bMagG: [], thetaDeg: [], phiDeg: [] };
}

export function emptySlowChunk(): SlowChunk {
  return { t: [], temperatureC: { x: [], y: [], z: [] }, flowLpm: { x: [], y: [], z: [] } };
}

/** Appends one chart point: time (epoch ms), mean currents (A) and their field. */
export function appendSeriesPoint(chunk: SeriesChunk, tMs: number, current: Vec3, field: FieldState): void {
  chunk.t.push(tMs);
  chunk.currentA.x.push(current.x);
  chunk.currentA.y.push(current.y);
  chunk.currentA.z.push(current.z);
  chunk.bMagG.push(field.magnitude);
  chunk.thetaDeg.push(field.thetaDeg);
  chunk.phiDeg.push(field.phiDeg);
}

/** Appends one slow point: time (epoch ms), coil temperatures (°C), flows (L/min). */
export function appendSlowPoint(chunk: SlowChunk, tMs: number, temperatureC: PerAxis<number>, flowLpm: PerAxis<number>): void {
  chunk.t.push(tMs);
  for (const axis of ['x', 'y', 'z'] as const) {
    chunk.temperatureC[axis].push(temperatureC[axis]);
    chunk.flowLpm[axis].push(flowLpm[axis]);
  }
}

/** Appends every point of `from` to `into` (both keep time order). */
export function appendSeriesChunk(into: SeriesChunk, from: SeriesChunk): void {
  into.t.push(...from.t);
  for (const axis of ['x', 'y', 'z'] as const) into.currentA[axis].push(...from.currentA[axis]);
  into.bMagG.push(...from.bMagG);
  into.thetaDeg.push(...from.thetaDeg);
  into.phiDeg.push(...from.phiDeg);
}

export function appendSlowChunk(into: SlowChunk, from: SlowChunk): void {
  into.t.push(...from.t);
  for (const axis of ['x', 'y', 'z'] as const) {
    into.temperatureC[axis].push(...from.temperatureC[axis]);
    into.flowLpm[axis].push(...from.flowLpm[axis]);
  }
}
