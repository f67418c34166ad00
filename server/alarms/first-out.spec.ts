import { describe, expect, it } from 'vitest';
import { FirstOutGrouper } from './first-out.js';

const T0 = Date.UTC(2026, 2, 12, 9, 0, 0);

describe('FirstOutGrouper', () => {
  it('groups raises within the window under the first one', () => {
    const g = new FirstOutGrouper(10_000);
    expect(g.assign('flow.x.LL', T0)).toBeNull();
    expect(g.assign('temperature.x.H', T0 + 4000)).toBe('flow.x.LL');
    expect(g.assign('temperature.x.HH', T0 + 10_000)).toBe('flow.x.LL');
  });

  it('measures the window from the first raise, not from the latest', () => {
    const g = new FirstOutGrouper(10_000);
    g.assign('flow.x.LL', T0);
    g.assign('temperature.x.H', T0 + 9000);
    expect(g.assign('temperature.x.HH', T0 + 10_001)).toBeNull();
    expect(g.assign('stale.H', T0 + 12_000)).toBe('temperature.x.HH');
  });

  it('keeps the first-out alarm ungrouped when it raises again within its window', () => {
    const g = new FirstOutGrouper(10_000);
    g.assign('flow.x.LL', T0);
    expect(g.assign('flow.x.LL', T0 + 2000)).toBeNull();
  });

  it('rejects a window that is not positive', () => {
    expect(() => new FirstOutGrouper(0)).toThrow(/more than 0 ms/);
  });
});
