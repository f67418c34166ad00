import type { GroundStateSolver, SolverState } from './ground-state.js';

export interface CriticalOptions {
  /** Relative width of the final bracket (default 1e-6, docs/physics.md §4.2). */
  tolerance?: number;
  /** First probe (dimensionless ε_dd, default 0.25) and the stable state to start it from. */
  startEpsDd?: number;
  startState?: SolverState | null;
  /**
   * Factor of the first scan step (default 1.25). Successive steps in the same direction
   * square it, up to 1.25, so a close hint costs little and a poor one does not crawl.
   */
  growth?: number;
}

export interface CriticalResult {
  /** Critical ε_dd (Infinity when still stable at 1e4, 0 when no strength down to 1e-3 is stable). */
  epsDdCritical: number;
  /** The stable state at the bracket's lower end: a good start for a neighbouring direction. */
  state: SolverState | null;
  evaluations: number;
}

const MAX_EPS_DD = 1e4;
const MIN_EPS_DD = 1e-3;
const MAX_GROWTH = 1.25;
const DOWNWARD_WARM_PROBES = 3;
/** Probes start next to a minimum; halving r̄ on the way can only be the collapse runaway. */
const RUNAWAY_SHRINK = 0.5;

/**
 * Critical dipolar strength ε_dd,c for trap anisotropies λ and field direction e
 * (docs/physics.md §4.2–4.3): probes in ε_dd, each a full solve with the Hessian check,
 * warm-started from the highest stable strength so far so that they follow the metastable
 * branch to its end, until stable and collapsed probes bracket ε_c to the tolerance.
 *
 * The probe points come from the fold itself: at a saddle-node the smallest Hessian
 * eigenvalue vanishes like √(ε_c − ε) (§4.3), so its square is linear in ε near ε_c, and the
 * secant through the last two stable probes predicts ε_c. The prediction is kept inside the
 * bracket (bisection otherwise) and capped at the scan step above the last stable strength, so the
 * method degrades to the scan-and-bisection of §4.2 and never relies on the extrapolation.
 * ε_c depends only on (λ, e); the critical atom number is N_crit = N (ε_c/ε_dd)⁶.
 */
export function criticalEpsDd(solver: GroundStateSolver, lambda: ArrayLike<number>, e: ArrayLike<number>, options: CriticalOptions = {}): CriticalResult {
  const tol = options.tolerance ?? 1e-6;
  let growth = Math.min(options.growth ?? MAX_GROWTH, MAX_GROWTH);
  const widen = () => {
    growth = Math.min(growth * growth, MAX_GROWTH);
  };
  let evaluations = 0;
  let softest = NaN;
  const probe = (eps: number, from: SolverState | null) => {
    const r = solver.solve(lambda, e, eps, from, from ? { retry: false, runawayShrink: RUNAWAY_SHRINK } : {});
    evaluations += r.evaluations;
    softest = r.minHessianEigenvalue;
    return r.stable ? r.state : null;
  };

  // Lower end: the first probe, or — when it is already collapsed — a downward scan. A start
  // state next to a neighbour's threshold stays in the basin a little lower down; after a few
  // failures the scan restarts from the ideal gas instead.
  let lo = options.startEpsDd ?? 0.25;
  let hi = Infinity;
  let loState = probe(lo, options.startState ?? null);
  for (let down = 1; !loState; down++) {
    hi = lo;
    lo /= growth;
    widen();
    if (lo < MIN_EPS_DD) return { epsDdCritical: 0, state: null, evaluations };
    loState = probe(lo, down < DOWNWARD_WARM_PROBES ? (options.startState ?? null) : null);
  }
  // (ε, λ_min²) of the last two stable probes.
  let eps1 = NaN;
  let mu1 = NaN;
  let eps2 = lo;
  let mu2 = softest * softest;
  let lastStable = true;

  while (hi - lo > tol * lo) {
    const predicted = mu1 > mu2 ? eps2 + (mu2 * (eps2 - eps1)) / (mu1 - mu2) : NaN;
    let next: number;
    if (hi === Infinity) {
      next = predicted > lo ? Math.min(predicted, lo * growth) : lo * growth;
      if (next === lo * growth) widen();
    } else if (predicted > lo && predicted < hi) next = predicted;
    // The secant overshoots on the concave branch; just under the collapsed end is the best
    // guess after a stable probe, bisection after a collapsed one.
    else if (predicted >= hi && lastStable) next = Math.max(hi - 0.99 * tol * lo, 0.5 * (lo + hi));
    else next = 0.5 * (lo + hi);
    // A prediction hugging one end would shrink the bracket from that side only: step just
    // past the tolerance instead, so the next probe can close the bracket.
    if (next - lo < 0.5 * tol * lo) next = Math.min(lo * (1 + 0.99 * tol), 0.5 * (lo + hi));
    else if (hi - next < 0.5 * tol * lo) next = Math.max(hi - 0.99 * tol * lo, 0.5 * (lo + hi));
    if (next > MAX_EPS_DD) return { epsDdCritical: Infinity, state: loState, evaluations };
    const s = probe(next, loState);
    lastStable = s !== null;
    if (s) {
      lo = next;
      loState = s;
      eps1 = eps2;
      mu1 = mu2;
      eps2 = next;
      mu2 = softest * softest;
    } else hi = next;
  }
  return { epsDdCritical: 0.5 * (lo + hi), state: loState, evaluations };
}
