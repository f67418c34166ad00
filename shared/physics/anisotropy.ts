import { carlsonRD } from './carlson.js';

/**
 * Demagnetisation (depolarisation) factors of an ellipsoid from its squared semi-axes,
 * D_i = (a1 a2 a3 / 3) R_D(a_j², a_k², a_i²) with (i, j, k) cyclic (DLMF §19.33; docs/physics.md
 * §2.2). Σ D_i = 1. The factors depend only on shape, so the arguments are first scaled to
 * unit geometric mean, which keeps R_D well inside double range for any size.
 * Writes D into `out` (same order as `a2`).
 */
export function demagnetisationFactors(a2: ArrayLike<number>, out: Float64Array): void {
  const g = Math.cbrt(a2[0] * a2[1] * a2[2]);
  const x = a2[0] / g;
  const y = a2[1] / g;
  const z = a2[2] / g;
  out[0] = carlsonRD(y, z, x) / 3;
  out[1] = carlsonRD(z, x, y) / 3;
  out[2] = carlsonRD(x, y, z) / 3;
}

/**
 * Anisotropy function f = 1 − 3 eᵀ D_lab e of an ellipsoid (docs/physics.md §2.2): squared
 * semi-axes `a2`, principal axes as the columns of the row-major 3×3 `axes`, unit dipole
 * direction `e`. f > 0 for an ellipsoid stretched along e (needle → 1), 0 for a sphere,
 * → −2 for a disc normal to e. `scratch` holds the three factors (length ≥ 3).
 */
export function ellipsoidAnisotropy(a2: ArrayLike<number>, axes: ArrayLike<number>, e: ArrayLike<number>, scratch: Float64Array): number {
  demagnetisationFactors(a2, scratch);
  let ede = 0;
  for (let i = 0; i < 3; i++) {
    const c = axes[i] * e[0] + axes[3 + i] * e[1] + axes[6 + i] * e[2];
    ede += scratch[i] * c * c;
  }
  return 1 - 3 * ede;
}

/** Below this |1 − κ²| the closed form loses digits to cancellation; the series is used. */
const SERIES_RANGE = 0.05;
const SERIES_TERMS = 15;

/**
 * Anisotropy function of a spheroid whose symmetry axis is along e, as a function of the
 * aspect κ = a⊥/a∥ (dimensionless). Closed form (PRA 71, 033618 (2005); docs/physics.md §2.2):
 *
 *   f(κ) = (1+2κ²)/(1−κ²) − 3κ² g(κ)/(1−κ²),
 *   g = artanh(√(1−κ²))/√(1−κ²) for κ < 1,  arctan(√(κ²−1))/√(κ²−1) for κ > 1;
 *
 * near the sphere (|1−κ²| < 0.05) the series f = Σ_{m≥1} 6xᵐ/((2m+1)(2m+3)), x = 1−κ²
 * (15 terms, truncation < 1e-20). f(0) = 1, f(1) = 0, f(∞) = −2. For the momentum spheroid
 * f_K = f(β) with β = K∥/K⊥.
 */
export function spheroidAnisotropy(kappa: number): number {
  if (!(kappa >= 0)) return NaN;
  if (kappa === 0) return 1;
  if (kappa === Infinity) return -2;
  const k2 = kappa * kappa;
  const x = 1 - k2;
  if (Math.abs(x) < SERIES_RANGE) {
    let sum = 0;
    let xm = 1;
    for (let m = 1; m <= SERIES_TERMS; m++) {
      xm *= x;
      sum += (6 * xm) / ((2 * m + 1) * (2 * m + 3));
    }
    return sum;
  }
  const root = Math.sqrt(Math.abs(x));
  const g = x > 0 ? Math.atanh(root) / root : Math.atan(root) / root;
  return (1 + 2 * k2) / x - (3 * k2 * g) / x;
}
