import type { Triple, VectorPoint } from './calibration-csv.js';
import { type Matrix, linearLeastSquares } from './dense.js';
import { CalibrationInputError } from './fit-input-error.js';
import { requireDetermined } from './identifiability.js';

export const VECTOR_PARAMETERS = 12;
const TERMS = ['Ix', 'Iy', 'Iz', '1'];

export interface VectorSolution {
  k: Matrix;
  b0: Triple;
  /** 12×12 covariance of (K row-major, B0): s²·(XᵀX)⁻¹ per component, s² = RSS/(3n − 12) pooled over the components. */
  covariance: Matrix;
  /** Fitted B at each point, G. */
  fitted: Triple[];
  /** measured − fitted, per component, G. */
  residuals: Triple[];
}

/**
 * Linear least squares of B_n ≈ K·I_n + B0 for a 3-axis probe: each field component i is a
 * separate linear fit of (K_i0, K_i1, K_i2, B0_i) on the design rows (Ix, Iy, Iz, 1), with one
 * pooled scatter for the standard errors (normal equations on column-scaled design, mathjs).
 */
export function fitVector(points: readonly VectorPoint[]): VectorSolution {
  const n = points.length;
  // 12 parameters from 3n numbers, and at least one degree of freedom for the scatter.
  if (3 * n <= VECTOR_PARAMETERS) {
    throw new CalibrationInputError(`a vector-probe fit needs at least 5 data lines (12 parameters from 3 numbers per line, and one more to estimate the scatter); the file has ${n}`);
  }
  const design = points.map((p) => [...p.currentA, 1]);
  requireDetermined(points.map((p) => p.currentA), design, TERMS);
  const rows = [0, 1, 2].map((i) => linearLeastSquares(design, points.map((p) => p.fieldGauss[i])));
  const rss = rows.reduce((s, r) => s + r.weightedRss, 0);
  const s2 = rss / (3 * n - VECTOR_PARAMETERS);
  const covariance = Array.from({ length: 12 }, () => new Array<number>(12).fill(0));
  const slot = (i: number, a: number) => (a < 3 ? i * 3 + a : 9 + i);
  rows.forEach((row, i) => {
    for (let a = 0; a < 4; a++) for (let b = 0; b < 4; b++) covariance[slot(i, a)][slot(i, b)] = s2 * row.normalInverse[a][b];
  });
  const residuals = points.map((_, n) => [rows[0].residuals[n], rows[1].residuals[n], rows[2].residuals[n]] as Triple);
  return {
    k: rows.map((r) => r.coefficients.slice(0, 3)),
    b0: rows.map((r) => r.coefficients[3]) as Triple,
    covariance,
    fitted: points.map((p, n) => p.fieldGauss.map((b, i) => b - residuals[n][i]) as Triple),
    residuals,
  };
}
