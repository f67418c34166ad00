import type { FastFrame, SlowFrame } from '../../shared/telemetry/messages.js';

/**
 * A valid fast frame: `n` samples at `rateHz` starting at `t0Ms`, every sample carrying the
 * given currents (A) and voltages of 1 V per ampere.
 */
export function fastFrame(seq: number, t0Ms: number, current = { x: 1, y: 2, z: 3 }, n = 20, rateHz = 1000): FastFrame {
  const fill = (v: number) => new Array<number>(n).fill(v);
  return {
    seq,
    t0Ms,
    rateHz,
    currentA: { x: fill(current.x), y: fill(current.y), z: fill(current.z) },
    voltageV: { x: fill(current.x), y: fill(current.y), z: fill(current.z) },
    setpointA: { ...current },
  };
}

/** A valid slow frame at `tMs` with fixed temperatures (°C) and flows (L/min). */
export function slowFrame(seq: number, tMs: number): SlowFrame {
  return {
    seq,
    tMs,
    coilTempC: { x: 21, y: 22, z: 23 },
    flowLpm: { x: 3.1, y: 3.2, z: 3.3 },
    waterSupplyC: 18,
    waterReturnC: { x: 18.5, y: 18.6, z: 18.7 },
  };
}
