import type { CalibrationBody } from './calibration.js';
import { fieldFromCurrents, type FieldState, type Vec3 } from './field-vector.js';

/** How the field reading at one set of currents changes from one calibration to another. */
export interface CalibrationShift {
  from: FieldState;
  to: FieldState;
  /** to − from, G. */
  magnitudeGauss: number;
  /** to − from, degrees; null when either direction is undefined. */
  thetaDeg: number | null;
  /** to − from wrapped into (−180°, 180°]; null when either azimuth is undefined. */
  phiDeg: number | null;
  /** Angle between the two field directions, degrees; null when either is undefined. */
  directionDeg: number | null;
}

const DEG = 180 / Math.PI;

/** The field at `currentA` through both calibrations and how far |B|, θ, φ and the direction move. */
export function calibrationShift(from: CalibrationBody, to: CalibrationBody, currentA: Vec3): CalibrationShift {
  const a = fieldFromCurrents(from, currentA);
  const b = fieldFromCurrents(to, currentA);
  const defined = a.thetaDeg !== null && b.thetaDeg !== null;
  let phi = defined ? b.phiDeg! - a.phiDeg! : null;
  if (phi !== null) phi = phi - 360 * Math.round(phi / 360);
  if (phi === -180) phi = 180;
  const cos = defined ? (a.vector.x * b.vector.x + a.vector.y * b.vector.y + a.vector.z * b.vector.z) / (a.magnitude * b.magnitude) : null;
  return {
    from: a,
    to: b,
    magnitudeGauss: b.magnitude - a.magnitude,
    thetaDeg: defined ? b.thetaDeg! - a.thetaDeg! : null,
    phiDeg: phi,
    directionDeg: cos === null ? null : Math.acos(Math.min(1, Math.max(-1, cos))) * DEG,
  };
}
