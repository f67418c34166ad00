import { describe, expect, it } from 'vitest';
import type { LivePrediction } from '../../../shared/live/live-state';
import { predictedValues, resampleHistory } from './prediction-series';

describe('resampleHistory', () => {
  it('holds each recorded prediction until the next one, sampled at the given spacing', () => {
    const history = { t: [1000, 1250], fermiSurfaceAspect: [1.02, 1.03], tofAspect: [1.01, null], collapseRatio: [0.1, 0.1] };
    const points = resampleHistory(history, 100, 1500);
    expect(points.map((p) => p.t)).toEqual([1000, 1100, 1200, 1300, 1400]);
    // Deformations in percent: β = 1.02 → 2 %, 1.03 → 3 %.
    expect(points.map((p) => p.values[0])).toEqual([2, 2, 2, 3, 3].map((v) => expect.closeTo(v, 12)));
    expect(points[4].values[1]).toBeNaN();
  });

  it('gives nothing for an empty history', () => {
    expect(resampleHistory({ t: [], fermiSurfaceAspect: [], tofAspect: [] }, 100, 5000)).toEqual([]);
  });
});

describe('predictedValues', () => {
  it('leaves a gap for a collapsed gas instead of plotting numbers', () => {
    const collapsed = { stable: false, fermiSurfaceAspect: 1.5, tofAspect: 1.4 } as LivePrediction;
    expect(predictedValues(collapsed).every(Number.isNaN)).toBe(true);
    const [beta, tof] = predictedValues({ stable: true, fermiSurfaceAspect: 1.02, tofAspect: 1.01 } as LivePrediction);
    expect(beta).toBeCloseTo(2, 12);
    expect(tof).toBeCloseTo(1, 12);
  });
});
