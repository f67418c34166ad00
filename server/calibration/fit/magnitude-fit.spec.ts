import { describe, expect, it } from 'vitest';
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { matrix, multiply, qr, transpose, type Matrix as MathMatrix } from 'mathjs';
import { gaussian, magnitudePoints, seededRandom, spreadCurrents, type TrueCoils } from '../../testing/calibration-data.js';
import type { MagnitudePoint, Triple } from './calibration-csv.js';
import { fitCalibration } from './calibration-fit.js';
import { fitMagnitude } from './magnitude-fit.js';

/** Invented coils for the tests: ~1.2 G/A with cross-talk and a tilted, not triangular K. */
const COILS: TrueCoils = {
  k: [
    [1.21, 0.05, -0.03],
    [0.04, 1.17, 0.06],
    [-0.02, 0.03, 1.26],
  ],
  b0: [0.15, -0.32, 0.48],
};

type M = number[][];
const mul = (a: M, b: M): M => a.map((row) => b[0].map((_, j) => row.reduce((s, v, k) => s + v * b[k][j], 0)));
const tr = (a: M): M => a[0].map((_, j) => a.map((row) => row[j]));
const apply = (a: M, v: readonly number[]): number[] => a.map((row) => row.reduce((s, x, k) => s + x * v[k], 0));

/** Gauge-free quantities of a |B| calibration: KᵀK, KᵀB0, |B0|. */
function invariants(k: M, b0: readonly number[]) {
  return { ktk: mul(tr(k), k), ktb: apply(tr(k), b0), b0: Math.hypot(...b0) };
}

function expectRelative(actual: number, expected: number, tolerance: number, scale: number) {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tolerance * scale);
}

function expectInvariantsClose(a: ReturnType<typeof invariants>, b: ReturnType<typeof invariants>, tolerance: number) {
  const scaleK = Math.max(...b.ktk.flat().map(Math.abs));
  const scaleC = Math.max(...b.ktb.map(Math.abs));
  a.ktk.flat().forEach((v, i) => expectRelative(v, b.ktk.flat()[i], tolerance, scaleK));
  a.ktb.forEach((v, i) => expectRelative(v, b.ktb[i], tolerance, scaleC));
  expectRelative(a.b0, b.b0, tolerance, b.b0);
}

/** Rotation by `deg` about the unit axis `n` (Rodrigues' formula). */
function rotation(n: Triple, deg: number): M {
  const t = (deg * Math.PI) / 180;
  const [x, y, z] = n;
  const c = Math.cos(t);
  const s = Math.sin(t);
  return [
    [c + x * x * (1 - c), x * y * (1 - c) - z * s, x * z * (1 - c) + y * s],
    [y * x * (1 - c) + z * s, c + y * y * (1 - c), y * z * (1 - c) - x * s],
    [z * x * (1 - c) - y * s, z * y * (1 - c) + x * s, c + z * z * (1 - c)],
  ];
}

function noisyPoints(seed: number, count = 60, noise = 0.004): MagnitudePoint[] {
  const random = seededRandom(seed);
  return magnitudePoints(COILS, spreadCurrents(count, 8, random), noise, gaussian(random));
}

