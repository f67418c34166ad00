import { PhysicsInputError } from './input-error.js';

/** Camera axes: a named line of sight or in-plane unit vectors u (horizontal) and v (vertical). */
export type ImagingInput = 'x' | 'y' | 'z' | { u: number[]; v: number[] };

/** Orthonormal image-plane vectors in the trap frame. */
export interface ImagingPlane {
  u: [number, number, number];
  v: [number, number, number];
}

/** One projected cloud (column density), docs/physics.md §6.1. */
export interface ProjectedEllipse {
  /** Major/minor semi-axis ratio of the column-density ellipse, ≥ 1. */
  aspectRatio: number;
  /** Major axis angle from u towards v, degrees in [−90, 90); null when round (AR − 1 < 1e-9). */
  majorAngleDeg: number | null;
  /** Fixed-axis ratio √(S_vv/S_uu), what a fit with axes locked to the camera returns. */
  aspectRatioVOverU: number;
  /** Major and minor Thomas–Fermi semi-axes, in the unit of √M. */
  semiAxes: [number, number];
}

/** Named geometries (docs/physics.md §6.1): "y" → (u, v) = (x, z); "x" → (y, z); "z" → (x, y). */
const NAMED: Record<'x' | 'y' | 'z', ImagingPlane> = {
  x: { u: [0, 1, 0], v: [0, 0, 1] },
  y: { u: [1, 0, 0], v: [0, 0, 1] },
  z: { u: [1, 0, 0], v: [0, 1, 0] },
};

/** Resolves and validates an imaging geometry; u and v are normalised and must be perpendicular. */
export function imagingPlane(imaging: ImagingInput): ImagingPlane {
  if (typeof imaging === 'string') {
    if (!Object.hasOwn(NAMED, imaging)) throw new PhysicsInputError(`imaging must be "x", "y", "z" or {u, v} (got "${imaging}")`);
    return NAMED[imaging];
  }
  const unit = (w: unknown, name: string): [number, number, number] => {
    if (!Array.isArray(w) || w.length !== 3 || !w.every((c) => typeof c === 'number' && Number.isFinite(c))) {
      throw new PhysicsInputError(`imaging.${name} must be a vector of three finite numbers`);
    }
    const n = Math.hypot(w[0], w[1], w[2]);
    if (!(n > 0)) throw new PhysicsInputError(`imaging.${name} must not be the zero vector`);
    return [w[0] / n, w[1] / n, w[2] / n];
  };
  const u = unit(imaging?.u, 'u');
  const v = unit(imaging?.v, 'v');
  if (Math.abs(u[0] * v[0] + u[1] * v[1] + u[2] * v[2]) > 1e-6) throw new PhysicsInputError('imaging.u and imaging.v must be perpendicular');
  return { u, v };
}

/**
 * Momentum metric M_k (row-major 3×3, units of K_F0²) of the spheroidal Fermi surface with
 * long axis e: M_k = k̄²[β^(−2/3) 1 + (β^(4/3) − β^(−2/3)) e eᵀ], k̄ = 1/r̄ (docs/physics.md §3.1).
 */
export function momentumMetric(beta: number, rbar: number, e: ArrayLike<number>, out: Float64Array): void {
  const kbar2 = 1 / (rbar * rbar);
  const perp = kbar2 * Math.pow(beta, -2 / 3);
  const along = kbar2 * Math.pow(beta, 4 / 3) - perp;
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) out[3 * i + j] = (i === j ? perp : 0) + along * e[i] * e[j];
}

/**
 * Ballistic expansion (docs/physics.md §6.1): M(t) = M_r + (ω̄t)² M_k in units of R̄0², exact for
 * the step-function ansatz because the initial state has no r–k correlation.
 */
export function expandedMetric(mr: ArrayLike<number>, mk: ArrayLike<number>, omegaBarT: number, out: Float64Array): void {
  const s = omegaBarT * omegaBarT;
  for (let i = 0; i < 9; i++) out[i] = mr[i] + s * mk[i];
}

/**
 * Column-density ellipse of the cloud with metric M (3×3) in the image plane: S = P M Pᵀ,
 * semi-axes √eig(S), angle of the major axis from u towards v (docs/physics.md §6.1).
 */
export function projectEllipse(m: ArrayLike<number>, plane: ImagingPlane): ProjectedEllipse {
  const quad = (a: number[], b: number[]) => {
    let s = 0;
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) s += a[i] * m[3 * i + j] * b[j];
    return s;
  };
  const suu = quad(plane.u, plane.u);
  const svv = quad(plane.v, plane.v);
  const suv = quad(plane.u, plane.v);
  const mean = 0.5 * (suu + svv);
  const half = Math.hypot(0.5 * (suu - svv), suv);
  const big = mean + half;
  const small = mean - half;
  const aspectRatio = Math.sqrt(big / small);
  let majorAngleDeg: number | null = null;
  if (aspectRatio - 1 >= 1e-9) {
    majorAngleDeg = (0.5 * Math.atan2(2 * suv, suu - svv) * 180) / Math.PI;
    if (majorAngleDeg >= 90) majorAngleDeg -= 180;
  }
  return { aspectRatio, majorAngleDeg, aspectRatioVOverU: Math.sqrt(svv / suu), semiAxes: [Math.sqrt(big), Math.sqrt(small)] };
}
