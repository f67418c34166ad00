/** Result of one minimisation; the minimiser's `x` holds the final point. */
export interface MinimiseResult {
  /** Objective value at the final point. */
  value: number;
  /** Largest |gradient component| at the final point. */
  gradInf: number;
  iterations: number;
  /** Objective calls, including the finite-difference gradients. */
  evaluations: number;
  /** Stopped on the gradient test or on three successive negligible relative decreases. */
  converged: boolean;
  /** The caller's `abandon` test stopped the run. */
  abandoned: boolean;
  /** Some parameter sits on its box bound. */
  onBound: boolean;
}

export interface BfgsOptions {
  /** Symmetric box |x_i| ≤ bound[i]. */
  bound: ArrayLike<number>;
  /** Central-difference step of the gradient. */
  gradientStep?: number;
  /** Stop when ‖g‖∞ falls below this. */
  gradientTolerance?: number;
  /** Largest Euclidean length of one step. */
  maxStep?: number;
  maxIterations?: number;
}

const ARMIJO_C1 = 1e-4;
const MAX_BACKTRACKS = 40;

/**
 * Quasi-Newton minimiser: BFGS (Nocedal & Wright, Numerical Optimization, 2nd ed., §6.1,
 * inverse-Hessian update 6.17) with an Armijo backtracking line search, a cap on the step
 * length and clamping to a box, with a central-difference gradient — the variant docs/physics.md
 * §4.1 names as adequate for the 7-parameter energy. It accepts a starting inverse Hessian,
 * which turns a warm start near the previous minimum into a few Newton-like steps.
 *
 * Stops when ‖g‖∞ < tolerance, when the relative decrease stays below 1e-15 for three
 * iterations, or when no descent step can be found even along −g. All scratch memory
 * belongs to the instance; `minimise` allocates nothing.
 */
export class BfgsMinimiser {
  /** The current / final point. */
  readonly x: Float64Array;
  /** Gradient at x. */
  readonly g: Float64Array;
  /** Inverse-Hessian approximation, row-major n×n. */
  readonly hinv: Float64Array;
  private readonly trial: Float64Array;
  private readonly gTrial: Float64Array;
  private readonly d: Float64Array;
  private readonly hy: Float64Array;
  private readonly bound: Float64Array;
  private readonly h: number;
  private readonly gtol: number;
  private readonly maxStep: number;
  private readonly maxIterations: number;
  private evaluations = 0;

  constructor(
    private readonly n: number,
    options: BfgsOptions,
  ) {
    this.x = new Float64Array(n);
    this.g = new Float64Array(n);
    this.hinv = new Float64Array(n * n);
    this.trial = new Float64Array(n);
    this.gTrial = new Float64Array(n);
    this.d = new Float64Array(n);
    this.hy = new Float64Array(n);
    this.bound = Float64Array.from(options.bound);
    this.h = options.gradientStep ?? 1e-6;
    this.gtol = options.gradientTolerance ?? 1e-9;
    this.maxStep = options.maxStep ?? 0.5;
    this.maxIterations = options.maxIterations ?? 400;
  }

