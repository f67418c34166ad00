import { symmetricEigen3 } from './symmetric-eigen.js';

type Vec3 = [number, number, number];

/** The real-space Thomas–Fermi ellipsoid in the trap frame (docs/physics.md §5.2). */
export interface CloudShape {
  /** Semi-axes R1 ≥ R2 ≥ R3, μm. */
  radiiUm: Vec3;
  /** Unit vectors of the axes, same order; the largest-magnitude component is positive. */
  axes: Vec3[];
  /** Angle of each axis to the field direction, degrees in 0…90. */
  axisAnglesToFieldDeg: number[];
  /** R1/R2, R1/R3, R2/R3. */
  aspectRatios: { r1OverR2: number; r1OverR3: number; r2OverR3: number };
  /**
   * Angle of each axis from its nearest trap axis, degrees; meaningful only where that radius
   * is non-degenerate (with two equal radii any rotation in their plane is equivalent).
   */
  misalignmentDeg: number[];
  /** √(M_R)_aa along the trap axes x, y, z divided by the ideal-gas radius (magnetostriction). */
  magnetostriction: Vec3;
}

const DEG = 180 / Math.PI;

/**
 * Principal axes of M_R = R̄0² M_r. `mr` is M_r (row-major 3×3, units of R̄0²), `e` the unit
 * field direction, `lambda` the trap anisotropies (ideal radii R̄0/λ_a), `rbar0Um` R̄0 in μm.
 */
export function cloudShape(mr: ArrayLike<number>, e: ArrayLike<number>, lambda: ArrayLike<number>, rbar0Um: number): CloudShape {
  const values = new Float64Array(3);
  const vectors = new Float64Array(9);
  symmetricEigen3(mr, values, vectors);
  const order = [0, 1, 2].sort((a, b) => values[b] - values[a]);
  const axes = order.map((k): Vec3 => {
    const v: Vec3 = [vectors[k], vectors[3 + k], vectors[6 + k]];
    const big = v.reduce((best, c) => (Math.abs(c) > Math.abs(best) ? c : best), 0);
    return big < 0 ? [-v[0], -v[1], -v[2]] : v;
  });
  const radiiUm = order.map((k) => rbar0Um * Math.sqrt(values[k])) as Vec3;
  const angle = (cos: number) => Math.acos(Math.min(1, Math.abs(cos))) * DEG;
  return {
    radiiUm,
    axes,
    axisAnglesToFieldDeg: axes.map((a) => angle(a[0] * e[0] + a[1] * e[1] + a[2] * e[2])),
    aspectRatios: { r1OverR2: radiiUm[0] / radiiUm[1], r1OverR3: radiiUm[0] / radiiUm[2], r2OverR3: radiiUm[1] / radiiUm[2] },
    misalignmentDeg: axes.map((a) => angle(Math.max(Math.abs(a[0]), Math.abs(a[1]), Math.abs(a[2])))),
    magnetostriction: [0, 1, 2].map((a) => Math.sqrt(mr[4 * a]) * lambda[a]) as Vec3,
  };
}
