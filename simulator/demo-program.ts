import { DEMO_CALIBRATION } from '../shared/field/demo-calibration.js';
import { currentsForField, directionFromAngles, type Vec3 } from '../shared/field/field-vector.js';

/**
 * The demo program of the fictional Lindqvist Hall apparatus: when nothing else steers the
 * controller it turns a field of constant magnitude slowly through the trap frame, so a
 * newcomer sees moving data. θ swings between 10° and 90° over three minutes while φ turns
 * once every five minutes.
 */
export const DEMO_FIELD_GAUSS = 8;
const THETA_CENTRE_DEG = 50;
const THETA_SWING_DEG = 40;
const THETA_PERIOD_S = 180;
const PHI_PERIOD_S = 300;

/** Trap-frame angles (degrees) of the demo field `elapsedS` seconds into the program. */
export function demoAngles(elapsedS: number): { thetaDeg: number; phiDeg: number } {
  const thetaDeg = THETA_CENTRE_DEG + THETA_SWING_DEG * Math.sin((2 * Math.PI * elapsedS) / THETA_PERIOD_S);
  const phiDeg = (((360 * elapsedS) / PHI_PERIOD_S) % 360 + 360) % 360;
  return { thetaDeg, phiDeg };
}

/** Coil current setpoints (A) that give the demo field `elapsedS` seconds into the program. */
export function demoSetpoints(elapsedS: number): Vec3 {
  const { thetaDeg, phiDeg } = demoAngles(elapsedS);
  const unit = directionFromAngles(thetaDeg, phiDeg);
  return currentsForField(DEMO_CALIBRATION, {
    x: DEMO_FIELD_GAUSS * unit.x,
    y: DEMO_FIELD_GAUSS * unit.y,
    z: DEMO_FIELD_GAUSS * unit.z,
  });
}
