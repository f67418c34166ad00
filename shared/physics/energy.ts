import { ellipsoidAnisotropy, spheroidAnisotropy } from './anisotropy.js';
import { symmetricEigen3 } from './symmetric-eigen.js';

/** Interaction prefactor C0 = 2048/(945π³) of E_dir and E_ex (docs/physics.md §2.2). */
export const C0 = 2048 / (945 * Math.PI ** 3);
/** ε̃ = κ ε_dd with κ = 4πC0/(2^(3/2) 6^(5/6)) (docs/physics.md §3.2). */
export const EPS_TILDE_PER_EPS_DD = (4 * Math.PI * C0) / (2 ** 1.5 * 6 ** (5 / 6));
/** Parameters p = (s11, s22, s33, s12, s13, s23, b) of the S-chart (docs/physics.md §3.4). */
export const PARAMETER_COUNT = 7;

/**
 * The dimensionless variational energy per particle, in units of E_F0 = ħω̄(6N)^(1/3)
 * (docs/physics.md §3.2):
 *
 *   e(p) = ⅛[k̄²(2β^(−2/3) + β^(4/3)) + Σ_a λ_a² (M_r)_aa] + ε̃[f(β) − f_R]/r̄³,  k̄ = 1/r̄,
 *
 * in the symmetric log-metric chart M_r = C·expm(S)·C, β = e^b, where C = M0^(1/2) is the
 * chart centre (the ideal gas diag(1/λ_a) or any earlier solution). The chart has no gauge
 * modes, so finite-difference Hessians stay clean when two radii coincide (§3.4).
 *
 * One instance owns all scratch memory: `evaluate` allocates nothing. After a call, `mr`,
 * `radii2`, `axes` and the four parts describe the evaluated point.
 */
export class EnergyFunctional {
  /** Trap anisotropies λ_a = ω_a/ω̄ (product 1). */
  readonly lambda = new Float64Array(3);
  /** Unit dipole direction e, trap frame. */
  readonly e = new Float64Array(3);
  /** Dimensionless dipolar strength ε̃ = κ ε_dd. */
  epsTilde = 0;
  /** M_r (row-major 3×3) of the last evaluated point, in units of R̄0². */
  readonly mr = new Float64Array(9);
  /** Squared dimensionless semi-axes r_i² (unsorted) and their axes (columns, row-major). */
  readonly radii2 = new Float64Array(3);
  readonly axes = new Float64Array(9);
  /** Energy parts of the last evaluated point, per particle in E_F0. */
  kinetic = 0;
  trap = 0;
  direct = 0;
  exchange = 0;
  /** r̄ = det(M_r)^(1/6) of the last evaluated point. */
  rbar = 1;

  private readonly chart = new Float64Array(9);
  private chartDet = 1;
  private readonly work = new Float64Array(9);
  private readonly vals = new Float64Array(3);
  private readonly vecs = new Float64Array(9);
  private readonly tmp = new Float64Array(9);
  private readonly factors = new Float64Array(3);

  /** Sets the trap anisotropies λ_a, the unit field direction and ε̃ (dimensionless). */
  setProblem(lambda: ArrayLike<number>, e: ArrayLike<number>, epsTilde: number): void {
    for (let i = 0; i < 3; i++) {
      this.lambda[i] = lambda[i];
      this.e[i] = e[i];
    }
    this.epsTilde = epsTilde;
  }

  /** Centres the chart on the ideal gas: C = diag(1/λ_a), so S = 0 is the non-interacting cloud. */
  centreOnIdealGas(): void {
    this.chart.fill(0);
    for (let i = 0; i < 3; i++) this.chart[4 * i] = 1 / this.lambda[i];
    this.chartDet = 1 / (this.lambda[0] * this.lambda[1] * this.lambda[2]);
  }

  /** Centres the chart on the ellipsoid `mr` (row-major 3×3, positive definite): C = mr^(1/2). */
  centreOn(mr: ArrayLike<number>): void {
    symmetricEigen3(mr, this.vals, this.vecs);
    this.chartDet = 1;
    for (let k = 0; k < 3; k++) this.chartDet *= Math.sqrt(this.vals[k]);
    this.spectralFunction(this.chart, Math.sqrt);
  }

  /** Energy per particle in E_F0 at p (length ≥ 7). */
  evaluate(p: ArrayLike<number>): number {
    const w = this.work;
    w[0] = p[0]; w[4] = p[1]; w[8] = p[2];
    w[1] = w[3] = p[3];
    w[2] = w[6] = p[4];
    w[5] = w[7] = p[5];
    symmetricEigen3(w, this.vals, this.vecs);
    this.spectralFunction(this.tmp, Math.exp);
    this.sandwich(this.tmp, this.mr);

    const rbar3 = this.chartDet * Math.exp(0.5 * (p[0] + p[1] + p[2]));
    const rbar2 = Math.cbrt(rbar3 * rbar3);
    this.rbar = Math.sqrt(rbar2);
    symmetricEigen3(this.mr, this.radii2, this.axes);
    const fR = ellipsoidAnisotropy(this.radii2, this.axes, this.e, this.factors);

    const lam = this.lambda;
    const b = p[6];
    const beta = Math.exp(b);
    this.trap = 0.125 * (lam[0] * lam[0] * this.mr[0] + lam[1] * lam[1] * this.mr[4] + lam[2] * lam[2] * this.mr[8]);
    this.kinetic = (0.125 * (2 * Math.exp((-2 * b) / 3) + Math.exp((4 * b) / 3))) / rbar2;
    this.direct = (-this.epsTilde * fR) / rbar3;
    this.exchange = (this.epsTilde * spheroidAnisotropy(beta)) / rbar3;
    return this.kinetic + this.trap + this.direct + this.exchange;
  }

  /** out = V·diag(fn(vals))·Vᵀ from the last decomposition held in vals/vecs. */
  private spectralFunction(out: Float64Array, fn: (x: number) => number): void {
    const v = this.vecs;
    const f0 = fn(this.vals[0]);
    const f1 = fn(this.vals[1]);
    const f2 = fn(this.vals[2]);
    for (let i = 0; i < 3; i++) {
      for (let j = i; j < 3; j++) {
        const x = v[3 * i] * v[3 * j] * f0 + v[3 * i + 1] * v[3 * j + 1] * f1 + v[3 * i + 2] * v[3 * j + 2] * f2;
        out[3 * i + j] = x;
        out[3 * j + i] = x;
      }
    }
  }

  /** out = C·m·C with the chart centre C (both symmetric, so out is symmetric). */
  private sandwich(m: Float64Array, out: Float64Array): void {
    const c = this.chart;
    const t = this.work;
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) t[3 * i + j] = c[3 * i] * m[j] + c[3 * i + 1] * m[3 + j] + c[3 * i + 2] * m[6 + j];
    }
    for (let i = 0; i < 3; i++) {
      for (let j = i; j < 3; j++) {
        const x = t[3 * i] * c[j] + t[3 * i + 1] * c[3 + j] + t[3 * i + 2] * c[6 + j];
        out[3 * i + j] = x;
        out[3 * j + i] = x;
      }
    }
  }
}
