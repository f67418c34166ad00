import { describe, expect, it } from 'vitest';
import type { LivePrediction, PredictionStatus } from '../../../shared/live/live-state';
import { predictedValues, predictionGapNote, resampleHistory } from './prediction-series';

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

const APPLIES: PredictionStatus = { state: 'applies', fieldG: 5, minFieldG: 0.5, reason: null };
const WEAK: PredictionStatus = { state: 'weak-field', fieldG: 0.02, minFieldG: 0.5, reason: '|B| = 0.02 G is below 0.50 G, too weak to orient the dipoles: the prediction does not apply.' };
const STALE: PredictionStatus = { state: 'stale', fieldG: 5, minFieldG: 0.5, reason: 'No telemetry for 12 s: the field now is unknown, so the prediction may not describe the gas.' };
const STABLE = { stable: true, fermiSurfaceAspect: 1.02, tofAspect: 1.01 } as LivePrediction;

describe('predictedValues', () => {
  it('leaves a gap for a collapsed gas instead of plotting numbers', () => {
    const collapsed = { stable: false, fermiSurfaceAspect: 1.5, tofAspect: 1.4 } as LivePrediction;
    expect(predictedValues(collapsed, APPLIES).every(Number.isNaN)).toBe(true);
    const [beta, tof] = predictedValues(STABLE, APPLIES);
    expect(beta).toBeCloseTo(2, 12);
    expect(tof).toBeCloseTo(1, 12);
  });

  it('leaves a gap while the prediction does not apply (field too weak, stale or no telemetry)', () => {
    for (const status of [WEAK, STALE, { ...STALE, state: 'no-telemetry' as const }, null]) {
      expect(predictedValues(STABLE, status).every(Number.isNaN)).toBe(true);
    }
  });
});

describe('predictionGapNote', () => {
  it('says nothing while the prediction applies', () => {
    expect(predictionGapNote(APPLIES, null)).toBeNull();
  });

  it('names the field and the threshold when |B| is too weak to orient the dipoles', () => {
    expect(predictionGapNote(WEAK, null)).toBe('No prediction plotted: |B| = 0.02 G is below 0.50 G, too weak to orient the dipoles');
  });

  it('says since when the data is stale', () => {
    expect(predictionGapNote(STALE, 'Stale since 03:12:09')).toBe('Stale since 03:12:09: no prediction plotted');
  });
});
