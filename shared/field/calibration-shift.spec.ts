import { describe, expect, it } from 'vitest';
import type { CalibrationBody } from './calibration.js';
import { calibrationShift } from './calibration-shift.js';

const IDENTITY: CalibrationBody['coilToTrap'] = [[1, 0, 0], [0, 1, 0], [0, 0, 1]];
const plain = (k: number, coilToTrap = IDENTITY): CalibrationBody => ({ gaussPerAmp: [[k, 0, 0], [0, k, 0], [0, 0, k]], offsetGauss: [0, 0, 0], coilToTrap });

describe('calibration shift at the present currents', () => {
  it('is zero between equal calibrations and only |B| moves when K scales', () => {
    const s = calibrationShift(plain(1), plain(1.1), { x: 1, y: 1, z: 1 });
    expect(s.magnitudeGauss).toBeCloseTo(0.1 * Math.sqrt(3), 12);
    expect(s.thetaDeg).toBeCloseTo(0, 12);
    expect(s.phiDeg).toBeCloseTo(0, 12);
    expect(s.directionDeg).toBeCloseTo(0, 6);
  });

  it('wraps φ across 0°/360° and measures the direction change', () => {
    // A frame turned by 10° about z moves φ from 355° to 5°: +10°, not −350°. (Geometry, exact.)
    const c = Math.cos((10 * Math.PI) / 180);
    const s10 = Math.sin((10 * Math.PI) / 180);
    const from = { x: Math.cos((-5 * Math.PI) / 180), y: Math.sin((-5 * Math.PI) / 180), z: 1 };
    const shift = calibrationShift(plain(1), plain(1, [[c, -s10, 0], [s10, c, 0], [0, 0, 1]]), from);
    expect(shift.phiDeg).toBeCloseTo(10, 9);
    expect(shift.thetaDeg).toBeCloseTo(0, 9);
    // Both fields at θ = 45°: the angle between them is 2·asin(sin45°·sin5°).
    expect(shift.directionDeg).toBeCloseTo((2 * Math.asin(Math.SQRT1_2 * Math.sin((5 * Math.PI) / 180)) * 180) / Math.PI, 9);
  });

  it('has no angle shift at zero field', () => {
    const s = calibrationShift(plain(1), plain(2), { x: 0, y: 0, z: 0 });
    expect(s).toMatchObject({ thetaDeg: null, phiDeg: null, directionDeg: null, magnitudeGauss: 0 });
  });
});
