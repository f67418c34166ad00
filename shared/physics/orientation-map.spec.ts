import { describe, expect, it } from 'vitest';
import { computeOrientationMap } from './orientation-map.js';
import { predict, type SampleParams } from './predict.js';

const ER: SampleParams = { species: '167Er', atomNumber: 5e4, trapHz: [350, 80, 400] };
/**
 * Fully polarised 40K87Rb in an oblate trap (ω_z/ω⊥ ≈ 11, λ_z = 5): ε_dd ≈ 4.9 is stable with
 * the field near the axis (ε_c = 32.35 at θ = 0°) and collapsed near the plane (ε_c = 1.728 at
 * 90°), physics.md §7(e) [V].
 */
const PANCAKE: SampleParams = { species: '40K87Rb', atomNumber: 1e5, trapHz: [50, 50, 559] };

const at = (map: ReturnType<typeof computeOrientationMap>, thetaDeg: number, phiDeg: number) =>
  map.values[map.thetaDeg.indexOf(thetaDeg) * map.phiDeg.length + map.phiDeg.indexOf(phiDeg)];

describe('computeOrientationMap', () => {
  const beta = computeOrientationMap(ER, { quantity: 'fermiSurfaceAspect', resolutionDeg: 15 });

  it('covers θ = 0…180° and φ = 0…360° at the requested step', () => {
    expect(beta.thetaDeg).toEqual([0, 15, 30, 45, 60, 75, 90, 105, 120, 135, 150, 165, 180]);
    expect(beta.phiDeg).toHaveLength(25);
    expect(beta.phiDeg.at(-1)).toBe(360);
    expect(beta.values).toHaveLength(13 * 25);
    expect(beta.cancelled).toBe(false);
  });

  it('obeys the trap’s mirror symmetries and e ↔ −e', () => {
    for (const [t, f] of [[30, 15], [45, 60], [75, 45]]) {
      const v = at(beta, t, f);
      expect(at(beta, 180 - t, f)).toBe(v);
      expect(at(beta, t, 180 - f)).toBe(v);
      expect(at(beta, t, 180 + f)).toBe(v);
      expect(at(beta, t, 360 - f)).toBe(v);
    }
    const pole = at(beta, 0, 0);
    for (const f of beta.phiDeg) expect(at(beta, 0, f)).toBe(pole);
  });

  it('agrees with a single prediction at a grid direction', () => {
    const p = predict(ER, { thetaDeg: 45, phiDeg: 60 });
    expect(at(beta, 45, 60)).toBeCloseTo(p.fermiSurface!.aspectRatio, 8);
  });

  it('marks collapsed directions NaN and gives their collapse ratio above one', () => {
    const pancake = computeOrientationMap(PANCAKE, { quantity: 'fermiSurfaceAspect', resolutionDeg: 45 });
    expect(at(pancake, 0, 0)).toBeGreaterThan(1);
    expect(at(pancake, 90, 0)).toBeNaN();
    const margin = computeOrientationMap(PANCAKE, { quantity: 'collapseRatio', resolutionDeg: 45 });
    expect(at(margin, 0, 0)).toBeCloseTo(pancake.epsDd / 32.35, 3);
    expect(at(margin, 90, 0)).toBeGreaterThan(1);
    for (let k = 0; k < margin.values.length; k++) expect(Number.isNaN(pancake.values[k])).toBe(margin.values[k] > 1);
  });

  it('maps the TOF aspect ratio, equal to a prediction’s at the same direction', () => {
    const tof = computeOrientationMap(ER, { quantity: 'tofAspect', resolutionDeg: 30, tofMs: 20, imaging: 'y' });
    const p = predict(ER, { thetaDeg: 60, phiDeg: 30 }, { tofMs: [20], imaging: 'y' });
    expect(at(tof, 60, 30)).toBeCloseTo(p.tof![0].aspectRatio, 8);
  });

  it('reports progress row by row and stops when asked', () => {
    const progress: number[] = [];
    let asked = 0;
    const map = computeOrientationMap(ER, {
      quantity: 'fermiSurfaceAspect',
      resolutionDeg: 15,
      onProgress: (f) => progress.push(f),
      shouldStop: () => ++asked > 10,
    });
    expect(map.cancelled).toBe(true);
    expect(asked).toBe(11);
    expect(progress).toEqual([1 / 7, 2 / 7]); // row θ = 0 is one direction, row θ = 15° seven
    expect(map.values.some(Number.isNaN)).toBe(true);
    const full: number[] = [];
    computeOrientationMap(ER, { quantity: 'fermiSurfaceAspect', resolutionDeg: 30, onProgress: (f) => full.push(f) });
    expect(full).toEqual([1 / 4, 2 / 4, 3 / 4, 1]);
  });

  it('rejects an unusable resolution, quantity or missing TOF time by name', () => {
    expect(() => computeOrientationMap(ER, { quantity: 'fermiSurfaceAspect', resolutionDeg: 0 })).toThrow(/resolutionDeg/);
    expect(() => computeOrientationMap(ER, { quantity: 'tofAspect', resolutionDeg: 10 })).toThrow(/tofMs/);
    expect(() => computeOrientationMap(ER, { quantity: 'beta' as 'tofAspect', resolutionDeg: 10 })).toThrow(/quantity/);
    expect(() => computeOrientationMap({ ...ER, atomNumber: 0 }, { quantity: 'fermiSurfaceAspect', resolutionDeg: 10 })).toThrow(/atomNumber/);
  });
});
