import { describe, expect, it } from 'vitest';
import { planHistory } from './history-series.js';

const NOW = Date.UTC(2026, 11, 2, 9, 0, 0);
const MIN = 60_000;

describe('planHistory: raw block means while the samples are kept, roll-ups after', () => {
  it('reads a short recent window from the raw samples in 10 ms blocks', () => {
    expect(planHistory(NOW - 10_000, NOW, 5000, NOW, 24)).toEqual({ fromMs: NOW - 10_000, toMs: NOW, source: 'raw', blockMs: 10, slowBlockMs: 100 });
  });

  it('reads ten minutes from the stored 100 ms means, its ends rounded out to whole 100 ms blocks', () => {
    const plan = planHistory(NOW - 10 * MIN + 37, NOW + 3, 5000, NOW, 24);
    expect(plan).toEqual({ fromMs: NOW - 10 * MIN, toMs: NOW + 100, source: 'raw', blockMs: 200, slowBlockMs: 2000 });
  });

  it('uses the roll-ups once fewer than one point per second is asked for, or past raw retention', () => {
    expect(planHistory(NOW - 10 * MIN, NOW, 100, NOW, 24)).toMatchObject({ source: 'rollup', blockMs: 6000, slowBlockMs: 6000 });
    expect(planHistory(NOW - 25 * 3600_000, NOW - 25 * 3600_000 + MIN, 5000, NOW, 24)).toMatchObject({ source: 'rollup', blockMs: 1000 });
    expect(planHistory(NOW - 86_400_000, NOW, 100_000, NOW, 48)).toMatchObject({ source: 'rollup', blockMs: 1000 });
  });
});
