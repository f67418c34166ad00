import { describe, expect, it } from 'vitest';
import { coilCurrentAfter } from '../shared/apparatus/coil-model.js';
import { Supply } from './supply-model.js';

const params = { currentLimitA: 22, slewLimitAPerS: 20, complianceV: 14 };
const dtS = 0.001;
const r = 0.4;
const l = 0.02;

/** Runs a supply and coil for `steps` steps; returns the trace of references and currents. */
function run(supply: Supply, setpointA: number, steps: number, start = 0): { ref: number[]; current: number[] } {
  const ref: number[] = [];
  const current: number[] = [];
  let i = start;
  for (let k = 0; k < steps; k++) {
    const v = supply.step(setpointA, r, dtS, null, false);
    i = coilCurrentAfter(i, v, r, l, dtS);
    ref.push(supply.referenceA);
    current.push(i);
  }
  return { ref, current };
}

describe('coil supply', () => {
  it('moves its reference by no more than the slew limit per step', () => {
    const { ref } = run(new Supply(params), 10, 1000);
    const steps = ref.map((v, k) => Math.abs(v - (k === 0 ? 0 : ref[k - 1])));
    expect(Math.max(...steps)).toBeLessThanOrEqual(params.slewLimitAPerS * dtS + 1e-12);
    expect(ref[249]).toBeCloseTo(5, 9); // 20 A/s · 0.25 s
    expect(ref[999]).toBeCloseTo(10, 9);
  });

  it('never regulates beyond its current limit, whatever the setpoint', () => {
    const { ref, current } = run(new Supply(params), 30, 3000);
    expect(Math.max(...ref)).toBeCloseTo(22, 9);
    expect(Math.max(...current)).toBeLessThanOrEqual(22);
    expect(current.at(-1)).toBeCloseTo(22, 3);
  });

  it('limits the negative current symmetrically', () => {
    const { current } = run(new Supply(params), -30, 3000);
    expect(Math.min(...current)).toBeGreaterThanOrEqual(-22);
  });

  it('clamps its voltage at the compliance', () => {
    const supply = new Supply(params);
    let v = 0;
    for (let k = 0; k < 2000; k++) v = supply.step(20, 2, dtS, null, false); // 2 Ω · 20 A = 40 V > 14 V
    expect(v).toBe(14);
  });

  it('drives its voltage up when its regulator runs away, ignoring the setpoint and current limit', () => {
    const supply = new Supply(params);
    run(supply, 5, 1000);
    let v = 0;
    for (let k = 0; k < 3000; k++) v = supply.step(5, r, dtS, { voltsPerSecond: 2 }, false);
    expect(v).toBeCloseTo(Math.min(14, 5 * r + 2 * 3), 6); // 2 V + 2 V/s · 3 s = 8 V
  });

  it('ramps its reference to zero at the slew limit once disabled by the trip chain, even in runaway', () => {
    const supply = new Supply(params);
    run(supply, 10, 1000);
    for (let k = 0; k < 500; k++) supply.step(10, r, dtS, { voltsPerSecond: 2 }, false);
    const runawayCurrentA = supply.outputV / r; // 10 A + 2 V/s · 0.5 s / 0.4 Ω = 12.5 A
    supply.step(10, r, dtS, { voltsPerSecond: 2 }, true);
    expect(supply.referenceA).toBeCloseTo(runawayCurrentA - params.slewLimitAPerS * dtS, 9);
    for (let k = 0; k < 2000; k++) supply.step(10, r, dtS, { voltsPerSecond: 2 }, true);
    expect(supply.referenceA).toBe(0);
    expect(supply.outputV).toBe(0);
  });
});

describe('supply and coil together', () => {
  it('follows a setpoint step through the supply with the coil time constant L/R', () => {
    const supply = new Supply({ currentLimitA: 22, slewLimitAPerS: 1e6, complianceV: 14 });
    let i = 0;
    const tauS = l / r;
    for (let k = 0; k < Math.round(tauS / dtS); k++) {
      const v = supply.step(10, r, dtS, null, false);
      i = coilCurrentAfter(i, v, r, l, dtS);
    }
    expect(i / 10).toBeCloseTo(1 - Math.exp(-1), 9); // 1 − e⁻¹
  });

});
