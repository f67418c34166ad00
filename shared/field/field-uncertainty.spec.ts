import { describe, expect, it } from 'vitest';
import type { CalibrationBody } from './calibration.js';
import { DEMO_CALIBRATION, DEMO_COVARIANCE } from './demo-calibration.js';
import { fieldUncertainty } from './field-uncertainty.js';
import { fieldFromCurrents, type Vec3 } from './field-vector.js';

/** The 12 numbers (K row-major, B0) of a calibration, and back. */
const pack = (c: CalibrationBody) => [...c.gaussPerAmp.flat(), ...c.offsetGauss];
const unpack = (p: number[], c: CalibrationBody): CalibrationBody => ({
  ...c,
  gaussPerAmp: [p.slice(0, 3), p.slice(3, 6), p.slice(6, 9)] as CalibrationBody['gaussPerAmp'],
  offsetGauss: [p[9], p[10], p[11]],
});

/** A correlated covariance: L·Lᵀ with a fixed lower-triangular L (invented, test only). */
const L = Array.from({ length: 12 }, (_, i) => Array.from({ length: 12 }, (_, j) => (j > i ? 0 : j === i ? 0.003 + 0.0005 * i : 0.0008 * Math.sin(i + 2 * j))));
const COV = L.map((row) => L.map((other) => row.reduce((s, v, k) => s + v * other[k], 0)));

/** Deterministic standard normal deviates (mulberry32 + Box–Muller). */
function normals(seed: number): () => number {
  let a = seed >>> 0;
  const u = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
}

type Key = 'magnitude' | 'thetaDeg' | 'phiDeg';
const read = (c: CalibrationBody, i: Vec3, key: Key) => fieldFromCurrents(c, i)[key]!;

describe('angle uncertainty from the calibration covariance', () => {
  const currents: Vec3 = { x: 3.2, y: -1.7, z: 4.4 };

  it('equals gᵀΣg with the gradient taken by central finite differences in the test', () => {
    const sigma = fieldUncertainty(DEMO_CALIBRATION, COV, currents);
    const p0 = pack(DEMO_CALIBRATION);
    for (const [key, got] of [['magnitude', sigma.magnitudeGauss], ['thetaDeg', sigma.thetaDeg], ['phiDeg', sigma.phiDeg]] as const) {
      const h = 1e-6;
      const g = p0.map((_, k) => {
        const up = p0.slice();
        const down = p0.slice();
        up[k] += h;
        down[k] -= h;
        return (read(unpack(up, DEMO_CALIBRATION), currents, key) - read(unpack(down, DEMO_CALIBRATION), currents, key)) / (2 * h);
      });
      const variance = g.reduce((s, gi, i) => s + gi * g.reduce((t, gj, j) => t + COV[i][j] * gj, 0), 0);
      expect(Math.abs(got! - Math.sqrt(variance))).toBeLessThan(1e-6 * Math.sqrt(variance));
    }
  });

  it('matches the scatter of angles over calibrations drawn from the covariance (Monte Carlo in the test)', () => {
    const sigma = fieldUncertainty(DEMO_CALIBRATION, DEMO_COVARIANCE, currents);
    // Draw p = p0 + C·z with C the Cholesky factor of Σ (computed here, independent of the code under test).
    const n = 12;
    const c = Array.from({ length: n }, () => new Array<number>(n).fill(0));
    for (let i = 0; i < n; i++) {
      for (let j = 0; j <= i; j++) {
        let s = DEMO_COVARIANCE[i][j];
        for (let k = 0; k < j; k++) s -= c[i][k] * c[j][k];
        c[i][j] = i === j ? Math.sqrt(s) : s / c[j][j];
      }
    }
    const z = normals(17);
    const p0 = pack(DEMO_CALIBRATION);
    const samples: Record<Key, number[]> = { magnitude: [], thetaDeg: [], phiDeg: [] };
    for (let run = 0; run < 20000; run++) {
      const draw = Array.from({ length: n }, () => z());
      const p = p0.map((v, i) => v + c[i].reduce((s, cij, j) => s + cij * draw[j], 0));
      const f = fieldFromCurrents(unpack(p, DEMO_CALIBRATION), currents);
      samples.magnitude.push(f.magnitude);
      samples.thetaDeg.push(f.thetaDeg!);
      samples.phiDeg.push(f.phiDeg!);
    }
    const std = (v: number[]) => {
      const mean = v.reduce((a, b) => a + b, 0) / v.length;
      return Math.sqrt(v.reduce((a, b) => a + (b - mean) ** 2, 0) / (v.length - 1));
    };
    // 20 000 draws estimate a standard deviation to about ±0.5 %; allow 3 % for the linearisation.
    expect(Math.abs(std(samples.magnitude) / sigma.magnitudeGauss - 1)).toBeLessThan(0.03);
    expect(Math.abs(std(samples.thetaDeg) / sigma.thetaDeg! - 1)).toBeLessThan(0.03);
    expect(Math.abs(std(samples.phiDeg) / sigma.phiDeg! - 1)).toBeLessThan(0.03);
  });

  it('reports no σφ on the trap z axis and no angles at zero field', () => {
    const plain: CalibrationBody = { gaussPerAmp: [[1, 0, 0], [0, 1, 0], [0, 0, 1]], offsetGauss: [0, 0, 0], coilToTrap: [[1, 0, 0], [0, 1, 0], [0, 0, 1]] };
    const onAxis = fieldUncertainty(plain, COV, { x: 0, y: 0, z: 5 });
    expect(onAxis.phiDeg).toBeNull();
    expect(onAxis.thetaDeg).toBeGreaterThan(0);
    const zero = fieldUncertainty(plain, COV, { x: 0, y: 0, z: 0 });
    expect(zero).toMatchObject({ thetaDeg: null, phiDeg: null });
    expect(zero.magnitudeGauss).toBeGreaterThan(0);
  });
});
