import { directionFromAngles } from '../../shared/field/field-vector.js';

/** A field direction in the profile's trap frame: the angles as measured and the unit vector. */
export interface FieldDirection {
  thetaDeg: number;
  phiDeg: number;
  unit: [number, number, number];
}

const DEG = 180 / Math.PI;

/** Direction from trap-frame angles in degrees; throws when an angle is not finite. */
export function fieldDirectionOf(thetaDeg: number, phiDeg: number): FieldDirection {
  if (!Number.isFinite(thetaDeg) || !Number.isFinite(phiDeg)) {
    throw new Error(`the field direction needs finite thetaDeg and phiDeg in degrees (got ${thetaDeg}, ${phiDeg})`);
  }
  const d = directionFromAngles(thetaDeg, phiDeg);
  return { thetaDeg, phiDeg, unit: [d.x, d.y, d.z] };
}

/**
 * Angle between two dipole directions in degrees, 0…90: e and −e are the same direction
 * (the dipolar interaction is even in e). atan2(|a×b|, |a·b|) stays exact for tiny angles,
 * where acos loses half the digits.
 */
export function axialAngleDeg(a: FieldDirection, b: FieldDirection): number {
  const [ax, ay, az] = a.unit;
  const [bx, by, bz] = b.unit;
  const cross = Math.hypot(ay * bz - az * by, az * bx - ax * bz, ax * by - ay * bx);
  return Math.atan2(cross, Math.abs(ax * bx + ay * by + az * bz)) * DEG;
}

/** One cell of the direction grid on which ε_dd,crit is cached. */
export interface DirectionBucket {
  /** Stable name of the cell, e.g. "35/41". */
  key: string;
  /** Centre of the cell: the direction ε_dd,crit is computed for. */
  centre: FieldDirection;
}

/**
 * The grid cell of a direction on the upper hemisphere (e ≡ −e): rings of polar angle
 * `stepDeg` apart, each split into cells about `stepDeg` wide, so cells have nearly equal
 * size from the pole to the equator. On the equator e and −e both lie on the ring, so it
 * only spans 180° of azimuth.
 */
export function directionBucket(direction: FieldDirection, stepDeg: number): DirectionBucket {
  let [x, y, z] = direction.unit;
  if (z < 0) [x, y, z] = [-x, -y, -z];
  const thetaDeg = Math.atan2(Math.hypot(x, y), z) * DEG;
  let phiDeg = Math.atan2(y, x) * DEG;
  if (phiDeg < 0) phiDeg += 360;
  const ring = Math.round(thetaDeg / stepDeg);
  const ringTheta = Math.min(90, ring * stepDeg);
  const onEquator = ringTheta === 90;
  const span = onEquator ? 180 : 360;
  const cells = ring === 0 ? 1 : Math.max(1, Math.round((span * Math.sin(ringTheta / DEG)) / stepDeg));
  const width = span / cells;
  const cell = Math.round((phiDeg % span) / width) % cells;
  return { key: `${ring}/${cell}`, centre: fieldDirectionOf(ringTheta, cell * width) };
}
