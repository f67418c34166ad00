import { describe, expect, it } from 'vitest';
import { predictionStatus } from './prediction-status.js';

const NOW = Date.UTC(2026, 11, 2, 3, 4, 5);

describe('predictionStatus', () => {
  it('applies with fresh telemetry and a field above the minimum', () => {
    expect(predictionStatus({ fieldG: 8.5, lastFrameAtMs: NOW - 20, nowMs: NOW, staleMs: 250, minFieldG: 0.5 })).toEqual({
      state: 'applies',
      fieldG: 8.5,
      minFieldG: 0.5,
      reason: null,
    });
  });

  it('does not apply while |B| is below the profile minimum, e.g. with the coils tripped to zero', () => {
    const status = predictionStatus({ fieldG: 0.12, lastFrameAtMs: NOW - 20, nowMs: NOW, staleMs: 250, minFieldG: 0.5 });
    expect(status).toMatchObject({ state: 'weak-field', fieldG: 0.12 });
    expect(status.reason).toBe('|B| = 0.12 G is below 0.50 G, too weak to orient the dipoles: the prediction does not apply.');
  });

  it('calls stale telemetry stale first, whatever the last |B| was', () => {
    const status = predictionStatus({ fieldG: 0.1, lastFrameAtMs: NOW - 1500, nowMs: NOW, staleMs: 250, minFieldG: 0.5 });
    expect(status).toMatchObject({ state: 'stale' });
    expect(status.reason).toMatch(/No telemetry for 1\.5 s/);
  });

  it('says there is no telemetry before the first frame', () => {
    expect(predictionStatus({ fieldG: null, lastFrameAtMs: null, nowMs: NOW, staleMs: 250, minFieldG: 0.5 })).toMatchObject({ state: 'no-telemetry', minFieldG: 0.5 });
  });
});
