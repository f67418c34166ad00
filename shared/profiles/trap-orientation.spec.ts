import { describe, expect, it } from 'vitest';
import { DEMO_CALIBRATION } from '../field/demo-calibration.js';
import { fieldFromCurrents } from '../field/field-vector.js';
import { assertRotation } from '../field/calibration.js';
import { DEMO_PROFILE } from './demo-profile.js';
import { profileCoilToTrap, profileTrapField, trapToCoilMatrix } from './trap-orientation.js';

const close = (a: number[][], b: number[][]) => a.forEach((row, i) => row.forEach((v, j) => expect(v).toBeCloseTo(b[i][j], 12)));

describe('trap orientation', () => {
  it('builds proper rotations from z-y-z Euler angles whose columns are the trap axes in the coil frame', () => {
    const m = trapToCoilMatrix([30, 50, -70]);
    expect(() => assertRotation(m)).not.toThrow();
    // α = β = 90°: the trap z axis (third column) points along coil y, the trap x axis along coil −z.
    close(trapToCoilMatrix([90, 90, 0]), [[0, -1, 0], [0, 0, 1], [-1, 0, 0]]);
    close(trapToCoilMatrix([0, 0, 0]), [[1, 0, 0], [0, 1, 0], [0, 0, 1]]);
  });

  it('gives the demo profile the demo calibration’s coil-to-trap rotation', () => {
    close(profileCoilToTrap(DEMO_PROFILE), DEMO_CALIBRATION.coilToTrap);
    close(profileCoilToTrap({}), [[1, 0, 0], [0, 1, 0], [0, 0, 1]]);
  });

  it('rotates the calibrated coil field with the profile’s orientation', () => {
    const currents = { x: 0.3, y: -1.2, z: 4 };
    const viaCalibration = fieldFromCurrents(DEMO_CALIBRATION, currents);
    const viaProfile = profileTrapField(DEMO_CALIBRATION, DEMO_PROFILE, currents);
    expect(viaProfile.thetaDeg).toBeCloseTo(viaCalibration.thetaDeg as number, 10);
    expect(viaProfile.phiDeg).toBeCloseTo(viaCalibration.phiDeg as number, 10);
    // Trap tilted by 90° about the coil y axis: the coil-z field lies along the trap's −x axis.
    const tilted = profileTrapField({ gaussPerAmp: [[1, 0, 0], [0, 1, 0], [0, 0, 1]], offsetGauss: [0, 0, 0] }, { trapToCoilEulerDeg: [0, 90, 0] }, { x: 0, y: 0, z: 2 });
    expect(tilted.vector.x).toBeCloseTo(-2, 12);
    expect(tilted.thetaDeg).toBeCloseTo(90, 10);
    expect(tilted.phiDeg).toBeCloseTo(180, 10);
  });
});
