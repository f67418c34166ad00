import { describe, expect, it } from 'vitest';
import { axialAngleDeg, directionBucket, fieldDirectionOf } from './field-direction.js';

describe('axialAngleDeg', () => {
  it('measures the angle between directions, 0…90°, with e and −e the same', () => {
    expect(axialAngleDeg(fieldDirectionOf(0, 0), fieldDirectionOf(90, 0))).toBeCloseTo(90, 12);
    expect(axialAngleDeg(fieldDirectionOf(30, 40), fieldDirectionOf(150, 220))).toBeCloseTo(0, 12);
    expect(axialAngleDeg(fieldDirectionOf(10, 0), fieldDirectionOf(160, 180))).toBeCloseTo(10, 12);
  });

  it('resolves changes far below the live threshold', () => {
    expect(axialAngleDeg(fieldDirectionOf(45, 0), fieldDirectionOf(45 + 1e-6, 0))).toBeCloseTo(1e-6, 12);
  });
});

describe('directionBucket', () => {
  it('puts e and −e into the same cell, also on the equator', () => {
    for (const [theta, phi] of [[35, 25], [89.8, 200], [90, 10], [0.2, 300], [120, 5]]) {
      expect(directionBucket(fieldDirectionOf(180 - theta, phi + 180), 1).key).toBe(directionBucket(fieldDirectionOf(theta, phi), 1).key);
    }
  });

  it('has a single cell at the pole and cells about one step wide elsewhere', () => {
    expect(directionBucket(fieldDirectionOf(0.3, 10), 1).key).toBe(directionBucket(fieldDirectionOf(0.3, 250), 1).key);
    for (const [theta, phi] of [[35, 25], [70, 300], [90, 100]]) {
      const d = fieldDirectionOf(theta, phi);
      expect(axialAngleDeg(d, directionBucket(d, 1).centre)).toBeLessThan(1);
    }
    expect(directionBucket(fieldDirectionOf(35, 25), 1).key).not.toBe(directionBucket(fieldDirectionOf(35, 27), 1).key);
  });
});

describe('fieldDirectionOf', () => {
  it('refuses non-finite angles', () => {
    expect(() => fieldDirectionOf(Number.NaN, 0)).toThrow(/finite thetaDeg and phiDeg/);
  });
});
