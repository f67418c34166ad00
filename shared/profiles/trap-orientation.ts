import type { CalibrationBody } from '../field/calibration.js';
import { fieldFromCurrents, type FieldState, type Vec3 } from '../field/field-vector.js';
import type { SampleProfile } from './sample-profile.js';

type Matrix3 = CalibrationBody['coilToTrap'];

const RAD = Math.PI / 180;

/**
 * Rotation taking trap-frame components to coil-frame components, v_coil = M·v_trap, from
 * z-y-z Euler angles in degrees: M = Rz(α)·Ry(β)·Rz(γ). Its columns are the trap axes written
 * in the coil frame. Row-major like the calibration's coilToTrap.
 */
export function trapToCoilMatrix([alphaDeg, betaDeg, gammaDeg]: readonly [number, number, number]): Matrix3 {
  const [ca, sa] = [Math.cos(alphaDeg * RAD), Math.sin(alphaDeg * RAD)];
  const [cb, sb] = [Math.cos(betaDeg * RAD), Math.sin(betaDeg * RAD)];
  const [cg, sg] = [Math.cos(gammaDeg * RAD), Math.sin(gammaDeg * RAD)];
  return [
    [ca * cb * cg - sa * sg, -ca * cb * sg - sa * cg, ca * sb],
    [sa * cb * cg + ca * sg, -sa * cb * sg + ca * cg, sa * sb],
    [-sb * cg, sb * sg, cb],
  ];
}

/**
 * The profile's coil→trap rotation (B_trap = M·B_coil, the calibration's coilToTrap
 * convention): the transpose of trapToCoil. Identity when the profile gives no orientation.
 */
export function profileCoilToTrap(profile: Pick<SampleProfile, 'trapToCoilEulerDeg'>): Matrix3 {
  const m = trapToCoilMatrix(profile.trapToCoilEulerDeg ?? [0, 0, 0]);
  return [
    [m[0][0], m[1][0], m[2][0]],
    [m[0][1], m[1][1], m[2][1]],
    [m[0][2], m[1][2], m[2][2]],
  ];
}

/**
 * The field the prediction sees, in the profile's trap frame (G and degrees): the
 * calibration's K and B0 make the coil-frame field, the profile's orientation rotates it
 * (sample-profile.ts explains why the profile, not the calibration, owns this rotation).
 */
export function profileTrapField(
  calibration: Pick<CalibrationBody, 'gaussPerAmp' | 'offsetGauss'>,
  profile: Pick<SampleProfile, 'trapToCoilEulerDeg'>,
  currentA: Vec3,
): FieldState {
  return fieldFromCurrents({ gaussPerAmp: calibration.gaussPerAmp, offsetGauss: calibration.offsetGauss, coilToTrap: profileCoilToTrap(profile) }, currentA);
}
