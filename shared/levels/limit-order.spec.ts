import { describe, expect, it } from 'vitest';
import { limitOrderProblems } from './limit-order.js';

// The order low trip < LL < L < H < HH < high trip is alarm-management common practice
// (docs/alarm-rationale.md); the values are invented demo numbers.
describe('limitOrderProblems', () => {
  it('accepts levels in order, with missing levels left out', () => {
    expect(limitOrderProblems({ tripLow: 1, LL: 1.2, L: 1.5 }, 'L/min')).toEqual([]);
    expect(limitOrderProblems({ H: 55, HH: 60, tripHigh: 65 }, '°C')).toEqual([]);
    expect(limitOrderProblems({ L: 10, H: 25, tripHigh: null }, '°C')).toEqual([]);
  });

  it('refuses an alarm limit beyond its trip level and says where it must lie', () => {
    const problems = limitOrderProblems({ H: 21, tripHigh: 20 }, 'A', 'H');
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatchObject({ level: 'H', other: 'tripHigh' });
    expect(problems[0].message).toBe('the high alarm (H) at 21 A must lie below the high trip level at 20 A');
  });

  it('refuses a low alarm below the low trip level, naming the edited level first', () => {
    const [problem] = limitOrderProblems({ tripLow: 1, L: 0.8 }, 'L/min', 'L');
    expect(problem.message).toBe('the low alarm (L) at 0.8 L/min must lie above the low trip level at 1 L/min');
  });

  it('refuses an inverted order of low-low/low and high/high-high', () => {
    expect(limitOrderProblems({ LL: 1.6, L: 1.5 }, 'L/min').map((p) => [p.level, p.other])).toEqual([['LL', 'L']]);
    expect(limitOrderProblems({ H: 60, HH: 55 }, '°C', 'HH').map((p) => [p.level, p.other])).toEqual([['HH', 'H']]);
    expect(limitOrderProblems({ L: 30, H: 25 }, '°C').map((p) => [p.level, p.other])).toEqual([['L', 'H']]);
  });

  it('treats equal levels as out of order (each must lie strictly beyond the one before)', () => {
    expect(limitOrderProblems({ HH: 65, tripHigh: 65 }, '°C')).toHaveLength(1);
  });

  it('names a trip level edited below an existing alarm as the level to move', () => {
    const [problem] = limitOrderProblems({ H: 55, HH: 60, tripHigh: 58 }, '°C', 'tripHigh');
    expect(problem.message).toBe('the high trip level at 58 °C must lie above the high-high alarm (HH) at 60 °C');
  });
});
