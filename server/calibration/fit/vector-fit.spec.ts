import { describe, expect, it } from 'vitest';
import { Matrix as MlMatrix, inverse as mlInverse, solve as mlSolve } from 'ml-matrix';
import { gaussian, seededRandom, spreadCurrents, vectorPoints, type TrueCoils } from '../../testing/calibration-data.js';
import { fitCalibration } from './calibration-fit.js';

/** Invented probe-frame coils (the probe is aligned with the trap axes). */
const COILS: TrueCoils = {
  k: [
    [1.19, -0.31, 0.02],
    [0.33, 1.15, 0.05],
    [-0.01, 0.04, 1.24],
  ],
  b0: [0.08, -0.21, 0.36],
};

describe('vector-probe calibration fit', () => {
  it('matches an independent least-squares solve (ml-matrix 6.15 QR) and its covariance', () => {
    const random = seededRandom(21);
    const points = vectorPoints(COILS, spreadCurrents(25, 6, random), 0.003, gaussian(random));
    const fit = fitCalibration({ kind: 'vector', points });
    // Reference: ml-matrix 6.15.1 solve (QR decomposition for a rectangular system).
    const x = new MlMatrix(points.map((p) => [...p.currentA, 1]));
    const y = new MlMatrix(points.map((p) => [...p.fieldGauss]));
    const coefficients = mlSolve(x, y).to2DArray(); // 4×3: rows Ix, Iy, Iz, 1; columns field x, y, z
    let rss = 0;
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) expect(Math.abs(fit.report.gaussPerAmp[i][j] - coefficients[j][i])).toBeLessThan(1e-9);
      expect(Math.abs(fit.report.offsetGauss[i] - coefficients[3][i])).toBeLessThan(1e-9);
      points.forEach((p) => {
        const model = coefficients[3][i] + p.currentA.reduce((s, c, j) => s + c * coefficients[j][i], 0);
        rss += (p.fieldGauss[i] - model) ** 2;
      });
    }
    // Standard errors: s²·(XᵀX)⁻¹ with s² = RSS/(3n − 12), by ml-matrix.
    const unscaled = mlInverse(x.transpose().mmul(x)).to2DArray();
    const s2 = rss / (3 * points.length - 12);
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) expect(fit.report.standardErrors.gaussPerAmp[i][j]).toBeCloseTo(Math.sqrt(s2 * unscaled[j][j]), 12);
      expect(fit.report.standardErrors.offsetGauss[i]).toBeCloseTo(Math.sqrt(s2 * unscaled[3][3]), 12);
    }
    expect(fit.coilToTrap).toEqual([[1, 0, 0], [0, 1, 0], [0, 0, 1]]);
    expect(fit.report.gauge).toMatch(/coil → trap = identity/);
    // The known coils lie within a few standard errors of the fit.
    fit.report.gaussPerAmp.flat().forEach((v, i) => expect(Math.abs(v - COILS.k.flat()[i])).toBeLessThan(5 * fit.report.standardErrors.gaussPerAmp.flat()[i]));
  });

  it('recovers exact data exactly', () => {
    const random = seededRandom(2);
    const fit = fitCalibration({ kind: 'vector', points: vectorPoints(COILS, spreadCurrents(6, 5, random), 0, gaussian(random)) });
    fit.report.gaussPerAmp.flat().forEach((v, i) => expect(v).toBeCloseTo(COILS.k.flat()[i], 10));
    fit.report.offsetGauss.forEach((v, i) => expect(v).toBeCloseTo(COILS.b0[i], 10));
    expect(fit.report.maxResidualGauss).toBeLessThan(1e-10);
  });
});
