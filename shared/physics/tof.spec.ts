import { describe, expect, it } from 'vitest';
import { expandedMetric, imagingPlane, momentumMetric, projectEllipse } from './tof.js';

const DEG = Math.PI / 180;
const LONG_TIME = 1e5; // ω̄t: M_r is then 1e-10 of the momentum term

describe('ballistic time of flight', () => {
  it('approaches AR_∞ = √(1 + (β² − 1) sin²α) with the major axis along the projected field', () => {
    // docs/physics.md §6.1 [I]: long-time limit, α = angle between e and the line of sight.
    const mr = [2.1, 0.3, -0.2, 0.3, 0.6, 0.1, -0.2, 0.1, 0.9];
    const beta = 1.3;
    const e = [Math.sin(50 * DEG) * Math.cos(20 * DEG), Math.sin(50 * DEG) * Math.sin(20 * DEG), Math.cos(50 * DEG)];
    const mk = new Float64Array(9);
    const m = new Float64Array(9);
    momentumMetric(beta, 0.97, e, mk);
    expandedMetric(mr, mk, LONG_TIME, m);
    const plane = imagingPlane('y'); // line of sight y
    const img = projectEllipse(m, plane);
    const sinAlpha2 = 1 - e[1] * e[1];
    expect(img.aspectRatio).toBeCloseTo(Math.sqrt(1 + (beta * beta - 1) * sinAlpha2), 8);
    // Projection of e onto (u, v) = (x, z): angle atan2(e_z, e_x).
    expect(img.majorAngleDeg).toBeCloseTo(Math.atan2(e[2], e[0]) / DEG, 6);
  });

  it('tends to β itself when the field lies in the image plane', () => {
    const mk = new Float64Array(9);
    const m = new Float64Array(9);
    momentumMetric(1.2, 1, [Math.SQRT1_2, Math.SQRT1_2, 0], mk);
    expandedMetric([1, 0, 0, 0, 2, 0, 0, 0, 3], mk, LONG_TIME, m);
    expect(projectEllipse(m, imagingPlane('z')).aspectRatio).toBeCloseTo(1.2, 8);
  });

  it('shows the in-situ cloud at t = 0', () => {
    const mr = [4, 0, 0, 0, 9, 0, 0, 0, 1];
    const m = new Float64Array(9);
    expandedMetric(mr, new Float64Array(9).fill(1), 0, m);
    const img = projectEllipse(m, imagingPlane('x')); // (u, v) = (y, z): radii 3 and 1
    expect(img.aspectRatio).toBeCloseTo(3, 14);
    expect(img.semiAxes).toEqual([expect.closeTo(3, 14), expect.closeTo(1, 14)]);
    expect(img.majorAngleDeg).toBe(0);
    expect(img.aspectRatioVOverU).toBeCloseTo(1 / 3, 14);
  });

  it('measures the major-axis angle from u towards v in [−90°, 90°)', () => {
    const plane = imagingPlane('z'); // (u, v) = (x, y)
    expect(projectEllipse([1, 0, 0, 0, 4, 0, 0, 0, 1], plane).majorAngleDeg).toBe(-90);
    expect(projectEllipse([2.5, 1.5, 0, 1.5, 2.5, 0, 0, 0, 1], plane).majorAngleDeg).toBeCloseTo(45, 12);
    expect(projectEllipse([2.5, -1.5, 0, -1.5, 2.5, 0, 0, 0, 1], plane).majorAngleDeg).toBeCloseTo(-45, 12);
  });

  it('reports no major-axis angle for a round image', () => {
    expect(projectEllipse([2, 0, 0, 0, 2, 0, 0, 0, 5], imagingPlane('z')).majorAngleDeg).toBeNull();
  });

  it('maps the named geometries to their camera axes', () => {
    // docs/physics.md §6.1: "y" → (x, z); "x" → (y, z); "z" → (x, y).
    expect(imagingPlane('y')).toEqual({ u: [1, 0, 0], v: [0, 0, 1] });
    expect(imagingPlane('x')).toEqual({ u: [0, 1, 0], v: [0, 0, 1] });
    expect(imagingPlane('z')).toEqual({ u: [1, 0, 0], v: [0, 1, 0] });
  });

  it('normalises arbitrary camera vectors and rejects unusable ones by name', () => {
    const p = imagingPlane({ u: [2, 2, 0], v: [0, 0, 5] });
    expect(p.u[0]).toBeCloseTo(Math.SQRT1_2, 15);
    expect(p.v).toEqual([0, 0, 1]);
    expect(() => imagingPlane({ u: [1, 0, 0], v: [1, 1, 0] })).toThrow(/perpendicular/);
    expect(() => imagingPlane({ u: [0, 0, 0], v: [0, 0, 1] })).toThrow(/imaging.u must not be the zero vector/);
    expect(() => imagingPlane({ u: [1, 0], v: [0, 0, 1] })).toThrow(/imaging.u must be a vector of three/);
    expect(() => imagingPlane('w' as 'x')).toThrow(/imaging must be/);
  });
});
