import { inv, lusolve, matrix, multiply, subtract, transpose, type Matrix } from 'mathjs';
import { describe, expect, it } from 'vitest';
import type { CalibrationBody } from '../field/calibration.js';
import { DEMO_CALIBRATION } from '../field/demo-calibration.js';
import { fieldFromCurrents } from '../field/field-vector.js';
import { planPath, targetCurrents, targetVector } from './target.js';

/** A calibration with strong cross-talk and a frame turned about a skew axis (test data). */
const SKEWED: CalibrationBody = (() => {
  const a = (25 * Math.PI) / 180;
  const c = Math.cos(a);
  const s = Math.sin(a);
  // Rotation by 25° about x, then the demo's coupling with larger off-diagonal terms.
  return {
    gaussPerAmp: [
      [1.1, 0.2, -0.15],
      [0.1, 0.9, 0.25],
      [-0.2, 0.05, 1.4],
    ],
    offsetGauss: [0.3, -0.2, 0.5],
    coilToTrap: [
      [1, 0, 0],
      [0, c, -s],
      [0, s, c],
    ],
  };
})();

describe('currents for a target field (inverse of B = R·(K·I + B0))', () => {
  for (const [name, cal] of [['demo', DEMO_CALIBRATION], ['skewed', SKEWED]] as const) {
    it(`agrees with mathjs 15 lusolve and inv for the ${name} calibration`, () => {
      for (const target of [
        { magnitudeG: 8, thetaDeg: 54.7356, phiDeg: 0 },
        { magnitudeG: 12.5, thetaDeg: 120, phiDeg: 250 },
        { magnitudeG: 0.5, thetaDeg: 3, phiDeg: 359 },
      ]) {
        const b = targetVector(target);
        // Reference: mathjs 15 lusolve of K·I = Rᵀ·B − B0, and the same through inv(K).
        const rhs = subtract(multiply(transpose(matrix(cal.coilToTrap)), [b.x, b.y, b.z]), matrix(cal.offsetGauss)) as Matrix;
        const viaLu = (lusolve(matrix(cal.gaussPerAmp), rhs) as Matrix).toArray().flat() as number[];
        const viaInv = (multiply(inv(matrix(cal.gaussPerAmp)), rhs) as Matrix).toArray() as number[];
        const i = targetCurrents(cal, target);
        expect([i.x, i.y, i.z].map((v, k) => v - viaLu[k]).every((d) => Math.abs(d) < 1e-12)).toBe(true);
        expect([i.x, i.y, i.z].map((v, k) => v - viaInv[k]).every((d) => Math.abs(d) < 1e-12)).toBe(true);
      }
    });

    it(`round-trips target → currents → field for the ${name} calibration`, () => {
      for (let theta = 0; theta <= 180; theta += 15) {
        for (let phi = 0; phi < 360; phi += 40) {
          const target = { magnitudeG: 6.4, thetaDeg: theta, phiDeg: phi };
          const f = fieldFromCurrents(cal, targetCurrents(cal, target));
          expect(f.magnitude).toBeCloseTo(6.4, 12);
          expect(f.thetaDeg).toBeCloseTo(theta, 9);
          // φ is undefined at the poles (reported as 0).
          if (theta !== 0 && theta !== 180) expect(Math.cos(((f.phiDeg! - phi) * Math.PI) / 180)).toBeCloseTo(1, 12);
        }
      }
    });
  }

  it('plans a path whose ends are the start and the target, with the currents of every point', () => {
    const from = targetVector({ magnitudeG: 4, thetaDeg: 10, phiDeg: 0 });
    const to = targetVector({ magnitudeG: 8, thetaDeg: 90, phiDeg: 0 });
    const path = planPath(DEMO_CALIBRATION, from, to, 2000);
    expect(path).toHaveLength(21);
    expect(path[0].tMs).toBe(0);
    expect(path.at(-1)!.tMs).toBe(2000);
    expect(path[0].magnitudeG).toBeCloseTo(4, 12);
    expect(path.at(-1)!.thetaDeg).toBeCloseTo(90, 9);
    // Linear magnitude and uniform turning: at the half-way point 6 G and θ = 50°.
    expect(path[10].magnitudeG).toBeCloseTo(6, 12);
    expect(path[10].thetaDeg).toBeCloseTo(50, 9);
    for (const p of path) {
      const f = fieldFromCurrents(DEMO_CALIBRATION, p.currentsA);
      expect(f.magnitude).toBeCloseTo(p.magnitudeG, 12);
    }
    expect(planPath(DEMO_CALIBRATION, from, to, 0)).toHaveLength(2);
    expect(planPath(DEMO_CALIBRATION, from, to, 3_600_000)).toHaveLength(200);
  });
});