  /**
   * Minimises `f` from `start`; `startInverseHessian` (n×n) seeds the quasi-Newton matrix,
   * otherwise the identity rescaled after the first step (Nocedal & Wright eq. 6.20).
   * `abandon` is asked after every accepted step (right after `f` ran at the new point), so
   * a run heading somewhere hopeless can stop early.
   */
  minimise(
    f: (x: Float64Array) => number,
    start: ArrayLike<number>,
    startInverseHessian?: ArrayLike<number> | null,
    abandon?: () => boolean,
  ): MinimiseResult {
    const { n, x, g, hinv, trial, gTrial, d } = this;
    this.evaluations = 0;
    for (let i = 0; i < n; i++) x[i] = this.clamp(start[i], i);
    let seeded = startInverseHessian != null;
    if (seeded) for (let i = 0; i < n * n; i++) hinv[i] = (startInverseHessian as ArrayLike<number>)[i];
    else this.resetInverseHessian();
    let fx = this.count(f, x);
    this.gradient(f, x, g);
    let freshIdentity = !seeded;
    let stalls = 0;
    let converged = false;
    let abandoned = false;
    let iterations = 0;
    for (; iterations < this.maxIterations; iterations++) {
      if (this.infNorm(g) < this.gtol) {
        converged = true;
        break;
      }
      let slope = this.searchDirection();
      if (!(slope < 0)) {
        this.resetInverseHessian();
        freshIdentity = true;
        slope = this.searchDirection();
      }
      let len = 0;
      for (let i = 0; i < n; i++) len += d[i] * d[i];
      len = Math.sqrt(len);
      if (len > this.maxStep) for (let i = 0; i < n; i++) d[i] *= this.maxStep / len;

      let alpha = 1;
      let fTrial = NaN;
      let accepted = false;
      for (let k = 0; k < MAX_BACKTRACKS; k++, alpha *= 0.5) {
        let actualSlope = 0;
        for (let i = 0; i < n; i++) {
          trial[i] = this.clamp(x[i] + alpha * d[i], i);
          actualSlope += g[i] * (trial[i] - x[i]);
        }
        fTrial = this.count(f, trial);
        if (fTrial <= fx + ARMIJO_C1 * Math.min(actualSlope, 0)) {
          accepted = true;
          break;
        }
      }
      if (!accepted) {
        if (freshIdentity) break;
        this.resetInverseHessian();
        freshIdentity = true;
        continue;
      }
      if (abandon?.()) {
        x.set(trial);
        fx = fTrial;
        abandoned = true;
        break;
      }
      this.gradient(f, trial, gTrial);
      // Reuse trial/gTrial as s and y after moving the point.
      const relDecrease = Math.abs(fx - fTrial) / Math.max(Math.abs(fx), 1e-300);
      stalls = relDecrease < 1e-15 ? stalls + 1 : 0;
      for (let i = 0; i < n; i++) {
        const s = trial[i] - x[i];
        const y = gTrial[i] - g[i];
        x[i] = trial[i];
        g[i] = gTrial[i];
        trial[i] = s;
        gTrial[i] = y;
      }
      fx = fTrial;
      this.update(trial, gTrial, !seeded);
      seeded = true;
      freshIdentity = false;
      if (stalls >= 3) {
        converged = true;
        iterations++;
        break;
      }
    }
    const gradInf = abandoned ? NaN : this.infNorm(g);
    if (gradInf < this.gtol) converged = true;
    let onBound = false;
    for (let i = 0; i < n; i++) if (Math.abs(x[i]) >= this.bound[i] * (1 - 1e-12)) onBound = true;
    return { value: fx, gradInf, iterations, evaluations: this.evaluations, converged, abandoned, onBound };
  }

  private count(f: (x: Float64Array) => number, at: Float64Array): number {
    this.evaluations++;
    return f(at);
  }

  private clamp(v: number, i: number): number {
    const b = this.bound[i];
    return v > b ? b : v < -b ? -b : v;
  }

  private infNorm(v: Float64Array): number {
    let m = 0;
    for (let i = 0; i < this.n; i++) m = Math.max(m, Math.abs(v[i]));
    return m;
  }

  private resetInverseHessian(): void {
    this.hinv.fill(0);
    for (let i = 0; i < this.n; i++) this.hinv[i * this.n + i] = 1;
  }

  /** d = −H g; returns the slope gᵀd. */
  private searchDirection(): number {
    const { n, hinv, g, d } = this;
    let slope = 0;
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = 0; j < n; j++) s -= hinv[i * n + j] * g[j];
      d[i] = s;
      slope += s * g[i];
    }
    return slope;
  }

  private gradient(f: (x: Float64Array) => number, at: Float64Array, out: Float64Array): void {
    centralGradient(f, at, this.h, out);
    this.evaluations += 2 * this.n;
  }

  /** BFGS inverse update with step s and gradient change y; skipped without positive curvature. */
  private update(s: Float64Array, y: Float64Array, rescaleFirst: boolean): void {
    const { n, hinv, hy } = this;
    let ys = 0;
    let yy = 0;
    let ss = 0;
    for (let i = 0; i < n; i++) {
      ys += y[i] * s[i];
      yy += y[i] * y[i];
      ss += s[i] * s[i];
    }
    if (!(ys > 1e-12 * Math.sqrt(ss * yy))) return;
    if (rescaleFirst) for (let i = 0; i < n * n; i++) hinv[i] *= ys / yy;
    let yhy = 0;
    for (let i = 0; i < n; i++) {
      let v = 0;
      for (let j = 0; j < n; j++) v += hinv[i * n + j] * y[j];
      hy[i] = v;
      yhy += v * y[i];
    }
    const a = (ys + yhy) / (ys * ys);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) hinv[i * n + j] += a * s[i] * s[j] - (hy[i] * s[j] + s[i] * hy[j]) / ys;
    }
  }
}

/**
 * Gradient of `f` at `at` by central differences with step h (truncation O(h²), rounding
 * about ε|f|/h), 2n calls. `at` is restored on return.
 */
export function centralGradient(f: (x: Float64Array) => number, at: Float64Array, h: number, out: Float64Array): void {
  for (let i = 0; i < at.length; i++) {
    const keep = at[i];
    at[i] = keep + h;
    const up = f(at);
    at[i] = keep - h;
    const down = f(at);
    at[i] = keep;
    out[i] = (up - down) / (2 * h);
  }
}
