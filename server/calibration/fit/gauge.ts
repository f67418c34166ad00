import { symmetricEigen } from '../../../shared/physics/symmetric-eigen.js';
import type { Triple } from './calibration-csv.js';
import { type Matrix, sandwich } from './dense.js';

/**
 * The rotation freedom of a |B|-only fit. |K·I + B0| is unchanged when K and B0 are both
 * multiplied by any orthogonal Q (rotation or mirror), so the data fix 9 of the 12 numbers.
 * The magnitude fit works in the frame where K is upper triangular with a positive diagonal
 * (the x pair's field along +x, the y pair's field in the x–y plane with positive y, the z
 * pair's field with positive z): parameters (K00, K01, K02, K11, K12, K22, B0x, B0y, B0z).
 * With an active calibration the result is turned by the orthogonal Q that brings K closest to
 * the active K (orthogonal Procrustes, Frobenius norm), so the trap-frame angles of a
 * re-calibration stay continuous.
 */

/** Where each of the 9 gauge parameters sits among the 12 numbers (K row-major, then B0). */
const UPPER_SLOTS = [0, 1, 2, 4, 5, 8, 9, 10, 11];

export const DEFAULT_GAUGE =
  '|B| data fix K and B0 only up to a common rotation or mirror of the coil frame; chosen: the x pair\'s field along +x, the y pair\'s field in the x–y plane with positive y, the z pair\'s field with positive z (K upper triangular, positive diagonal)';

export function procrustesGauge(version: number): string {
  return `|B| data fix K and B0 only up to a common rotation or mirror of the coil frame; chosen: the orthogonal transformation that brings K closest to the active calibration v${version} (orthogonal Procrustes, Frobenius norm); coil → trap rotation kept from v${version}`;
}

export const VECTOR_GAUGE = 'vector probe aligned with the trap axes: K and B0 are measured in the trap frame, stored with coil → trap = identity';

/** K (3×3) and B0 from the 9 gauge parameters. */
export function unpackUpper(theta: readonly number[]): { k: Matrix; b0: Triple } {
  return {
    k: [
      [theta[0], theta[1], theta[2]],
      [0, theta[3], theta[4]],
      [0, 0, theta[5]],
    ],
    b0: [theta[6], theta[7], theta[8]],
  };
}

/** 12×12 covariance of (K row-major, B0) from the 9×9 covariance of the gauge parameters. */
export function embedUpperCovariance(cov9: Matrix): Matrix {
  const out = Array.from({ length: 12 }, () => new Array<number>(12).fill(0));
  UPPER_SLOTS.forEach((a, i) => UPPER_SLOTS.forEach((b, j) => (out[a][b] = cov9[i][j])));
  return out;
}

/**
 * The orthogonal Q (rotation or mirror) minimising ‖Q·K − target‖_F: the orthogonal polar
 * factor of M = target·Kᵀ, Q = M·(MᵀM)^(−1/2) (Schönemann 1966). Both matrices must be
 * non-singular.
 */
export function procrustes(k: Matrix, target: Matrix): Matrix {
  const m = multiply(target, transpose(k));
  const mtm = multiply(transpose(m), m);
  const values = new Float64Array(3);
  const vectors = new Float64Array(9);
  symmetricEigen(Float64Array.from(mtm.flat()), 3, values, vectors);
  // (MᵀM)^(−1/2) = V·diag(1/√λ)·Vᵀ
  const invRoot = [0, 1, 2].map((i) => [0, 1, 2].map((j) => [0, 1, 2].reduce((s, e) => s + (vectors[i * 3 + e] * vectors[j * 3 + e]) / Math.sqrt(values[e]), 0)));
  return multiply(m, invRoot);
}

/** K, B0 and their 12×12 covariance after turning the coil frame by the orthogonal Q. */
export function turn(q: Matrix, k: Matrix, b0: Triple, cov12: Matrix): { k: Matrix; b0: Triple; covariance: Matrix } {
  const t = Array.from({ length: 12 }, () => new Array<number>(12).fill(0));
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) for (let m = 0; m < 3; m++) t[i * 3 + j][m * 3 + j] = q[i][m];
    for (let m = 0; m < 3; m++) t[9 + i][9 + m] = q[i][m];
  }
  const b = [0, 1, 2].map((i) => q[i][0] * b0[0] + q[i][1] * b0[1] + q[i][2] * b0[2]) as Triple;
  return { k: multiply(q, k), b0: b, covariance: sandwich(t, cov12) };
}

export function multiply(a: Matrix, b: Matrix): Matrix {
  return a.map((row) => b[0].map((_, j) => row.reduce((s, v, k) => s + v * b[k][j], 0)));
}

export function transpose(a: Matrix): Matrix {
  return a[0].map((_, j) => a.map((row) => row[j]));
}
