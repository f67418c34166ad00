import { describe, expect, it } from 'vitest';
import { predict } from '../../shared/physics/predict.js';
import { DEMO_PROFILE } from '../../shared/profiles/demo-profile.js';
import { sampleParamsOf } from '../../shared/profiles/sample-profile.js';
import { cameraView, imagingLabel } from './camera-view.js';
import { fieldDirectionOf } from './field-direction.js';

const DEG = 180 / Math.PI;
const params = sampleParamsOf(DEMO_PROFILE);

describe('cameraView', () => {
  it('draws the Fermi surface as the long-time image: aspect √(1 + (β² − 1) sin²α), major axis along the projection of e', () => {
    // Long-time limit of docs/physics.md §6.1 (α = angle between e and the line of sight y).
    const e = fieldDirectionOf(35, 25).unit;
    const p = predict(params, { thetaDeg: 35, phiDeg: 25 }, { tofMs: [0, 20], imaging: 'y' });
    const view = cameraView(p, e, 'y');
    const beta = p.fermiSurface?.aspectRatio as number;
    const sin2Alpha = 1 - e[1] ** 2;
    expect(view.momentumPerUm.major / view.momentumPerUm.minor).toBeCloseTo(Math.sqrt(1 + (beta ** 2 - 1) * sin2Alpha), 12);
    // Imaging "y": u = x, v = z.
    expect(view.momentumPerUm.majorAngleDeg).toBeCloseTo(Math.atan2(e[2], e[0]) * DEG, 9);
  });

  it('shows the full deformation β with the major axis vertical when e lies along the camera’s v axis', () => {
    const p = predict(params, { thetaDeg: 0, phiDeg: 0 }, { tofMs: [0, 20], imaging: 'y' });
    const view = cameraView(p, [0, 0, 1], 'y');
    expect(view.momentumPerUm.major).toBeCloseTo(p.fermiSurface?.kParallelPerUm as number, 12);
    expect(view.momentumPerUm.minor).toBeCloseTo(p.fermiSurface?.kPerpPerUm as number, 12);
    expect(view.momentumPerUm.majorAngleDeg).toBe(-90);
  });

  it('takes the in-situ and TOF ellipses from the images at t = 0 and at the profile’s TOF time', () => {
    const p = predict(params, { thetaDeg: 35, phiDeg: 25 }, { tofMs: [0, 20], imaging: 'y' });
    const view = cameraView(p, fieldDirectionOf(35, 25).unit, 'y');
    const [inSitu, tof] = p.tof ?? [];
    expect(view).toMatchObject({
      imaging: 'y',
      tofMs: 20,
      inSituUm: { major: inSitu.semiAxesUm[0], minor: inSitu.semiAxesUm[1], majorAngleDeg: inSitu.majorAngleDeg },
      tofUm: { major: tof.semiAxesUm[0], minor: tof.semiAxesUm[1], majorAngleDeg: tof.majorAngleDeg },
    });
  });

  it('sees the in-situ cloud along the trap axes x and z when the field lies along a trap axis', () => {
    // Symmetry reduction (docs/physics.md §7): with e along z, M_R is diagonal in the trap frame.
    const p = predict(params, { thetaDeg: 0, phiDeg: 0 }, { tofMs: [0, 20], imaging: 'y' });
    const view = cameraView(p, [0, 0, 1], 'y');
    const radius = (axis: number) => {
      const cloud = p.cloud as NonNullable<typeof p.cloud>;
      return cloud.radiiUm[cloud.axes.findIndex((a) => Math.abs(a[axis]) > 0.999)];
    };
    expect(view.inSituUm.major).toBeCloseTo(radius(0), 9);
    expect(view.inSituUm.minor).toBeCloseTo(radius(2), 9);
    expect(view.inSituUm.majorAngleDeg).toBeCloseTo(0, 6);
  });

  it('refuses a collapsed prediction, which has no geometry to draw', () => {
    const p = predict({ ...params, atomNumber: 1e15 }, { thetaDeg: 0, phiDeg: 0 }, { tofMs: [0, 20] });
    expect(() => cameraView(p, [0, 0, 1], 'y')).toThrow(/stable prediction/);
  });

  it('labels named and vector imaging geometries', () => {
    expect(imagingLabel('z')).toBe('z');
    expect(imagingLabel({ u: [1, 0, 0], v: [0, 0.6, 0.8] })).toBe('u=(1, 0, 0) v=(0, 0.6, 0.8)');
  });
});
