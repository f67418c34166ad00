import { describe, expect, it } from 'vitest';
import { parseAlarmLimit, parseAlarmLimits } from './alarm-limit.js';
import { DEMO_ALARM_LIMITS } from './demo-alarm-limits.js';
import { DEMO_LEVEL_SET } from '../levels/demo-levels.js';
import { AXES } from '../../shared/telemetry/messages.js';

const valid = {
  id: 'flow.z.L',
  channel: 'flow.z',
  level: 'L',
  limit: 1.5,
  deadband: 0.2,
  onDelayMs: 1000,
  offDelayMs: 3000,
  priority: 'medium',
  latching: false,
  rationale: { cause: 'valve', consequence: 'warm coil', action: 'open the valve', respondWithinMin: 10 },
};

describe('parseAlarmLimit', () => {
  it('accepts a complete limit and defaults suppressDuringRamp to false', () => {
    expect(parseAlarmLimit(valid)).toEqual({ ...valid, suppressDuringRamp: false });
  });

  it('names an unknown channel and lists the known ones', () => {
    expect(() => parseAlarmLimit({ ...valid, channel: 'flow.w' })).toThrow(/channel must be one of: current\.x/);
  });

  it('says what to fix for a negative deadband, a fractional delay and a missing rationale action, naming fields as the editor labels them', () => {
    const bad = { ...valid, deadband: -1, onDelayMs: 2.5, rationale: { ...valid.rationale, action: ' ' } };
    const message = (() => {
      try {
        parseAlarmLimit(bad);
        return '';
      } catch (err) {
        return (err as Error).message;
      }
    })();
    expect(message).toContain('Deadband must be 0 or more');
    expect(message).toContain('On-delay (ms) must be a whole number of milliseconds');
    expect(message).toContain('What the operator does must not be empty');
    expect(message).not.toMatch(/onDelayMs|rationale\./);
  });

  it('rejects a non-finite limit', () => {
    expect(() => parseAlarmLimit({ ...valid, limit: Number.POSITIVE_INFINITY })).toThrow(/Limit must be a finite number/);
  });

  it('rejects unknown fields so a typo in a field name does not pass silently', () => {
    expect(() => parseAlarmLimit({ ...valid, offdelayMs: 5 })).toThrow(/offdelayMs/);
  });
});

describe('parseAlarmLimits', () => {
  it('rejects duplicate ids', () => {
    expect(() => parseAlarmLimits([valid, valid])).toThrow(/"flow.z.L" appears twice/);
  });

  it('rejects an LL level above the L level of the same channel', () => {
    expect(() => parseAlarmLimits([valid, { ...valid, id: 'flow.z.LL', level: 'LL', limit: 1.6 }])).toThrow(/on Coolant flow z, the low-low alarm \(LL\) at 1.6 L\/min must lie below the low alarm \(L\)/);
  });

  it('says which entry is wrong', () => {
    expect(() => parseAlarmLimits([valid, { ...valid, id: 'x', priority: 'urgent' }])).toThrow(/limit #2: .*Priority must be one of high, medium, low/);
  });
});

describe('DEMO_ALARM_LIMITS', () => {
  const byId = new Map(DEMO_ALARM_LIMITS.map((l) => [l.id, l]));

  it('warns before the software interlock trips', () => {
    for (const a of AXES) {
      expect(byId.get(`temperature.${a}.HH`)!.limit).toBeLessThan(DEMO_LEVEL_SET.trips.temperatureHighC);
      expect(byId.get(`flow.${a}.LL`)!.limit).toBeGreaterThan(DEMO_LEVEL_SET.trips.flowLowLpm);
      expect(byId.get(`current.${a}.H`)!.limit).toBeLessThan(DEMO_LEVEL_SET.trips.currentHighA);
    }
  });

  it('suppresses during ramps only the alarms a ramp sets off by design', () => {
    const suppressed = DEMO_ALARM_LIMITS.filter((l) => l.suppressDuringRamp).map((l) => l.channel);
    expect(suppressed.sort()).toEqual(['currentDeviation.x', 'currentDeviation.y', 'currentDeviation.z', 'fieldAngleDeviation']);
  });
});
