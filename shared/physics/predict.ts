import { cloudShape, type CloudShape } from './cloud-shape.js';
import { criticalEpsDd, type CriticalOptions } from './critical.js';
import { fieldDirection, type FieldInput } from './field-input.js';
import { GroundStateSolver, type SolverState } from './ground-state.js';
import { PhysicsInputError } from './input-error.js';
import { fermiEnergyNanoKelvin, sampleScales, type SampleParams, type SampleScales } from './sample.js';
import { expandedMetric, imagingPlane, momentumMetric, projectEllipse, type ImagingInput } from './tof.js';

export type { SampleParams } from './sample.js';
export type { FieldInput } from './field-input.js';
export type { ImagingInput } from './tof.js';

/**
 * Opaque state carried from one prediction to the next: the last stable solution (start point
 * and inverse Hessian of the next solve) and the last critical ε_dd with the trap shape and
 * direction it belongs to. Plain data: it survives postMessage and JSON.
 */
export interface WarmStart {
  state: SolverState | null;
  critical?: { key: number[]; epsDdCritical: number; state: SolverState | null };
}

export interface TofPrediction {
  /** Expansion time, ms. */
  tMs: number;
  /** Major/minor ratio of the column-density ellipse. */
  aspectRatio: number;
  /** Major-axis angle from u towards v, degrees in [−90, 90); null when round. */
  majorAngleDeg: number | null;
  /** Fixed-axis ratio √(S_vv/S_uu). */
  aspectRatioVOverU: number;
  /** Major and minor Thomas–Fermi semi-axes of the image, μm. */
  semiAxesUm: [number, number];
}

export interface Prediction {
  stable: boolean;
  /** Why the gas is collapsed (only when not stable). */
  reason?: string;
  /** Dipolar strength ε_dd (physics.md §3.2). */
  epsDd: number;
  /** Critical ε_dd for this trap shape and direction (when asked, and always when collapsed). */
  epsDdCritical?: number;
  /** N_crit = N (ε_c/ε_dd)⁶. */
  atomNumberCritical?: number;
  /** ε_dd/ε_dd,crit (< 1 stable). */
  collapseRatio?: number;
  /** Smallest eigenvalue of the stability Hessian (dimensionless; null when the check was not reached). */
  smallestHessianEigenvalue: number | null;
  fermiSurface: {
    /** β = K∥/K⊥. */
    aspectRatio: number;
    /** (β − 1)·100 %. */
    deformationPercent: number;
    kParallelPerUm: number;
    kPerpPerUm: number;
    kParallelOverKF0: number;
    kPerpOverKF0: number;
  } | null;
  cloud: CloudShape | null;
  /** Energies per particle in units of E_F0. */
  energyPerParticleEF: { total: number; kinetic: number; trap: number; direct: number; exchange: number } | null;
  tof: TofPrediction[] | null;
  /** Ideal-gas scales of the sample. */
  scales: { fermiEnergyNk: number; kF0PerUm: number; idealRadiiUm: [number, number, number]; meanTrapHz: number };
  /** Opaque warm-start state to pass to the next call. */
  warm?: WarmStart;
}

export interface PredictOptions {
  /** Ballistic expansion times, ms (≥ 0). */
  tofMs?: number[];
  /** Camera geometry for the TOF images (default "y"). */
  imaging?: ImagingInput;
  /** Also compute ε_dd,crit and N_crit (cached in `warm` per trap shape and direction). */
  computeCritical?: boolean;
  warm?: WarmStart;
}

/** First step of an ε_c search next to a known threshold (a few 1e-3 between nearby directions). */
const CRITICAL_HINT_STEP = 1.003;

/** One solver per module instance (one per worker): its scratch memory is reused. */
const solver = new GroundStateSolver();

/**
 * Ground-state prediction of the T = 0 Hartree–Fock variational model (physics.md) for a
 * sample and a field direction in the trap frame: Fermi-surface deformation, real-space
 * ellipsoid, energies, stability and ballistic TOF images. Pass the returned `warm` to the
 * next call (e.g. after a small field change) to start from this solution.
 * Throws PhysicsInputError for non-physical input; a collapsed gas returns `stable: false`
 * with the reason and the collapse ratio, and null geometry.
 */
