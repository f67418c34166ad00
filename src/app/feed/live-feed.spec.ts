import { describe, expect, it } from 'vitest';
import { reconnectDelayMs } from './live-feed';

describe('reconnectDelayMs', () => {
  it('doubles from half a second with each failed attempt', () => {
    expect([0, 1, 2, 3].map((attempt) => reconnectDelayMs(attempt, 0.5))).toEqual([500, 1000, 2000, 4000]);
  });

  it('never waits longer than 15 s between attempts', () => {
    expect(reconnectDelayMs(30, 0.5)).toBe(15_000);
  });

  it('spreads the delay by ±20 % so that many screens do not reconnect in step', () => {
    expect(reconnectDelayMs(2, 0)).toBe(1600);
    expect(reconnectDelayMs(2, 0.999_999)).toBe(2400);
  });
});
