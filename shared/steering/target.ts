import type { CalibrationBody } from '../field/calibration.js';
import { currentsForField, directionFromAngles, fieldFromCurrents, type FieldState, type Vec3 } from '../field/field-vector.js';
import { fieldAlongPath } from './great-circle.js';

/** A field target: |B| (G), θ and φ (degrees, trap frame of the calibration) and the ramp time (ms). */
export interface SteerTarget {
  magnitudeG: number;
  thetaDeg: number;
  phiDeg: number;
  rampMs: number;
}

/** Longest ramp accepted, ms (one hour). */
export const MAX_RAMP_MS = 3_600_000;
/** Largest |B| the form accepts at all, G; the apparatus's own range is a pre-flight check. */
export const MAX_TARGET_GAUSS = 1000;

/** The trap-frame field vector (G) of a target. */
export function targetVector(target: Pick<SteerTarget, 'magnitudeG' | 'thetaDeg' | 'phiDeg'>): Vec3 {
  const u = directionFromAngles(target.thetaDeg, target.phiDeg);
  return { x: target.magnitudeG * u.x, y: target.magnitudeG * u.y, z: target.magnitudeG * u.z };
}

/** Coil currents (A) for a target through the calibration: I = K⁻¹·(Rᵀ·B − B0). */
export function targetCurrents(cal: CalibrationBody, target: Pick<SteerTarget, 'magnitudeG' | 'thetaDeg' | 'phiDeg'>): Vec3 {
  return currentsForField(cal, targetVector(target));
}

/** One point of a planned path: time from the start of the ramp, the field and the currents that make it. */
export interface PathPoint {
  tMs: number;
  magnitudeG: number;
  thetaDeg: number | null;
  phiDeg: number | null;
  currentsA: Vec3;
}

/** Largest time between two planned path points, ms. */
export const PATH_STEP_MS = 100;
/** Most points of one planned segment (a longer ramp gets coarser steps). */
export const MAX_PATH_POINTS = 200;

/**
 * The planned path from the field `from` (trap frame, G) to `to` over `rampMs`: points at most
 * `PATH_STEP_MS` apart (at most `MAX_PATH_POINTS`), both ends included, each with the currents
 * the calibration needs for it.
 */
export function planPath(cal: CalibrationBody, from: Vec3, to: Vec3, rampMs: number): PathPoint[] {
  const steps = rampMs <= 0 ? 1 : Math.min(MAX_PATH_POINTS - 1, Math.max(1, Math.ceil(rampMs / PATH_STEP_MS)));
  const points: PathPoint[] = [];
  for (let i = 0; i <= steps; i++) {
    const t = i / steps;
    points.push(pathPoint(cal, fieldAlongPath(from, to, t), t * rampMs));
  }
  return points;
}

/** The path point for the field `b` at `tMs`. */
export function pathPoint(cal: CalibrationBody, b: Vec3, tMs: number): PathPoint {
  const currentsA = currentsForField(cal, b);
  const f: FieldState = fieldFromCurrents(cal, currentsA);
  return { tMs, magnitudeG: f.magnitude, thetaDeg: f.thetaDeg, phiDeg: f.phiDeg, currentsA };
}
