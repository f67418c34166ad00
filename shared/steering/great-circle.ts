import type { Vec3 } from '../field/field-vector.js';

const DEG = 180 / Math.PI;

/** Unit vector of `v`, or null when |v| is zero (no direction). */
export function unit(v: Vec3): Vec3 | null {
  const n = Math.hypot(v.x, v.y, v.z);
  return n > 0 && Number.isFinite(n) ? { x: v.x / n, y: v.y / n, z: v.z / n } : null;
}

/**
 * Central angle between two directions, radians (0…π): atan2(|a×b|, a·b), which stays exact
 * near 0 and π where the spherical law of cosines (acos of the dot product) loses digits.
 */
export function centralAngle(a: Vec3, b: Vec3): number {
  const cross = Math.hypot(a.y * b.z - a.z * b.y, a.z * b.x - a.x * b.z, a.x * b.y - a.y * b.x);
  return Math.atan2(cross, a.x * b.x + a.y * b.y + a.z * b.z);
}

/** Central angle in degrees. */
export function centralAngleDeg(a: Vec3, b: Vec3): number {
  return centralAngle(a, b) * DEG;
}

/**
 * A unit vector perpendicular to `a`: the great circle through two opposite directions is not
 * unique, so the path turns through this one (the trap axis least aligned with `a`, made
 * perpendicular), chosen the same way every time.
 */
function perpendicular(a: Vec3): Vec3 {
  const ax = Math.abs(a.x);
  const ay = Math.abs(a.y);
  const az = Math.abs(a.z);
  const axis: Vec3 = ax <= ay && ax <= az ? { x: 1, y: 0, z: 0 } : ay <= az ? { x: 0, y: 1, z: 0 } : { x: 0, y: 0, z: 1 };
  const dot = axis.x * a.x + axis.y * a.y + axis.z * a.z;
  return unit({ x: axis.x - dot * a.x, y: axis.y - dot * a.y, z: axis.z - dot * a.z }) as Vec3;
}

/** Below this central angle (rad) the two directions count as the same. */
const SAME_DIRECTION_RAD = 1e-12;

/**
 * Spherical linear interpolation between unit vectors `a` and `b` at fraction `t` (0…1):
 * slerp(a, b; t) = sin((1 − t)Ω)/sin Ω · a + sin(tΩ)/sin Ω · b with Ω the central angle
 * (Shoemake 1985, "Animating rotation with quaternion curves", SIGGRAPH '85, the same formula
 * written for points on a sphere). The result moves along the shorter great-circle arc at a
 * constant angular rate: its angle from `a` is t·Ω. For opposite directions it turns through
 * the half circle that passes `perpendicular(a)`.
 */
export function slerp(a: Vec3, b: Vec3, t: number): Vec3 {
  const omega = centralAngle(a, b);
  if (omega < SAME_DIRECTION_RAD) return { ...a };
  if (Math.PI - omega < 1e-9) {
    // Half turn a → p → −a in the plane of a and p.
    const p = perpendicular(a);
    const angle = t * Math.PI;
    const c = Math.cos(angle);
    const s = Math.sin(angle);
    return { x: c * a.x + s * p.x, y: c * a.y + s * p.y, z: c * a.z + s * p.z };
  }
  const s = Math.sin(omega);
  const wa = Math.sin((1 - t) * omega) / s;
  const wb = Math.sin(t * omega) / s;
  return { x: wa * a.x + wb * b.x, y: wa * a.y + wb * b.y, z: wa * a.z + wb * b.z };
}

/**
 * The field on the way from `from` to `to` (trap-frame vectors, G) at fraction `t` (0…1): the
 * direction turns along the shorter great circle at a constant rate and the magnitude changes
 * linearly in `t`. A zero end keeps the direction of the other end.
 */
export function fieldAlongPath(from: Vec3, to: Vec3, t: number): Vec3 {
  const f = Math.min(1, Math.max(0, t));
  const m0 = Math.hypot(from.x, from.y, from.z);
  const m1 = Math.hypot(to.x, to.y, to.z);
  const magnitude = m0 + (m1 - m0) * f;
  const u0 = unit(from);
  const u1 = unit(to);
  const direction = u0 && u1 ? slerp(u0, u1, f) : (u1 ?? u0);
  if (!direction) return { x: 0, y: 0, z: 0 };
  return { x: magnitude * direction.x, y: magnitude * direction.y, z: magnitude * direction.z };
}
