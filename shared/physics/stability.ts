import type { EnergyFunctional } from './energy.js';
import { PARAMETER_COUNT } from './energy.js';
import { symmetricEigen } from './symmetric-eigen.js';

const N = PARAMETER_COUNT;
/** Second-difference step of the stability Hessian (docs/physics.md §4.3). */
const HESSIAN_STEP = 1e-4;
/** Smallest eigenvalue accepted as a true minimum (docs/physics.md §4.3). */
const MIN_STABLE_EIGENVALUE = 1e-10;

/**
 * Collapse test of docs/physics.md §4.3: the 7×7 Hessian of e(p) in the S-chart re-centred on the
 * solution (M0 := M_r*, so S = 0 there), by central second differences with h = 1e-4
 * (99 energy calls). The variational energy is unbounded below, so a stable gas is a local
 * minimum: all eigenvalues must exceed 1e-10. Re-centring removes the chart's own curvature
 * from the test, and the S-chart has no gauge modes, so equal radii cause no false zeros.
 *
 * When positive definite, the inverse Hessian is kept: it is the exact starting matrix for a
 * BFGS warm start in the same chart.
 */
export class HessianCheck {
  /** Smallest Hessian eigenvalue of the last check. */
  minEigenvalue = NaN;
  /** Inverse Hessian (row-major 7×7) of the last positive-definite check. */
  readonly inverse = new Float64Array(N * N);
  private readonly hess = new Float64Array(N * N);
  private readonly vals = new Float64Array(N);
  private readonly vecs = new Float64Array(N * N);
  private readonly p = new Float64Array(N);

  /**
   * Re-centres `energy` on the ellipsoid `mr` and evaluates the Hessian at (S = 0, b).
   * Leaves the functional centred on `mr`. Returns true when all eigenvalues exceed 1e-10.
   */
  run(energy: EnergyFunctional, mr: ArrayLike<number>, b: number): boolean {
    const { p, hess } = this;
    const h = HESSIAN_STEP;
    energy.centreOn(mr);
    p.fill(0);
    p[6] = b;
    const e0 = energy.evaluate(p);
    for (let i = 0; i < N; i++) {
      const pi = p[i];
      p[i] = pi + h;
      const up = energy.evaluate(p);
      p[i] = pi - h;
      const down = energy.evaluate(p);
      p[i] = pi;
      hess[i * N + i] = (up - 2 * e0 + down) / (h * h);
      for (let j = i + 1; j < N; j++) {
        const pj = p[j];
        p[i] = pi + h; p[j] = pj + h;
        const pp = energy.evaluate(p);
        p[j] = pj - h;
        const pm = energy.evaluate(p);
        p[i] = pi - h;
        const mm = energy.evaluate(p);
        p[j] = pj + h;
        const mp = energy.evaluate(p);
        p[i] = pi; p[j] = pj;
        const v = (pp - pm - mp + mm) / (4 * h * h);
        hess[i * N + j] = v;
        hess[j * N + i] = v;
      }
    }
    symmetricEigen(hess, N, this.vals, this.vecs);
    let min = Infinity;
    for (let k = 0; k < N; k++) min = Math.min(min, this.vals[k]);
    this.minEigenvalue = min;
    const stable = min > MIN_STABLE_EIGENVALUE;
    if (stable) {
      const { vals, vecs, inverse } = this;
      for (let i = 0; i < N; i++) {
        for (let j = i; j < N; j++) {
          let s = 0;
          for (let k = 0; k < N; k++) s += (vecs[i * N + k] * vecs[j * N + k]) / vals[k];
          inverse[i * N + j] = s;
          inverse[j * N + i] = s;
        }
      }
    }
    return stable;
  }
}
