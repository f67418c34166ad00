import type { CalibrationBody } from './calibration.js';

export interface Vec3 { x: number; y: number; z: number }

/** The field in the trap frame. Angles are null when |B| is below `ZERO_FIELD_GAUSS`. */
export interface FieldState {
  /** Field vector, G, trap frame. */
  vector: Vec3;
  /** |B|, G. */
  magnitude: number;
  /** Polar angle from the trap z axis, 0…180°. */
  thetaDeg: number | null;
  /** Azimuth from the trap x axis towards y, 0…360° (0 when θ is 0° or 180°). */
  phiDeg: number | null;
}

/** Below this magnitude (G) the direction is undefined. */
export const ZERO_FIELD_GAUSS = 1e-9;
const DEG = 180 / Math.PI;

/** B_trap = R·(K·I + B0); currents in A, result in G (docs/field-math.md). */
export function fieldVector(cal: CalibrationBody, currentA: Vec3): Vec3 {
  const i = [currentA.x, currentA.y, currentA.z];
  const coil = [0, 0, 0];
  for (let r = 0; r < 3; r++) {
    coil[r] = cal.offsetGauss[r];
    for (let c = 0; c < 3; c++) coil[r] += cal.gaussPerAmp[r][c] * i[c];
  }
  const m = cal.coilToTrap;
  return {
    x: m[0][0] * coil[0] + m[0][1] * coil[1] + m[0][2] * coil[2],
    y: m[1][0] * coil[0] + m[1][1] * coil[1] + m[1][2] * coil[2],
    z: m[2][0] * coil[0] + m[2][1] * coil[1] + m[2][2] * coil[2],
  };
}

/** Magnitude and spherical angles of a trap-frame vector (conventions: docs/field-math.md). */
export function fieldAngles(b: Vec3): FieldState {
  const magnitude = Math.hypot(b.x, b.y, b.z);
  if (!(magnitude > ZERO_FIELD_GAUSS)) {
    return { vector: b, magnitude, thetaDeg: null, phiDeg: null };
  }
  const thetaDeg = Math.acos(Math.min(1, Math.max(-1, b.z / magnitude))) * DEG;
  const transverse = Math.hypot(b.x, b.y);
  let phiDeg = transverse > ZERO_FIELD_GAUSS * 1e-3 ? Math.atan2(b.y, b.x) * DEG : 0;
  if (phiDeg < 0) phiDeg += 360;
  if (phiDeg >= 360) phiDeg -= 360;
  return { vector: b, magnitude, thetaDeg, phiDeg };
}

/** Field state for a set of coil currents through a calibration. */
export function fieldFromCurrents(cal: CalibrationBody, currentA: Vec3): FieldState {
  return fieldAngles(fieldVector(cal, currentA));
}

/**
 * Currents that produce the trap-frame field `b` (G): I = K⁻¹·(Rᵀ·b − B0).
 * Throws when K is singular. Used by the demo program and by steering.
 */
export function currentsForField(cal: CalibrationBody, b: Vec3): Vec3 {
  const m = cal.coilToTrap;
  const coil = [0, 1, 2].map((r) => m[0][r] * b.x + m[1][r] * b.y + m[2][r] * b.z - cal.offsetGauss[r]);
  const k = cal.gaussPerAmp;
  const det =
    k[0][0] * (k[1][1] * k[2][2] - k[1][2] * k[2][1]) -
    k[0][1] * (k[1][0] * k[2][2] - k[1][2] * k[2][0]) +
    k[0][2] * (k[1][0] * k[2][1] - k[1][1] * k[2][0]);
  if (Math.abs(det) < 1e-12) throw new Error('calibration matrix K is singular');
  const inv = [
    [k[1][1] * k[2][2] - k[1][2] * k[2][1], k[0][2] * k[2][1] - k[0][1] * k[2][2], k[0][1] * k[1][2] - k[0][2] * k[1][1]],
    [k[1][2] * k[2][0] - k[1][0] * k[2][2], k[0][0] * k[2][2] - k[0][2] * k[2][0], k[0][2] * k[1][0] - k[0][0] * k[1][2]],
    [k[1][0] * k[2][1] - k[1][1] * k[2][0], k[0][1] * k[2][0] - k[0][0] * k[2][1], k[0][0] * k[1][1] - k[0][1] * k[1][0]],
  ];
  const out = [0, 1, 2].map((r) => (inv[r][0] * coil[0] + inv[r][1] * coil[1] + inv[r][2] * coil[2]) / det);
  return { x: out[0], y: out[1], z: out[2] };
}

/** Unit vector for trap-frame angles in degrees. */
export function directionFromAngles(thetaDeg: number, phiDeg: number): Vec3 {
  const t = thetaDeg / DEG;
  const p = phiDeg / DEG;
  return { x: Math.sin(t) * Math.cos(p), y: Math.sin(t) * Math.sin(p), z: Math.cos(t) };
}
