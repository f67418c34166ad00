import { inv, lusolve } from 'mathjs';
import { symmetricEigen } from '../../../shared/physics/symmetric-eigen.js';

/**
 * The small dense linear algebra the calibration fits need. Solves and inverses go through
 * mathjs (LU with partial pivoting); the rank check uses the Jacobi eigen-solver of
 * shared/physics. Matrices are arrays of rows.
 */
export type Matrix = number[][];

/** Solves A·x = b for a square, non-singular A (mathjs lusolve). */
export function solve(a: Matrix, b: number[]): number[] {
  return (lusolve(a, b) as number[][]).map((row) => row[0]);
}

/** A⁻¹ for a square, non-singular A (mathjs inv). */
export function inverse(a: Matrix): Matrix {
  return inv(a) as Matrix;
}

/** Aᵀ·W·A for rows `a` (n×p) and optional weights (length n). */
export function gram(a: Matrix, weights?: readonly number[]): Matrix {
  const p = a[0].length;
  const out = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  a.forEach((row, n) => {
    const w = weights ? weights[n] : 1;
    for (let i = 0; i < p; i++) {
      const wi = w * row[i];
      for (let j = i; j < p; j++) out[i][j] += wi * row[j];
    }
  });
  for (let i = 0; i < p; i++) for (let j = 0; j < i; j++) out[i][j] = out[j][i];
  return out;
}

/** Aᵀ·W·y. */
export function project(a: Matrix, y: readonly number[], weights?: readonly number[]): number[] {
  const out = new Array<number>(a[0].length).fill(0);
  a.forEach((row, n) => {
    const wy = (weights ? weights[n] : 1) * y[n];
    row.forEach((v, i) => (out[i] += v * wy));
  });
  return out;
}

/** A·Σ·Aᵀ: covariance of linear combinations A·x of a vector x with covariance Σ. */
export function sandwich(a: Matrix, sigma: Matrix): Matrix {
  const as = a.map((row) => sigma[0].map((_, j) => row.reduce((s, v, k) => s + v * sigma[k][j], 0)));
  return as.map((row) => a.map((other) => row.reduce((s, v, k) => s + v * other[k], 0)));
}

export interface LinearFit {
  coefficients: number[];
  /** (Aᵀ·W·A)⁻¹, the unscaled covariance of the coefficients. */
  normalInverse: Matrix;
  residuals: number[];
  /** Σ w·r². */
  weightedRss: number;
}

/**
 * Weighted linear least squares y ≈ A·x by the normal equations on column-scaled A (each
 * column divided by its norm, which keeps the normal matrix near unit diagonal). The caller
 * checks beforehand that A has full column rank (`nullDirection`).
 */
export function linearLeastSquares(a: Matrix, y: readonly number[], weights?: readonly number[]): LinearFit {
  const scale = columnNorms(a).map((n) => (n > 0 ? n : 1));
  const scaled = a.map((row) => row.map((v, i) => v / scale[i]));
  const normal = gram(scaled, weights);
  const z = solve(normal, project(scaled, y, weights));
  const coefficients = z.map((v, i) => v / scale[i]);
  const normalScaledInverse = inverse(normal);
  const normalInverse = normalScaledInverse.map((row, i) => row.map((v, j) => v / (scale[i] * scale[j])));
  const residuals = a.map((row, n) => y[n] - row.reduce((s, v, i) => s + v * coefficients[i], 0));
  const weightedRss = residuals.reduce((s, r, n) => s + (weights ? weights[n] : 1) * r * r, 0);
  return { coefficients, normalInverse, residuals, weightedRss };
}

/**
 * The direction in coefficient space that the design `a` does not determine, or null when it
 * has full column rank: the eigenvector of the smallest eigenvalue of the column-normalised
 * normal matrix when that eigenvalue is below `tolerance` (a condition number above 1/tolerance).
 */
export function nullDirection(a: Matrix, tolerance = 1e-10): number[] | null {
  const p = a[0].length;
  const norms = columnNorms(a);
  const zero = norms.findIndex((n) => n === 0);
  if (zero >= 0) return norms.map((_, i) => (i === zero ? 1 : 0));
  const normal = gram(a.map((row) => row.map((v, i) => v / norms[i])));
  const flat = Float64Array.from(normal.flat());
  const values = new Float64Array(p);
  const vectors = new Float64Array(p * p);
  symmetricEigen(flat, p, values, vectors);
  let k = 0;
  for (let i = 1; i < p; i++) if (values[i] < values[k]) k = i;
  if (values[k] > tolerance) return null;
  return Array.from({ length: p }, (_, i) => vectors[i * p + k]);
}

function columnNorms(a: Matrix): number[] {
  return a[0].map((_, i) => Math.sqrt(a.reduce((s, row) => s + row[i] * row[i], 0)));
}