describe('|B| calibration fit', () => {
  it('recovers K and B0 from exact data in the upper-triangular frame (QR factor of the true K)', () => {
    const random = seededRandom(1);
    const points = magnitudePoints(COILS, spreadCurrents(30, 8, random), 0, gaussian(random));
    const fit = fitCalibration({ kind: 'magnitude', source: 'field', points });
    // Reference: mathjs 15 qr. K = Q·R, so |K·I + B0| = |R·I + Qᵀ·B0|; signs made positive on R's diagonal.
    const { Q, R } = qr(matrix(COILS.k)) as unknown as { Q: MathMatrix; R: MathMatrix };
    const r = R.toArray() as M;
    const qtb = (multiply(transpose(Q), COILS.b0) as MathMatrix).toArray() as number[];
    const sign = [0, 1, 2].map((i) => Math.sign(r[i][i]));
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) expect(fit.report.gaussPerAmp[i][j]).toBeCloseTo(sign[i] * r[i][j], 9);
      expect(fit.report.offsetGauss[i]).toBeCloseTo(sign[i] * qtb[i], 9);
    }
    expect(fit.report.gaussPerAmp[1][0]).toBe(0);
    expect(fit.report.gaussPerAmp[2][0]).toBe(0);
    expect(fit.report.gaussPerAmp[2][1]).toBe(0);
    expect(fit.report.residualRmsGauss).toBeLessThan(1e-10);
    expect(fit.report.gauge).toMatch(/upper triangular, positive diagonal/);
  });

  it('reaches the same least-squares minimum as ml-levenberg-marquardt 5.1.0 to 1e-6 in KᵀK, KᵀB0, |B0|', () => {
    const points = noisyPoints(7);
    const fit = fitMagnitude(points);
    // Independent reference: ml-levenberg-marquardt 5.1.0 (npm), central finite differences,
    // started from the true values perturbed by several per cent, run to its iteration limit.
    const model = (p: number[]) => (n: number) => {
      const [x, y, z] = points[n].currentA;
      return Math.hypot(p[0] * x + p[1] * y + p[2] * z + p[6], p[3] * y + p[4] * z + p[7], p[5] * z + p[8]);
    };
    const start = [1.1, 0.1, 0.0, 1.3, 0.0, 1.1, 0.0, 0.0, 0.3];
    const reference = levenbergMarquardt({ x: points.map((_, n) => n), y: points.map((p) => p.fieldGauss) }, model, {
      initialValues: start,
      damping: 1e-3,
      gradientDifference: 1e-7,
      centralDifference: true,
      maxIterations: 3000,
      errorTolerance: 0,
      improvementThreshold: 1e-3,
    }).parameterValues;
    const up = (p: number[]) => ({ k: [[p[0], p[1], p[2]], [0, p[3], p[4]], [0, 0, p[5]]], b0: [p[6], p[7], p[8]] });
    const mine = up(fit.theta);
    const theirs = up(reference);
    expectInvariantsClose(invariants(mine.k, mine.b0), invariants(theirs.k, theirs.b0), 1e-6);
    // And the minimum lies near the truth: within 5 standard errors in the gauge-free |B0|.
    expect(Math.abs(invariants(mine.k, mine.b0).b0 - Math.hypot(...COILS.b0))).toBeLessThan(0.05);
  });

  it('follows the gauge rule: K and B0 rotated together give the same |B|, and an active calibration fixes the frame', () => {
    const turn = rotation([0.48, -0.6, 0.64], 37);
    const rotated: TrueCoils = { k: mul(turn, COILS.k), b0: apply(turn, COILS.b0) as Triple };
    const random = seededRandom(3);
    const currents = spreadCurrents(40, 8, random);
    const plain = fitCalibration({ kind: 'magnitude', source: 'field', points: magnitudePoints(COILS, currents, 0, gaussian(random)) });
    const turned = fitCalibration({ kind: 'magnitude', source: 'field', points: magnitudePoints(rotated, currents, 0, gaussian(random)) });
    // Default gauge: the same upper-triangular K whichever frame the data came from.
    turned.report.gaussPerAmp.flat().forEach((v, i) => expect(v).toBeCloseTo(plain.report.gaussPerAmp.flat()[i], 9));
    // Matched to an active calibration whose K is the rotated one (slightly off): the fit comes back in its frame.
    const nearby = rotated.k.map((row) => row.map((v) => v * 1.01));
    const coilToTrap = rotation([0, 0, 1], 15);
    const matched = fitCalibration(
      { kind: 'magnitude', source: 'field', points: magnitudePoints(COILS, currents, 0, gaussian(random)) },
      { version: 4, gaussPerAmp: nearby, coilToTrap },
    );
    matched.report.gaussPerAmp.flat().forEach((v, i) => expect(v).toBeCloseTo(rotated.k.flat()[i], 9));
    matched.report.offsetGauss.forEach((v, i) => expect(v).toBeCloseTo(rotated.b0[i], 9));
    expect(matched.coilToTrap).toEqual(coilToTrap);
    expect(matched.report.gauge).toMatch(/active calibration v4/);
    // A mirror image is matched too (|B| cannot tell it apart).
    const mirror = [[1, 0, 0], [0, 1, 0], [0, 0, -1]];
    const mirrored = fitCalibration(
      { kind: 'magnitude', source: 'field', points: magnitudePoints(COILS, currents, 0, gaussian(random)) },
      { version: 5, gaussPerAmp: mul(mirror, COILS.k), coilToTrap },
    );
    mirrored.report.gaussPerAmp.flat().forEach((v, i) => expect(v).toBeCloseTo(mul(mirror, COILS.k).flat()[i], 9));
  });

  it('gives standard errors that match the scatter of repeated fits (Monte Carlo made in the test)', () => {
    const random = seededRandom(11);
    const normal = gaussian(random);
    const currents = spreadCurrents(40, 8, random);
    const sigmas = currents.map((_, n) => 0.002 + 0.004 * (n % 3));
    const runs = Array.from({ length: 300 }, () => fitMagnitude(magnitudePoints(COILS, currents, sigmas, normal, true)));
    const predicted = runs[0].covariance.map((row, i) => Math.sqrt(row[i]));
    for (let i = 0; i < 9; i++) {
      const values = runs.map((r) => r.theta[i]);
      const mean = values.reduce((a, b) => a + b, 0) / values.length;
      const spread = Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (values.length - 1));
      // 300 runs estimate a standard deviation to about ±4 % (1/√(2·299)); allow 15 %.
      expect(spread / predicted[i]).toBeGreaterThan(0.85);
      expect(spread / predicted[i]).toBeLessThan(1.15);
    }
    // Unweighted: s² = RSS/(n − 9) estimates the noise variance.
    const unweighted = fitMagnitude(magnitudePoints(COILS, currents, 0.004, normal));
    const rss = unweighted.residuals.reduce((a, r) => a + r * r, 0);
    expect(Math.sqrt(rss / (40 - 9))).toBeGreaterThan(0.003);
    expect(Math.sqrt(rss / (40 - 9))).toBeLessThan(0.005);
  });

  it('marks a point far off the fit as an outlier', () => {
    const points = noisyPoints(5, 40, 0.003);
    points[12] = { ...points[12], fieldGauss: points[12].fieldGauss + 0.05 };
    const fit = fitCalibration({ kind: 'magnitude', source: 'field', points });
    expect(fit.points.filter((p) => p.outlier).map((p) => p.line)).toEqual([14]);
  });
});
