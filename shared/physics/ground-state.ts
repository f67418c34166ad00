import { EnergyFunctional, EPS_TILDE_PER_EPS_DD, PARAMETER_COUNT } from './energy.js';
import { BfgsMinimiser, centralGradient } from './minimise.js';
import { HessianCheck } from './stability.js';

/**
 * A solved ground state from which the next solve can start: M_r (row-major 3×3, units of
 * R̄0²), b = ln β, and the inverse Hessian in the chart centred on M_r. Plain arrays so it
 * survives structured cloning (Web Worker, worker thread) and JSON.
 */
export interface SolverState {
  mr: number[];
  b: number;
  inverseHessian: number[];
}

export interface EnergyParts {
  total: number;
  kinetic: number;
  trap: number;
  direct: number;
  exchange: number;
}

/** Outcome of a ground-state solve in dimensionless units (docs/physics.md §3.2). */
export interface GroundState {
  stable: boolean;
  /** Why the gas counts as collapsed (only when not stable). */
  reason?: string;
  /** Start point for the next solve (only when stable). */
  state: SolverState | null;
  /** M_r of the final point, row-major 3×3, units of R̄0². */
  mr: number[];
  /** β = K∥/K⊥. */
  beta: number;
  /** r̄ = det(M_r)^(1/6); k̄ = 1/r̄. */
  rbar: number;
  /** Energies per particle in E_F0. */
  energy: EnergyParts;
  /** Smallest eigenvalue of the re-centred Hessian (NaN when the check was not reached). */
  minHessianEigenvalue: number;
  /** Energy calls spent, including retries. */
  evaluations: number;
}

export interface SolveOptions {
  /** Retry a failure by continuation from the ideal gas (default true). */
  retry?: boolean;
  /**
   * Give up once r̄ falls below this fraction of the start's r̄. Only for probes started next
   * to a known minimum (critical-ε scans), where such a shrink can only be the runaway.
   */
  runawayShrink?: number;
}

function determinant3(m: ArrayLike<number>): number {
  return m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);
}

/** Box of the S-chart: |s_ij| ≤ 6, |b| ≤ 3 (docs/physics.md §4.1). */
const BOUNDS = [6, 6, 6, 6, 6, 6, 3];
/** Smallest accepted r̄ (docs/physics.md §4.3). */
const MIN_RBAR = 0.05;
/** A converged minimum has a small gradient; far above the finite-difference noise (~1e-10). */
const STATIONARY_GRADIENT = 1e-6;
const CONTINUATION_STEPS = 8;
/** A polishing Newton step corrects rounding-level residue; anything larger is not applied. */
const POLISH_MAX_STEP = 1e-4;

/**
 * Ground state of the variational model for trap anisotropies λ_a, field direction e and
 * strength ε_dd: BFGS in the S-chart, the Hessian collapse check, and — when a cold start
 * fails — the continuation retry ε̃·k/8, k = 1…8 (docs/physics.md §4.1–4.3). One instance owns its
 * scratch memory; reuse it for many solves (maps, critical-ε scans).
 */
export class GroundStateSolver {
  readonly energy = new EnergyFunctional();
  private readonly bfgs = new BfgsMinimiser(PARAMETER_COUNT, { bound: BOUNDS });
  private readonly check = new HessianCheck();
  private readonly p0 = new Float64Array(PARAMETER_COUNT);
  private readonly grad = new Float64Array(PARAMETER_COUNT);
  private readonly objective = (p: Float64Array) => this.energy.evaluate(p);
  private rbarFloor = MIN_RBAR;
  /** A point below the r̄ floor already fails §4.3 (or the caller's stricter floor), and the descent cannot climb back. */
  private readonly hopeless = () => !(this.energy.rbar >= this.rbarFloor);

  /**
   * Solves at dimensionless strength `epsDd`. Starts from `start` when given (a previous
   * solution), else from the ideal gas. A failed attempt is repeated by continuation in ε̃
   * from the ideal gas before the gas is declared collapsed, unless `retry` is false.
   */
  solve(lambda: ArrayLike<number>, e: ArrayLike<number>, epsDd: number, start: SolverState | null, options: SolveOptions = {}): GroundState {
    const epsTilde = EPS_TILDE_PER_EPS_DD * epsDd;
    this.rbarFloor = MIN_RBAR;
    if (options.runawayShrink !== undefined && start) {
      this.rbarFloor = Math.max(MIN_RBAR, options.runawayShrink * Math.pow(determinant3(start.mr), 1 / 6));
    }
    let result = this.attempt(lambda, e, epsTilde, start);
    this.rbarFloor = MIN_RBAR;
    if (result.stable || options.retry === false || epsDd === 0) return result;
    let spent = result.evaluations;
    let state: SolverState | null = null;
    for (let k = 1; k <= CONTINUATION_STEPS; k++) {
      const step = this.attempt(lambda, e, (epsTilde * k) / CONTINUATION_STEPS, state);
      spent += step.evaluations;
      if (!step.stable) {
        // Report the failure at full strength, which is what was asked.
        result.evaluations = spent;
        return result;
      }
      state = step.state;
      if (k === CONTINUATION_STEPS) result = step;
    }
    result.evaluations = spent;
    return result;
  }

