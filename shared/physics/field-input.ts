import { directionFromAngles } from '../field/field-vector.js';
import { PhysicsInputError } from './input-error.js';

/** Field direction in the trap frame: polar/azimuth angles (degrees) or any non-zero vector. */
export type FieldInput = { thetaDeg: number; phiDeg: number } | { x: number; y: number; z: number };

/**
 * Unit dipole direction e = (sinθ cosφ, sinθ sinφ, cosθ) in the trap frame (θ from z, φ from x
 * towards y; docs/physics.md §5). e and −e are equivalent. Throws PhysicsInputError for non-finite
 * angles or a zero / non-finite vector.
 */
export function fieldDirection(field: FieldInput): [number, number, number] {
  if (field && 'thetaDeg' in field) {
    const { thetaDeg, phiDeg } = field;
    if (!Number.isFinite(thetaDeg)) throw new PhysicsInputError(`thetaDeg must be a finite angle in degrees (got ${thetaDeg})`);
    if (!Number.isFinite(phiDeg)) throw new PhysicsInputError(`phiDeg must be a finite angle in degrees (got ${phiDeg})`);
    const d = directionFromAngles(thetaDeg, phiDeg);
    return [d.x, d.y, d.z];
  }
  if (!field || !Number.isFinite(field.x) || !Number.isFinite(field.y) || !Number.isFinite(field.z)) {
    throw new PhysicsInputError('the field must be {thetaDeg, phiDeg} or a vector {x, y, z} of finite numbers');
  }
  const n = Math.hypot(field.x, field.y, field.z);
  if (!(n > 0)) throw new PhysicsInputError('the field vector is zero, so it defines no dipole direction');
  return [field.x / n, field.y / n, field.z / n];
}
