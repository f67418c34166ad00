import { describe, expect, it } from 'vitest';
import { multiply, add, matrix, type Matrix } from 'mathjs';
import { assertRotation, type CalibrationBody } from './calibration.js';
import { DEMO_CALIBRATION } from './demo-calibration.js';
import { currentsForField, directionFromAngles, fieldAngles, fieldFromCurrents, fieldVector } from './field-vector.js';

/** Identity coupling of 2 G/A per pair, no offset, coil frame = trap frame. */
const PLAIN: CalibrationBody = {
  gaussPerAmp: [
    [2, 0, 0],
    [0, 2, 0],
    [0, 0, 2],
  ],
  offsetGauss: [0, 0, 0],
  coilToTrap: [
    [1, 0, 0],
    [0, 1, 0],
    [0, 0, 1],
  ],
};

describe('field from coil currents', () => {
  it('matches B = R·(K·I + B0) computed by a general matrix library', () => {
    // Reference: mathjs matrix algebra (general-purpose library from the registry).
    const currents = { x: 3.5, y: -1.25, z: 7 };
    const k = matrix(DEMO_CALIBRATION.gaussPerAmp);
    const r = matrix(DEMO_CALIBRATION.coilToTrap);
    const expected = (multiply(r, add(multiply(k, [currents.x, currents.y, currents.z]), DEMO_CALIBRATION.offsetGauss)) as Matrix).toArray() as number[];
    const b = fieldVector(DEMO_CALIBRATION, currents);
    expect(b.x).toBeCloseTo(expected[0], 12);
    expect(b.y).toBeCloseTo(expected[1], 12);
    expect(b.z).toBeCloseTo(expected[2], 12);
  });

  it('gives θ = 0° for a field along +z and θ = 180° for −z, with φ reported as 0°', () => {
    const up = fieldFromCurrents(PLAIN, { x: 0, y: 0, z: 5 });
    expect(up.magnitude).toBeCloseTo(10, 12);
    expect(up.thetaDeg).toBe(0);
    expect(up.phiDeg).toBe(0);
    const down = fieldFromCurrents(PLAIN, { x: 0, y: 0, z: -5 });
    expect(down.thetaDeg).toBeCloseTo(180, 12);
    expect(down.phiDeg).toBe(0);
  });

  it('measures φ from x towards y and wraps it into 0…360°', () => {
    // Spherical-coordinate convention of physics (ISO 80000-2): φ = atan2(y, x).
    expect(fieldAngles({ x: 0, y: 1, z: 0 }).phiDeg).toBeCloseTo(90, 12);
    expect(fieldAngles({ x: -1, y: 0, z: 0 }).phiDeg).toBeCloseTo(180, 12);
    expect(fieldAngles({ x: 0, y: -1, z: 0 }).phiDeg).toBeCloseTo(270, 12);
    const justBelowX = fieldAngles({ x: 1, y: -1e-9, z: 0 }).phiDeg!;
    expect(justBelowX).toBeGreaterThan(359.9);
    expect(justBelowX).toBeLessThan(360);
    expect(fieldAngles({ x: 1, y: 1, z: Math.SQRT2 }).thetaDeg).toBeCloseTo(45, 12);
  });

  it('reports no direction for a zero field', () => {
    const zero = fieldFromCurrents(PLAIN, { x: 0, y: 0, z: 0 });
    expect(zero.magnitude).toBe(0);
    expect(zero.thetaDeg).toBeNull();
    expect(zero.phiDeg).toBeNull();
  });

  it('turns the field into the trap frame with the calibration rotation', () => {
    // A trap frame turned by +90° about z: coil x becomes trap −y.
    const turned: CalibrationBody = { ...PLAIN, coilToTrap: [[0, 1, 0], [-1, 0, 0], [0, 0, 1]] };
    const b = fieldFromCurrents(turned, { x: 1, y: 0, z: 0 });
    expect(b.vector.x).toBeCloseTo(0, 12);
    expect(b.vector.y).toBeCloseTo(-2, 12);
    expect(b.phiDeg).toBeCloseTo(270, 12);
    expect(b.thetaDeg).toBeCloseTo(90, 12);
  });

  it('finds the currents for a requested field (inverse of the calibration)', () => {
    const target = directionFromAngles(35, 25);
    const want = { x: 8 * target.x, y: 8 * target.y, z: 8 * target.z };
    const got = fieldVector(DEMO_CALIBRATION, currentsForField(DEMO_CALIBRATION, want));
    expect(got.x).toBeCloseTo(want.x, 10);
    expect(got.y).toBeCloseTo(want.y, 10);
    expect(got.z).toBeCloseTo(want.z, 10);
  });

  it('refuses a singular coupling matrix and a reflection as the frame rotation', () => {
    const singular: CalibrationBody = { ...PLAIN, gaussPerAmp: [[1, 0, 0], [2, 0, 0], [0, 0, 1]] };
    expect(() => currentsForField(singular, { x: 1, y: 0, z: 0 })).toThrow(/singular/);
    expect(() => assertRotation([[1, 0, 0], [0, 1, 0], [0, 0, -1]])).toThrow(/reflection/);
    expect(() => assertRotation([[1, 0.1, 0], [0, 1, 0], [0, 0, 1]])).toThrow(/orthonormal/);
    expect(() => assertRotation(DEMO_CALIBRATION.coilToTrap)).not.toThrow();
  });
});
