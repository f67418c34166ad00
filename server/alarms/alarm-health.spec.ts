import { describe, expect, it } from 'vitest';
import { alarmHealth, chatteringAlarms, ratePerInterval, recentRaiseCount, staleAlarms, type HealthEvent } from './alarm-health.js';

const T0 = Date.UTC(2026, 2, 12, 9, 0, 0);
const MIN = 60_000;
const HOUR = 60 * MIN;

function raise(alarmId: string, atMs: number, hidden?: HealthEvent['hidden']): HealthEvent {
  return hidden ? { alarmId, at: atMs, kind: 'raise', hidden } : { alarmId, at: atMs, kind: 'raise' };
}

/** `n` raises of different alarms, spread evenly over `spanMs` from `startMs`. */
function burst(n: number, startMs: number, spanMs: number): HealthEvent[] {
  return Array.from({ length: n }, (_, i) => raise(`alarm-${i}`, startMs + Math.floor((i * spanMs) / n)));
}

describe('alarm rate and floods', () => {
  it('counts annunciated raises per 10-minute interval and flags more than 10 as a flood', () => {
    const events = [...burst(10, T0, 9 * MIN), ...burst(11, T0 + 10 * MIN, 9 * MIN)];
    expect(ratePerInterval(events, T0, T0 + 20 * MIN)).toEqual([
      { start: T0, count: 10, flood: false },
      { start: T0 + 10 * MIN, count: 11, flood: true },
    ]);
  });

  it('does not count shelved or suppressed raises, nor clears and acknowledgements', () => {
    const events: HealthEvent[] = [
      raise('a', T0),
      raise('b', T0 + 1000, 'shelved'),
      raise('c', T0 + 2000, 'suppressed'),
      { alarmId: 'a', at: T0 + 3000, kind: 'acknowledge' },
      { alarmId: 'a', at: T0 + 4000, kind: 'clear' },
    ];
    expect(recentRaiseCount(events, T0 + 5 * MIN)).toBe(1);
  });

  it('reports a flood now when more than 10 alarms arrived in the last 10 minutes', () => {
    const events = burst(11, T0, 5 * MIN);
    expect(alarmHealth(events, [], T0, T0 + 6 * MIN)).toMatchObject({ recentCount: 11, flooding: true });
    expect(alarmHealth(events, [], T0, T0 + 11 * MIN).flooding).toBe(false);
  });

  it('averages the rate over the intervals of the window', () => {
    const events = [...burst(6, T0, MIN), ...burst(2, T0 + 25 * MIN, MIN)];
    expect(alarmHealth(events, [], T0, T0 + 30 * MIN).averagePerInterval).toBeCloseTo(8 / 3, 12);
  });
});

describe('chattering alarms', () => {
  it('flags an alarm raised 3 times within 60 s', () => {
    const events = [raise('flow.y.L', T0), raise('flow.y.L', T0 + 20_000), raise('flow.y.L', T0 + 60_000), raise('other', T0)];
    expect(chatteringAlarms(events)).toEqual([{ alarmId: 'flow.y.L', raises: 3, since: T0 }]);
  });

  it('does not flag 3 raises spread over more than 60 s', () => {
    const events = [raise('flow.y.L', T0), raise('flow.y.L', T0 + 30_000), raise('flow.y.L', T0 + 60_001)];
    expect(chatteringAlarms(events)).toEqual([]);
  });

  it('counts hidden raises, since a shelved chattering alarm still needs fixing', () => {
    const events = [raise('flow.y.L', T0, 'shelved'), raise('flow.y.L', T0 + 1000, 'shelved'), raise('flow.y.L', T0 + 2000, 'shelved')];
    expect(chatteringAlarms(events).map((c) => c.alarmId)).toEqual(['flow.y.L']);
  });

  it('reports the busiest window of an alarm, whatever the order of the history', () => {
    const times = [T0 + 500_000, T0, T0 + 10_000, T0 + 20_000, T0 + 30_000];
    expect(chatteringAlarms(times.map((t) => raise('stale.H', t)))).toEqual([{ alarmId: 'stale.H', raises: 4, since: T0 }]);
  });
});

describe('stale alarms', () => {
  it('flags alarms active for more than 24 h, oldest first', () => {
    const now = T0 + 48 * HOUR;
    const active = [
      { id: 'waterSupply.H', raisedAt: now - 25 * HOUR },
      { id: 'flow.x.L', raisedAt: now - 23 * HOUR },
      { id: 'waterReturn.z.H', raisedAt: now - 30 * HOUR },
    ];
    expect(staleAlarms(active, now)).toEqual([
      { alarmId: 'waterReturn.z.H', raisedAt: now - 30 * HOUR, activeForMs: 30 * HOUR },
      { alarmId: 'waterSupply.H', raisedAt: now - 25 * HOUR, activeForMs: 25 * HOUR },
    ]);
  });
});
