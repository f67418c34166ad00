import { describe, expect, it } from 'vitest';
import { parseAlarmLimit, parseAlarmLimits } from './alarm-limit.js';
import { DEMO_ALARM_LIMITS } from './demo-alarm-limits.js';
import { DEMO_CHANNEL_BANDS } from '../../shared/live/channels.js';
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
    expect(() => parseAlarmLimit({ ...valid, channel: 'flow.w' })).toThrow(/channel: channel must be one of: current\.x/);
  });

  it('says what to fix for a negative deadband, a fractional delay and a missing rationale action', () => {
    const bad = { ...valid, deadband: -1, onDelayMs: 2.5, rationale: { ...valid.rationale, action: ' ' } };
    const message = (() => {
      try {
        parseAlarmLimit(bad);
        return '';
      } catch (err) {
        return (err as Error).message;
      }
    })();
    expect(message).toContain('deadband: deadband must be 0 or more');
    expect(message).toContain('onDelayMs: onDelayMs must be a whole number of milliseconds');
    expect(message).toContain('rationale.action: rationale.action must not be empty');
  });

  it('rejects a non-finite limit', () => {
    expect(() => parseAlarmLimit({ ...valid, limit: Number.POSITIVE_INFINITY })).toThrow(/limit must be a finite number/);
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
    expect(() => parseAlarmLimits([valid, { ...valid, id: 'flow.z.LL', level: 'LL', limit: 1.6 }])).toThrow(/LL .* must lie below L/);
  });

  it('says which entry is wrong', () => {
    expect(() => parseAlarmLimits([valid, { ...valid, id: 'x', priority: 'urgent' }])).toThrow(/limit #2: .*priority must be one of high, medium, low/);
  });
});

describe('DEMO_ALARM_LIMITS', () => {
  const byId = new Map(DEMO_ALARM_LIMITS.map((l) => [l.id, l]));

  it('uses the alarm levels of the demo display bands', () => {
    for (const a of AXES) {
      expect(byId.get(`current.${a}.H`)?.limit).toBe(DEMO_CHANNEL_BANDS.current.high);
      expect(byId.get(`temperature.${a}.H`)?.limit).toBe(DEMO_CHANNEL_BANDS.temperature.high);
      expect(byId.get(`flow.${a}.L`)?.limit).toBe(DEMO_CHANNEL_BANDS.flow.low);
    }
    expect(byId.get('waterSupply.H')?.limit).toBe(DEMO_CHANNEL_BANDS.waterSupply.high);
  });

  it('warns before the software interlock trips', () => {
    for (const a of AXES) {
      expect(byId.get(`temperature.${a}.HH`)!.limit).toBeLessThan(DEMO_CHANNEL_BANDS.temperature.tripHigh!);
      expect(byId.get(`flow.${a}.LL`)!.limit).toBeGreaterThan(DEMO_CHANNEL_BANDS.flow.tripLow!);
      expect(byId.get(`current.${a}.H`)!.limit).toBeLessThan(DEMO_CHANNEL_BANDS.current.tripHigh!);
    }
  });

  it('suppresses during ramps only the alarms a ramp sets off by design', () => {
    const suppressed = DEMO_ALARM_LIMITS.filter((l) => l.suppressDuringRamp).map((l) => l.channel);
    expect(suppressed.sort()).toEqual(['currentDeviation.x', 'currentDeviation.y', 'currentDeviation.z', 'fieldAngleDeviation']);
  });
});
