import type { MagnitudePoint } from './calibration-csv.js';
import { type Matrix, gram, inverse, linearLeastSquares, project, solve } from './dense.js';
import { CalibrationInputError } from './fit-input-error.js';
import { requireDetermined } from './identifiability.js';

/** Gauge parameters of a |B| fit: (K00, K01, K02, K11, K12, K22, B0x, B0y, B0z); see gauge.ts. */
export const MAGNITUDE_PARAMETERS = 9;
/** Terms of |B|² = Iᵀ·KᵀK·I + 2·(KᵀB0)·I + |B0|², linear in their 10 coefficients. */
const QUADRATIC_TERMS = ['Ix²', 'Iy²', 'Iz²', 'Ix·Iy', 'Ix·Iz', 'Iy·Iz', 'Ix', 'Iy', 'Iz', '1'];

export interface MagnitudeSolution {
  /** The 9 gauge parameters at the least-squares minimum, positive diagonal. */
  theta: number[];
  /** Their covariance: s²·(JᵀJ)⁻¹ with s² = RSS/(n − 9), or (JᵀWJ)⁻¹ with W = 1/σ² when weighted. */
  covariance: Matrix;
  /** Model |K·I + B0| at each point, G. */
  fitted: number[];
  /** measured − fitted, G. */
  residuals: number[];
  iterations: number;
}

/**
 * Least-squares fit of |B|_n ≈ |K·I_n + B0| (weighted by 1/σ² when the file has sigmas).
 *
 * Method: a linear least-squares fit of |B|² in the 10 coefficients of the quadratic form gives
 * KᵀK (factored by Cholesky into the upper-triangular gauge), KᵀB0 and so the start; then
 * Levenberg–Marquardt (Marquardt 1963: damping λ·diag(JᵀWJ), analytic Jacobian, normal
 * equations solved with mathjs lusolve) iterates to the minimum. It stops only when a step
 * changes no parameter by more than 1e-10 of its size, or lowers the sum of squares by less than
 * 1e-15 of itself, or no step lowers it even at full damping, not at a loose default tolerance. The registry's
 * ml-levenberg-marquardt was not used here: it stops on an absolute error threshold or an
 * iteration count only, so it cannot tell when it has reached the minimum.
 */
export function fitMagnitude(points: readonly MagnitudePoint[]): MagnitudeSolution {
  const n = points.length;
  const need = QUADRATIC_TERMS.length;
  if (n < need) {
    throw new CalibrationInputError(
      `a |B| fit needs at least ${need} data lines (9 parameters, and the start fits 10 coefficients of |B|²); the file has ${n}`,
    );
  }
  const design = points.map((p) => quadraticRow(p.currentA));
  requireDetermined(points.map((p) => p.currentA), design, QUADRATIC_TERMS);
  const weighted = points[0].sigmaGauss !== null;
  const weights = points.map((p) => (weighted ? 1 / (p.sigmaGauss! * p.sigmaGauss!) : 1));
  const y = points.map((p) => p.fieldGauss);

  let theta = linearStart(design, y);
  let residuals = residualsOf(points, theta);
  let rss = weightedSum(residuals, weights);
  let lambda = 1e-3;
  let iterations = 0;
  for (let converged = false; !converged; iterations++) {
    if (iterations >= 500) throw new CalibrationInputError('the |B| fit did not converge in 500 iterations: check the file for mixed-up columns or units');
    const jacobian = jacobianOf(points, theta);
    const normal = gram(jacobian, weights);
    const gradient = project(jacobian, residuals, weights);
    for (;;) {
      const damped = normal.map((row, i) => row.map((v, j) => (i === j ? v * (1 + lambda) : v)));
      const step = solve(damped, gradient);
      const trial = theta.map((t, i) => t + step[i]);
      const trialResiduals = residualsOf(points, trial);
      const trialRss = weightedSum(trialResiduals, weights);
      if (trialRss <= rss) {
        const small =
          step.every((s, i) => Math.abs(s) <= 1e-10 * Math.max(Math.abs(trial[i]), 1e-6 * scaleOf(trial))) ||
          rss - trialRss <= 1e-15 * rss;
        theta = trial;
        residuals = trialResiduals;
        rss = trialRss;
        lambda = Math.max(lambda / 10, 1e-12);
        converged = small;
        break;
      }
      lambda *= 10;
      // No step lowers the sum of squares even at full damping: this is the minimum to rounding.
      if (lambda > 1e12) {
        converged = true;
        break;
      }
    }
  }
  theta = positiveDiagonal(theta);
  residuals = residualsOf(points, theta);
  const jacobian = jacobianOf(points, theta);
  const unscaled = inverse(gram(jacobian, weights));
  const s2 = weighted ? 1 : weightedSum(residuals, weights) / (n - MAGNITUDE_PARAMETERS);
  return {
    theta,
    covariance: unscaled.map((row) => row.map((v) => v * s2)),
    fitted: points.map((p, i) => p.fieldGauss - residuals[i]),
    residuals,
    iterations,
  };
}