export function predict(params: SampleParams, field: FieldInput, options: PredictOptions = {}): Prediction {
  const scales = sampleScales(params);
  const e = fieldDirection(field);
  const tofMs = options.tofMs ?? [];
  tofMs.forEach((t, i) => {
    if (typeof t !== 'number' || !Number.isFinite(t) || t < 0) throw new PhysicsInputError(`tofMs[${i}] must be a finite time ≥ 0 in ms (got ${t})`);
  });
  const plane = imagingPlane(options.imaging ?? 'y');
  const { lambda, epsDd } = scales;

  const gs = solver.solve(lambda, e, epsDd, options.warm?.state ?? null);
  const warm: WarmStart = { state: gs.stable ? gs.state : (options.warm?.state ?? null), critical: options.warm?.critical };
  const out: Prediction = {
    stable: gs.stable,
    epsDd,
    smallestHessianEigenvalue: Number.isNaN(gs.minHessianEigenvalue) ? null : gs.minHessianEigenvalue,
    fermiSurface: null,
    cloud: null,
    energyPerParticleEF: null,
    tof: null,
    scales: describeScales(scales),
    warm,
  };

  if (options.computeCritical || !gs.stable) {
    const key = [...lambda, ...e];
    let cached = warm.critical;
    if (!cached || cached.key.length !== key.length || cached.key.some((k, i) => k !== key[i])) {
      const c = criticalEpsDd(solver, lambda, e, criticalStart(cached, key, gs.stable ? gs.state : null, epsDd));
      cached = { key, epsDdCritical: c.epsDdCritical, state: c.state };
      warm.critical = cached;
    }
    const epsC = cached.epsDdCritical;
    out.epsDdCritical = epsC;
    out.collapseRatio = epsDd / epsC;
    out.atomNumberCritical = epsDd > 0 ? scales.atomNumber * Math.pow(epsC / epsDd, 6) : Infinity;
  }
  if (!gs.stable) {
    const ratio = out.collapseRatio !== undefined ? `; ε_dd/ε_dd,crit = ${out.collapseRatio.toFixed(4)}` : '';
    out.reason = `collapsed: no metastable state near the ideal gas — ${gs.reason}${ratio}`;
    return out;
  }

  const kbar = 1 / gs.rbar;
  const kF0PerUm = scales.kF0 * 1e-6;
  out.fermiSurface = {
    aspectRatio: gs.beta,
    deformationPercent: (gs.beta - 1) * 100,
    kParallelPerUm: kF0PerUm * kbar * Math.pow(gs.beta, 2 / 3),
    kPerpPerUm: kF0PerUm * kbar * Math.pow(gs.beta, -1 / 3),
    kParallelOverKF0: kbar * Math.pow(gs.beta, 2 / 3),
    kPerpOverKF0: kbar * Math.pow(gs.beta, -1 / 3),
  };
  const rbar0Um = scales.rbar0 * 1e6;
  out.cloud = cloudShape(gs.mr, e, lambda, rbar0Um);
  out.energyPerParticleEF = { ...gs.energy };
  const mk = new Float64Array(9);
  const m = new Float64Array(9);
  momentumMetric(gs.beta, gs.rbar, e, mk);
  out.tof = tofMs.map((tMs) => {
    expandedMetric(gs.mr, mk, scales.omegaBar * tMs * 1e-3, m);
    const img = projectEllipse(m, plane);
    return {
      tMs,
      aspectRatio: img.aspectRatio,
      majorAngleDeg: img.majorAngleDeg,
      aspectRatioVOverU: img.aspectRatioVOverU,
      semiAxesUm: [img.semiAxes[0] * rbar0Um, img.semiAxes[1] * rbar0Um],
    };
  });
  return out;
}

/**
 * Where the ε_c search starts: next to the previous direction's threshold when the trap shape
 * is unchanged (the threshold moves little with a small field step), else from this solution,
 * else from scratch.
 */
function criticalStart(previous: WarmStart['critical'], key: number[], state: SolverState | null, epsDd: number): CriticalOptions {
  const sameTrap = previous && previous.state && Number.isFinite(previous.epsDdCritical) && previous.epsDdCritical > 0 && [0, 1, 2].every((i) => previous.key[i] === key[i]);
  if (sameTrap) return { startEpsDd: previous.epsDdCritical / CRITICAL_HINT_STEP, startState: previous.state, growth: CRITICAL_HINT_STEP };
  return state && epsDd > 0.01 ? { startEpsDd: epsDd, startState: state } : {};
}

function describeScales(s: SampleScales): Prediction['scales'] {
  const r0 = s.rbar0 * 1e6;
  return {
    fermiEnergyNk: fermiEnergyNanoKelvin(s),
    kF0PerUm: s.kF0 * 1e-6,
    idealRadiiUm: [r0 / s.lambda[0], r0 / s.lambda[1], r0 / s.lambda[2]],
    meanTrapHz: s.omegaBar / (2 * Math.PI),
  };
}
