import { describe, expect, it } from 'vitest';
import type { LivePrediction } from '../../shared/live/live-state.js';
import { PredictionHistoryRing } from './prediction-history.js';

const T0 = Date.parse('2031-05-04T10:00:00Z');

function prediction(atMs: number, beta: number | null, ratio: number | null = null, profileId = 1): LivePrediction {
  return {
    stable: beta !== null, reason: beta === null ? 'collapsed' : null, fermiSurfaceAspect: beta, cloudAspect: null, tofAspect: beta === null ? null : 2 * beta,
    tofMajorAngleDeg: null, collapseRatio: ratio, epsDd: 0.12, profileId, thetaDeg: 30, phiDeg: 40, computedAt: new Date(atMs).toISOString(), camera: null,
  };
}

describe('PredictionHistoryRing', () => {
  it('returns the predictions since a time, oldest first, with nulls kept', () => {
    const ring = new PredictionHistoryRing(10);
    ring.push(prediction(T0, 1.01));
    ring.push(prediction(T0 + 100, null, 1.3));
    ring.push(prediction(T0 + 200, 1.03));

    expect(ring.since(T0 + 100)).toEqual({ t: [T0 + 100, T0 + 200], fermiSurfaceAspect: [null, 1.03], tofAspect: [null, 2.06], collapseRatio: [1.3, null] });
  });

  it('replaces the newest entry when the same prediction comes back with its collapse ratio', () => {
    const ring = new PredictionHistoryRing(10);
    ring.push(prediction(T0, 1.01));
    ring.push(prediction(T0, 1.01, 0.4));
    // Same time, another profile: a different prediction.
    ring.push(prediction(T0, 1.05, null, 2));

    expect(ring.since(0)).toEqual({ t: [T0, T0], fermiSurfaceAspect: [1.01, 1.05], tofAspect: [2.02, 2.1], collapseRatio: [0.4, null] });
  });

  it('keeps only the newest entries up to its capacity', () => {
    const ring = new PredictionHistoryRing(3);
    for (let i = 0; i < 7; i++) ring.push(prediction(T0 + i, 1 + i / 100));

    expect(ring.since(0).t).toEqual([T0 + 4, T0 + 5, T0 + 6]);
  });
});

describe('PredictionHistoryRing gaps', () => {
  it('leaves a gap while the prediction does not apply and resumes with the prediction in force', () => {
    const ring = new PredictionHistoryRing(10);
    const p = prediction(T0, 1.02, 0.1);
    ring.push(p);
    ring.pushGap(T0 + 500);
    ring.resume(p, T0 + 900);
    // A later collapse-ratio update of the same prediction changes its values, not its time.
    ring.push({ ...p, collapseRatio: 0.2 });

    expect(ring.since(0)).toEqual({
      t: [T0, T0 + 500, T0 + 900],
      fermiSurfaceAspect: [1.02, null, 1.02],
      tofAspect: [2.04, null, 2.04],
      collapseRatio: [0.1, null, 0.2],
    });
  });
});
