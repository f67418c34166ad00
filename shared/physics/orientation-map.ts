import { criticalEpsDd } from './critical.js';
import { GroundStateSolver, type SolverState } from './ground-state.js';
import { PhysicsInputError } from './input-error.js';
import { sampleScales, type SampleParams } from './sample.js';
import { expandedMetric, imagingPlane, momentumMetric, projectEllipse, type ImagingInput } from './tof.js';

/** β = K∥/K⊥; principal TOF aspect ratio; ε_dd/ε_dd,crit. */
export type MapQuantity = 'fermiSurfaceAspect' | 'tofAspect' | 'collapseRatio';

export interface OrientationMapOptions {
  quantity: MapQuantity;
  /** Requested grid step, degrees (0 < step ≤ 45); rounded so that 90° is a whole number of steps. */
  resolutionDeg: number;
  /** Expansion time for 'tofAspect', ms. */
  tofMs?: number;
  /** Camera geometry for 'tofAspect' (default "y"). */
  imaging?: ImagingInput;
  /** Called after each computed row with the finished fraction (0…1]. */
  onProgress?: (fraction: number) => void;
  /** Asked after every direction; returning true stops the computation. */
  shouldStop?: () => boolean;
}

export interface OrientationMap {
  /** Polar angles of the grid rows, 0…180° inclusive. */
  thetaDeg: number[];
  /** Azimuths of the grid columns, 0…360° inclusive (the last column repeats the first). */
  phiDeg: number[];
  /** Row-major [theta][phi]; NaN where collapsed (or not reached when cancelled). */
  values: Float64Array;
  cancelled: boolean;
  /** Dipolar strength of the sample. */
  epsDd: number;
}

/**
 * Relative precision of ε_dd,crit in the map: a colour scale needs three digits. Neighbouring
 * directions 2° apart differ by a few 1e-3, so the search starts just under the neighbour's
 * value with steps of the same size.
 */
const MAP_CRITICAL_TOLERANCE = 1e-3;
const NEIGHBOUR_STEP = 1 + 3 * MAP_CRITICAL_TOLERANCE;

/**
 * A quantity over all field directions (physics.md §5). The gas in an orthorhombic trap is
 * symmetric under e → −e and under the three mirror planes of the trap, so only the octant
 * θ, φ ∈ [0°, 90°] is solved and the sphere is filled by mirroring. The octant is walked row by
 * row in a serpentine, each solve warm-started from its neighbour, so a direction costs a few
 * quasi-Newton steps plus the stability Hessian. Synchronous: run it in a worker.
 */
export function computeOrientationMap(params: SampleParams, opts: OrientationMapOptions): OrientationMap {
  const scales = sampleScales(params);
  const { quantity } = opts;
  if (!['fermiSurfaceAspect', 'tofAspect', 'collapseRatio'].includes(quantity)) {
    throw new PhysicsInputError(`quantity must be fermiSurfaceAspect, tofAspect or collapseRatio (got ${quantity})`);
  }
  if (!(opts.resolutionDeg > 0 && opts.resolutionDeg <= 45)) {
    throw new PhysicsInputError(`resolutionDeg must lie in (0, 45] degrees (got ${opts.resolutionDeg})`);
  }
  const tofMs = opts.tofMs ?? NaN;
  if (quantity === 'tofAspect' && !(tofMs >= 0 && Number.isFinite(tofMs))) {
    throw new PhysicsInputError(`tofMs must be a finite time ≥ 0 in ms for the tofAspect map (got ${opts.tofMs})`);
  }
  const plane = imagingPlane(opts.imaging ?? 'y');
  const steps = Math.max(2, Math.round(90 / opts.resolutionDeg));
  const step = 90 / steps;
  const { lambda, epsDd } = scales;
  const omegaBarT = scales.omegaBar * tofMs * 1e-3;

  // Octant values oct[i·(steps+1) + j] at θ = i·step, φ = j·step.
  const octant = new Float64Array((steps + 1) * (steps + 1)).fill(NaN);
  const solver = new GroundStateSolver();
  const e = new Float64Array(3);
  const mk = new Float64Array(9);
  const m = new Float64Array(9);
  let warm: SolverState | null = null;
  let criticalHint: { eps: number; state: SolverState | null } | null = null;
  let cancelled = false;

  const valueAt = (): number => {
    if (quantity === 'collapseRatio') {
      const c = criticalHint && criticalHint.state && Number.isFinite(criticalHint.eps)
        ? criticalEpsDd(solver, lambda, e, { tolerance: MAP_CRITICAL_TOLERANCE, startEpsDd: criticalHint.eps / NEIGHBOUR_STEP, startState: criticalHint.state, growth: NEIGHBOUR_STEP })
        : criticalEpsDd(solver, lambda, e, { tolerance: MAP_CRITICAL_TOLERANCE });
      criticalHint = { eps: c.epsDdCritical, state: c.state };
      return epsDd / c.epsDdCritical;
    }
    const gs = solver.solve(lambda, e, epsDd, warm);
    if (!gs.stable) return NaN;
    warm = gs.state;
    if (quantity === 'fermiSurfaceAspect') return gs.beta;
    momentumMetric(gs.beta, gs.rbar, e, mk);
    expandedMetric(gs.mr, mk, omegaBarT, m);
    return projectEllipse(m, plane).aspectRatio;
  };

  outer: for (let i = 0; i <= steps; i++) {
    const theta = (i * step * Math.PI) / 180;
    // At θ = 0 every azimuth is the same direction.
    const count = i === 0 ? 1 : steps + 1;
    for (let n = 0; n < count; n++) {
      const j = i % 2 === 0 ? n : steps - n;
      const phi = (j * step * Math.PI) / 180;
      e[0] = Math.sin(theta) * Math.cos(phi);
      e[1] = Math.sin(theta) * Math.sin(phi);
      e[2] = Math.cos(theta);
      octant[i * (steps + 1) + j] = valueAt();
      if (opts.shouldStop?.()) {
        cancelled = true;
        break outer;
      }
    }
    if (i === 0) octant.fill(octant[0], 0, steps + 1);
    opts.onProgress?.((i + 1) / (steps + 1));
  }

  const thetaDeg = Array.from({ length: 2 * steps + 1 }, (_, k) => k * step);
  const phiDeg = Array.from({ length: 4 * steps + 1 }, (_, k) => k * step);
  const values = new Float64Array(thetaDeg.length * phiDeg.length);
  for (let r = 0; r < thetaDeg.length; r++) {
    const i = r <= steps ? r : 2 * steps - r;
    for (let c = 0; c < phiDeg.length; c++) {
      // φ and φ + 180° mirror into each other (x, y → −x, −y), as do φ and 180° − φ.
      const folded = c % (2 * steps);
      const j = folded <= steps ? folded : 2 * steps - folded;
      values[r * phiDeg.length + c] = octant[i * (steps + 1) + j];
    }
  }
  return { thetaDeg, phiDeg, values, cancelled, epsDd };
}
