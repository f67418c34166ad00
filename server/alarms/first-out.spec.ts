import { describe, expect, it } from 'vitest';
import { FirstOutGrouper } from './first-out.js';

const T0 = Date.UTC(2026, 2, 12, 9, 0, 0);

describe('FirstOutGrouper', () => {
  it('groups conditions that began within the window under the first one', () => {
    const g = new FirstOutGrouper(10_000);
    expect(g.assign('flow.x.LL', T0)).toEqual({ head: null });
    expect(g.assign('temperature.x.H', T0 + 4000)).toEqual({ head: 'flow.x.LL' });
    expect(g.assign('temperature.x.HH', T0 + 10_000)).toEqual({ head: 'flow.x.LL' });
  });

  it('measures the window from the first condition start, not from the latest', () => {
    const g = new FirstOutGrouper(10_000);
    g.assign('flow.x.LL', T0);
    g.assign('temperature.x.H', T0 + 9000);
    expect(g.assign('temperature.x.HH', T0 + 10_001)).toEqual({ head: null });
    expect(g.assign('stale.H', T0 + 12_000)).toEqual({ head: 'temperature.x.HH' });
  });

  it('makes the condition that began first the head, even when it is annunciated last (longer on-delay)', () => {
    // The flow fell first (t = 0) but its alarm waits out a 2 s on-delay; the trip that the
    // low flow caused drops the setpoints at t = 0.3 s and the deviation alarm (0.5 s on-delay)
    // is annunciated at t = 0.8 s, before the flow alarm at t = 2 s.
    const g = new FirstOutGrouper(10_000);
    expect(g.assign('currentDeviation.x.H', T0 + 300)).toEqual({ head: null });
    expect(g.assign('flow.x.L', T0)).toEqual({ head: null, replaced: 'currentDeviation.x.H' });
    expect(g.assign('temperature.x.H', T0 + 5000)).toEqual({ head: 'flow.x.L' });
  });

  it('keeps the head already chosen when two conditions began at the same moment', () => {
    const g = new FirstOutGrouper(10_000);
    g.assign('flow.x.L', T0);
    expect(g.assign('flow.y.L', T0)).toEqual({ head: 'flow.x.L' });
  });

  it('leaves a condition that began long before the group on its own', () => {
    const g = new FirstOutGrouper(10_000);
    g.assign('flow.x.L', T0 + 60_000);
    expect(g.assign('waterSupply.L', T0)).toEqual({ head: null });
    expect(g.assign('temperature.x.H', T0 + 61_000)).toEqual({ head: 'flow.x.L' });
  });

  it('keeps the first-out alarm ungrouped when it raises again within its window', () => {
    const g = new FirstOutGrouper(10_000);
    g.assign('flow.x.LL', T0);
    expect(g.assign('flow.x.LL', T0 + 2000)).toEqual({ head: null });
  });

  it('rejects a window that is not positive', () => {
    expect(() => new FirstOutGrouper(0)).toThrow(/more than 0 ms/);
  });
});
