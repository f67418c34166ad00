import type { FieldUncertainty } from '../../shared/field/field-uncertainty.js';
import { fieldAngles, type FieldState } from '../../shared/field/field-vector.js';
import type { FastFrame, SlowFrame } from '../../shared/telemetry/messages.js';
import type { rollups1s } from '../db/schema.js';

export type RollupRow = typeof rollups1s.$inferInsert;

const AXES = ['x', 'y', 'z'] as const;

class Stat {
  n = 0;
  sum = 0;
  min = Infinity;
  max = -Infinity;
  add(v: number): void {
    this.n++;
    this.sum += v;
    if (v < this.min) this.min = v;
    if (v > this.max) this.max = v;
  }
  get mean(): number {
    return this.sum / this.n;
  }
}

class Second {
  /** Server clock (performance.now, ms) of the last data added. */
  touchedAt = 0;
  readonly current = { x: new Stat(), y: new Stat(), z: new Stat() };
  readonly b = { x: new Stat(), y: new Stat(), z: new Stat() };
  readonly bMag = new Stat();
  readonly temp = { x: new Stat(), y: new Stat(), z: new Stat() };
  readonly flow = { x: new Stat(), y: new Stat(), z: new Stat() };
  readonly sigma = { bMag: new Stat(), theta: new Stat(), phi: new Stat() };
}

/** Seconds stay open until data this far past their end has arrived (data time, ms). */
const GRACE_MS = 1500;
/** …and nothing was added to them for this long (server time, ms), for late slow frames. */
const SETTLE_MS = 250;

/**
 * Per-second statistics for `rollups_1s`, built in memory as frames arrive. A second is
 * complete once data more than `GRACE_MS` past its end has been seen (data time, so a
 * controller clock that differs from the server's does not cut seconds short) and it has not
 * changed for `SETTLE_MS` (server time, so a burst of older data gets its slow frames too).
 */
export class RollupAccumulator {
  private readonly seconds = new Map<number, Second>();
  private newestMs = -Infinity;

  /** Current statistics over every raw sample of a validated fast frame. */
  addFast(frame: FastFrame): void {
    const periodMs = 1000 / frame.rateHz;
    for (let i = 0; i < frame.currentA.x.length; i++) {
      const t = frame.t0Ms + i * periodMs;
      const s = this.second(t);
      for (const axis of AXES) s.current[axis].add(frame.currentA[axis][i]);
    }
  }

  /** Field statistics from a 100 Hz chart point at `tMs` (epoch ms). */
  addFieldPoint(tMs: number, field: FieldState): void {
    const s = this.second(tMs);
    for (const axis of AXES) s.b[axis].add(field.vector[axis]);
    s.bMag.add(field.magnitude);
  }

  /** One frame's σ|B|, σθ, σφ at its mean currents, at the frame's mid time `tMs` (epoch ms). */
  addUncertainty(tMs: number, u: FieldUncertainty): void {
    const s = this.second(tMs);
    s.sigma.bMag.add(u.magnitudeGauss);
    if (u.thetaDeg !== null) s.sigma.theta.add(u.thetaDeg);
    if (u.phiDeg !== null) s.sigma.phi.add(u.phiDeg);
  }

  addSlow(frame: SlowFrame): void {
    const s = this.second(frame.tMs);
    for (const axis of AXES) {
      s.temp[axis].add(frame.coilTempC[axis]);
      s.flow[axis].add(frame.flowLpm[axis]);
    }
  }

  /** Removes and returns the completed seconds (all of them with `all`). */
  drain(all = false): RollupRow[] {
    const rows: RollupRow[] = [];
    const now = performance.now();
    for (const [startMs, s] of this.seconds) {
      if (!all && (startMs + 1000 + GRACE_MS > this.newestMs || now - s.touchedAt < SETTLE_MS)) continue;
      this.seconds.delete(startMs);
      const row = toRow(startMs, s);
      if (row) rows.push(row);
    }
    return rows;
  }

  private second(tMs: number): Second {
    if (tMs > this.newestMs) this.newestMs = tMs;
    const startMs = Math.floor(tMs / 1000) * 1000;
    let s = this.seconds.get(startMs);
    if (!s) {
      s = new Second();
      this.seconds.set(startMs, s);
    }
    s.touchedAt = performance.now();
    return s;
  }
}

/** A row for a second with fast data; seconds with slow data only are not stored. */
function toRow(tMs: number, s: Second): RollupRow | null {
  if (s.current.x.n === 0 || s.bMag.n === 0) return null;
  const mean = { x: s.b.x.mean, y: s.b.y.mean, z: s.b.z.mean };
  const angles = fieldAngles(mean);
  const slow = s.temp.x.n > 0;
  const meanOrNull = (stat: Stat) => (stat.n > 0 ? stat.mean : null);
  return {
    tMs,
    fastSamples: s.current.x.n,
    currentXMean: s.current.x.mean,
    currentXMin: s.current.x.min,
    currentXMax: s.current.x.max,
    currentYMean: s.current.y.mean,
    currentYMin: s.current.y.min,
    currentYMax: s.current.y.max,
    currentZMean: s.current.z.mean,
    currentZMin: s.current.z.min,
    currentZMax: s.current.z.max,
    bXMean: mean.x,
    bYMean: mean.y,
    bZMean: mean.z,
    bMagMean: s.bMag.mean,
    bMagMin: s.bMag.min,
    bMagMax: s.bMag.max,
    thetaDeg: angles.thetaDeg,
    phiDeg: angles.phiDeg,
    slowSamples: s.temp.x.n,
    tempXMean: slow ? s.temp.x.mean : null,
    tempXMax: slow ? s.temp.x.max : null,
    tempYMean: slow ? s.temp.y.mean : null,
    tempYMax: slow ? s.temp.y.max : null,
    tempZMean: slow ? s.temp.z.mean : null,
    tempZMax: slow ? s.temp.z.max : null,
    flowXMean: slow ? s.flow.x.mean : null,
    flowXMin: slow ? s.flow.x.min : null,
    flowYMean: slow ? s.flow.y.mean : null,
    flowYMin: slow ? s.flow.y.min : null,
    flowZMean: slow ? s.flow.z.mean : null,
    flowZMin: slow ? s.flow.z.min : null,
    sigmaBMagMean: meanOrNull(s.sigma.bMag),
    sigmaThetaMean: meanOrNull(s.sigma.theta),
    sigmaPhiMean: meanOrNull(s.sigma.phi),
  };
}