  /**
   * One Newton step with the exact Hessian of the collapse check (the functional is still
   * centred on the solution): BFGS stops once the energy change reaches rounding, with ‖g‖ near
   * 1e-8, and this step brings the gradient — and the virial residual — to the finite-difference
   * noise floor (~1e-10). The energy gain of such a step (~1e-17) is below rounding, so it is
   * kept when it is a small correction and does not raise the energy beyond rounding.
   * Returns the calls spent.
   */
  private polish(out: GroundState): number {
    const { energy, p0, grad } = this;
    p0.fill(0);
    p0[6] = Math.log(out.beta);
    centralGradient(this.objective, p0, 1e-6, grad);
    const inv = this.check.inverse;
    let largest = 0;
    for (let i = 0; i < PARAMETER_COUNT; i++) {
      let step = 0;
      for (let j = 0; j < PARAMETER_COUNT; j++) step -= inv[i * PARAMETER_COUNT + j] * grad[j];
      p0[i] += step;
      largest = Math.max(largest, Math.abs(step));
    }
    const total = energy.evaluate(p0);
    if (largest < POLISH_MAX_STEP && total <= out.energy.total + 1e-14 * Math.abs(out.energy.total)) {
      out.mr = Array.from(energy.mr);
      out.beta = Math.exp(p0[6]);
      out.rbar = energy.rbar;
      out.energy = { total, kinetic: energy.kinetic, trap: energy.trap, direct: energy.direct, exchange: energy.exchange };
    }
    return 2 * PARAMETER_COUNT + 1;
  }

  private attempt(lambda: ArrayLike<number>, e: ArrayLike<number>, epsTilde: number, start: SolverState | null): GroundState {
    const { energy, bfgs, p0 } = this;
    energy.setProblem(lambda, e, epsTilde);
    p0.fill(0);
    if (start) {
      energy.centreOn(start.mr);
      p0[6] = start.b;
    } else {
      energy.centreOnIdealGas();
      // Ideal gas plus the first-order Fermi-surface deformation β − 1 = 2.4 ε̃ (§3.2, §4.1).
      p0[6] = Math.log(1 + 2.4 * epsTilde);
    }
    const run = bfgs.minimise(this.objective, p0, start ? start.inverseHessian : null, this.hopeless);
    const total = energy.evaluate(bfgs.x);
    const b = bfgs.x[6];
    const out: GroundState = {
      stable: false,
      state: null,
      mr: Array.from(energy.mr),
      beta: Math.exp(b),
      rbar: energy.rbar,
      energy: { total, kinetic: energy.kinetic, trap: energy.trap, direct: energy.direct, exchange: energy.exchange },
      minHessianEigenvalue: NaN,
      evaluations: run.evaluations + 1,
    };
    if (run.abandoned) out.reason = `the cloud shrinks without bound (r̄ fell below ${this.rbarFloor.toPrecision(3)})`;
    else if (!Number.isFinite(total)) out.reason = 'the energy is not finite along the descent (runaway towards collapse)';
    else if (run.onBound) out.reason = 'the minimiser ran to the edge of the parameter box (runaway towards collapse)';
    else if (out.rbar < MIN_RBAR) out.reason = `the cloud shrinks without bound (r̄ = ${out.rbar.toPrecision(3)} < ${MIN_RBAR})`;
    else if (run.gradInf > STATIONARY_GRADIENT) out.reason = 'no stationary point of the energy was found';
    else {
      out.evaluations += 99;
      out.stable = this.check.run(energy, out.mr, b);
      out.minHessianEigenvalue = this.check.minEigenvalue;
      if (out.stable) {
        out.evaluations += this.polish(out);
        out.state = { mr: out.mr, b: Math.log(out.beta), inverseHessian: Array.from(this.check.inverse) };
      } else out.reason = `the stationary point is not a minimum (smallest Hessian eigenvalue ${out.minHessianEigenvalue.toPrecision(3)})`;
    }
    return out;
  }
}
