import { describe, expect, it } from 'vitest';
import { directionFromAngles, type Vec3 } from '../field/field-vector.js';
import { centralAngle, centralAngleDeg, fieldAlongPath, slerp } from './great-circle.js';

const RAD = Math.PI / 180;

/**
 * Central angle by the haversine formula, from latitude/longitude (here 90° − θ and φ): the
 * textbook great-circle distance on a unit sphere (e.g. Sinnott 1984, "Virtues of the
 * haversine", Sky and Telescope 68, 159).
 */
function haversineRad(theta1Deg: number, phi1Deg: number, theta2Deg: number, phi2Deg: number): number {
  const lat1 = (90 - theta1Deg) * RAD;
  const lat2 = (90 - theta2Deg) * RAD;
  const dLat = lat2 - lat1;
  const dLon = (phi2Deg - phi1Deg) * RAD;
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(lat1) * Math.cos(lat2) * Math.sin(dLon / 2) ** 2;
  return 2 * Math.asin(Math.min(1, Math.sqrt(h)));
}

const dot = (a: Vec3, b: Vec3) => a.x * b.x + a.y * b.y + a.z * b.z;
const cross = (a: Vec3, b: Vec3): Vec3 => ({ x: a.y * b.z - a.z * b.y, y: a.z * b.x - a.x * b.z, z: a.x * b.y - a.y * b.x });

describe('great-circle path on the sphere of directions', () => {
  const cases: [number, number, number, number][] = [
    [10, 20, 80, 200],
    [45, 0, 45, 90],
    [0, 0, 90, 0],
    [30, 350, 40, 10],
    [170, 100, 20, 300],
  ];

  it('measures the central angle as the haversine formula does', () => {
    for (const [t1, p1, t2, p2] of cases) {
      const a = directionFromAngles(t1, p1);
      const b = directionFromAngles(t2, p2);
      expect(centralAngle(a, b)).toBeCloseTo(haversineRad(t1, p1, t2, p2), 12);
    }
    // 90° between the pole and any point of the equator (geometry of the sphere).
    expect(centralAngleDeg({ x: 0, y: 0, z: 1 }, directionFromAngles(90, 123))).toBeCloseTo(90, 12);
  });

  it('turns at a constant rate along the shorter arc, staying on the great circle through both ends', () => {
    for (const [t1, p1, t2, p2] of cases) {
      const a = directionFromAngles(t1, p1);
      const b = directionFromAngles(t2, p2);
      const omega = haversineRad(t1, p1, t2, p2);
      const normal = cross(a, b);
      for (const t of [0, 0.1, 0.25, 0.5, 0.9, 1]) {
        const p = slerp(a, b, t);
        expect(Math.hypot(p.x, p.y, p.z)).toBeCloseTo(1, 12);
        // Angle from the start is t·Ω and from the end (1 − t)·Ω (Shoemake 1985).
        expect(centralAngle(a, p)).toBeCloseTo(t * omega, 10);
        expect(centralAngle(p, b)).toBeCloseTo((1 - t) * omega, 10);
        // In the plane of a and b.
        expect(dot(normal, p)).toBeCloseTo(0, 12);
      }
    }
  });

  it('turns through a half circle for opposite directions, always the same way', () => {
    const a = directionFromAngles(60, 30);
    const b = { x: -a.x, y: -a.y, z: -a.z };
    const mid = slerp(a, b, 0.5);
    expect(centralAngleDeg(a, mid)).toBeCloseTo(90, 9);
    expect(centralAngleDeg(mid, b)).toBeCloseTo(90, 9);
    expect(slerp(a, b, 0.5)).toEqual(mid);
    const end = slerp(a, b, 1);
    expect(centralAngleDeg(end, b)).toBeLessThan(1e-6);
  });

  it('changes the magnitude linearly in time and keeps the other end\'s direction through zero', () => {
    const from = { x: 0, y: 0, z: 4 };
    const to = { x: 8, y: 0, z: 0 };
    for (const t of [0, 0.3, 0.5, 1]) {
      const b = fieldAlongPath(from, to, t);
      expect(Math.hypot(b.x, b.y, b.z)).toBeCloseTo(4 + 4 * t, 12);
      expect(centralAngleDeg(from, b)).toBeCloseTo(90 * t, 9);
    }
    const up = fieldAlongPath({ x: 0, y: 0, z: 0 }, to, 0.25);
    expect(up).toEqual({ x: 2, y: 0, z: 0 });
    const down = fieldAlongPath(from, { x: 0, y: 0, z: 0 }, 0.75);
    expect(down.z).toBeCloseTo(1, 12);
    expect(fieldAlongPath({ x: 0, y: 0, z: 0 }, { x: 0, y: 0, z: 0 }, 0.5)).toEqual({ x: 0, y: 0, z: 0 });
  });
});