function quadraticRow([x, y, z]: readonly number[]): number[] {
  return [x * x, y * y, z * z, x * y, x * z, y * z, x, y, z, 1];
}

/** Start from the linear fit of |B|²: Cholesky of KᵀK gives the upper-triangular K, then B0 = K⁻ᵀ·(KᵀB0). */
function linearStart(design: Matrix, y: readonly number[]): number[] {
  const q = linearLeastSquares(design, y.map((v) => v * v)).coefficients;
  const m = [
    [q[0], q[3] / 2, q[4] / 2],
    [q[3] / 2, q[1], q[5] / 2],
    [q[4] / 2, q[5] / 2, q[2]],
  ];
  const c = [q[6] / 2, q[7] / 2, q[8] / 2];
  // Noise can make the estimated KᵀK slightly indefinite; a small floor keeps the start usable.
  const floor = 1e-6 * Math.max(Math.abs(m[0][0]), Math.abs(m[1][1]), Math.abs(m[2][2]), 1e-12);
  const u00 = Math.sqrt(Math.max(m[0][0], floor));
  const u01 = m[0][1] / u00;
  const u02 = m[0][2] / u00;
  const u11 = Math.sqrt(Math.max(m[1][1] - u01 * u01, floor));
  const u12 = (m[1][2] - u01 * u02) / u11;
  const u22 = Math.sqrt(Math.max(m[2][2] - u02 * u02 - u12 * u12, floor));
  const b0 = c[0] / u00;
  const b1 = (c[1] - u01 * b0) / u11;
  const b2 = (c[2] - u02 * b0 - u12 * b1) / u22;
  return [u00, u01, u02, u11, u12, u22, b0, b1, b2];
}

function fieldOf(theta: readonly number[], [x, y, z]: readonly number[]): [number, number, number] {
  return [theta[0] * x + theta[1] * y + theta[2] * z + theta[6], theta[3] * y + theta[4] * z + theta[7], theta[5] * z + theta[8]];
}

function residualsOf(points: readonly MagnitudePoint[], theta: readonly number[]): number[] {
  return points.map((p) => p.fieldGauss - Math.hypot(...fieldOf(theta, p.currentA)));
}

/** ∂|v|/∂θ with v = K·I + B0: ∂|v|/∂K_ij = v_i·I_j/|v|, ∂|v|/∂B0_i = v_i/|v|. */
function jacobianOf(points: readonly MagnitudePoint[], theta: readonly number[]): Matrix {
  return points.map((p) => {
    const v = fieldOf(theta, p.currentA);
    const f = Math.hypot(...v) || 1e-300;
    const [x, y, z] = p.currentA;
    const [a, b, c] = [v[0] / f, v[1] / f, v[2] / f];
    return [a * x, a * y, a * z, b * y, b * z, c * z, a, b, c];
  });
}

function weightedSum(residuals: readonly number[], weights: readonly number[]): number {
  return residuals.reduce((s, r, i) => s + weights[i] * r * r, 0);
}

function scaleOf(theta: readonly number[]): number {
  return Math.max(...theta.map(Math.abs));
}

/** Mirrors coil axes (row i of K and B0_i together, which leaves |B| unchanged) so that K_ii > 0. */
function positiveDiagonal(theta: readonly number[]): number[] {
  const sign = [Math.sign(theta[0]) || 1, Math.sign(theta[3]) || 1, Math.sign(theta[5]) || 1];
  return [theta[0] * sign[0], theta[1] * sign[0], theta[2] * sign[0], theta[3] * sign[1], theta[4] * sign[1], theta[5] * sign[2], theta[6] * sign[0], theta[7] * sign[1], theta[8] * sign[2]];
}
