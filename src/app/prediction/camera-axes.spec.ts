import { describe, expect, it } from 'vitest';
import { cameraAxes, projectedField } from './camera-axes';

describe('cameraAxes', () => {
  it('names the named geometries of docs/physics.md §6.1', () => {
    expect(cameraAxes('y')?.label).toBe('u = x, v = z (imaging along y)');
    expect(cameraAxes('x')?.label).toBe('u = y, v = z (imaging along x)');
    expect(cameraAxes('z')?.label).toBe('u = x, v = y (imaging along z)');
  });

  it('describes a tilted camera by its normalised vectors', () => {
    const axes = cameraAxes({ u: [2, 0, 0], v: [0, 3, 4] });
    expect(axes?.label).toBe('u = (1, 0, 0), v = (0, 0.6, 0.8) (trap frame)');
    expect(axes?.uName).toBe('u');
  });

  it('returns null for a camera label it cannot resolve', () => {
    expect(cameraAxes('u=(1, 0, 0) v=(0, 0.6, 0.8)')).toBeNull();
    expect(cameraAxes(null)).toBeNull();
  });
});

describe('projectedField', () => {
  it('sees a field along z as vertical and a field along the line of sight as a point', () => {
    const y = cameraAxes('y')!;
    const alongZ = projectedField(0, 0, y);
    expect(alongZ.u).toBeCloseTo(0, 12);
    expect(alongZ.v).toBeCloseTo(1, 12);
    const alongY = projectedField(90, 90, y);
    expect(Math.hypot(alongY.u, alongY.v)).toBeCloseTo(0, 12);
  });
});
