import { describe, expect, it } from 'vitest';
import { composeAlarmNotice, composeTripNotice, needsOnCallNotice, parseNoticeOptions, SUPERVISORY_CAUTION } from './compose-notice.js';
import { Interlock } from '../interlock/interlock.js';
import { DEMO_ALARM_LIMITS } from '../alarms/demo-alarm-limits.js';
import type { AlarmEvent } from '../alarms/alarm-state.js';

// 2026-03-12 13:03:07 UTC is 14:03:07 in Stockholm (CET, UTC+1, before the switch to summer time on 29 March).
const AT = Date.UTC(2026, 2, 12, 13, 3, 7, 123);
const options = { onCall: ['oncall@lindqvist-hall.example'], site: 'Lindqvist Hall dipolar lab', timeZone: 'Europe/Stockholm' };

function flowTrip() {
  const interlock = new Interlock();
  return interlock.evaluate(
    { values: { 'flow.x': 0.62, 'temperature.x': 47.5, 'current.x': 14 }, lastFrameAtMs: AT - 20, controllerOnline: true, hardwareTripped: false },
    AT,
  )!;
}

describe('composeTripNotice', () => {
  const notice = composeTripNotice(flowTrip(), options);

  it('names the first-out condition with value and unit in the subject', () => {
    expect(notice.subject).toBe('[Tiltwatch] Interlock tripped at Lindqvist Hall dipolar lab: Coolant flow x 0.62 L/min');
    expect(notice.to).toEqual(['oncall@lindqvist-hall.example']);
  });

  it('gives the time of the trip in local time and UTC', () => {
    expect(notice.text).toMatch(/Tripped at: {2}12 Mar 2026, 14:03:07 CET \(local\)/);
    expect(notice.text).toContain('2026-03-12T13:03:07.123Z (UTC)');
  });

  it('lists every condition at the moment of the trip, marking the ones that tripped', () => {
    expect(notice.text).toContain('TRIPPED  Coolant flow x: 0.62 L/min (trips below 1.00 L/min)');
    expect(notice.text).toContain('ok       Coil temperature x: 47.5 °C (trips above 65.0 °C)');
    expect(notice.text).toContain('-        Coil current y: no data (trips above 20.0 A)');
  });

  it('ends with the caution that the hardware interlocks remain authoritative', () => {
    expect(notice.text.trimEnd().endsWith(SUPERVISORY_CAUTION)).toBe(true);
    expect(SUPERVISORY_CAUTION).toMatch(/hardware\s+interlocks .* remain authoritative/);
  });
});

describe('composeAlarmNotice', () => {
  const limit = DEMO_ALARM_LIMITS.find((l) => l.id === 'temperature.z.HH')!;
  const event: AlarmEvent = {
    alarmId: limit.id,
    channel: limit.channel,
    priority: limit.priority,
    kind: 'raise',
    at: AT,
    from: 'normal',
    to: 'unacknowledged',
    value: 61.04,
    limit: 60,
    firstOutOf: 'flow.z.LL',
  };
  const notice = composeAlarmNotice(event, limit, options);

  it('states the value against its limit with units', () => {
    expect(notice.subject).toBe('[Tiltwatch] High-priority alarm at Lindqvist Hall dipolar lab: Coil temperature z 61.0 °C (HH 60.0 °C)');
    expect(notice.text).toContain('Coil temperature z: 61.0 °C, above the HH limit of 60.0 °C.');
  });

  it('carries the rationale and the time to respond', () => {
    expect(notice.text).toContain(`What to do:          ${limit.rationale.action}`);
    expect(notice.text).toContain('Respond within:      1 min');
  });

  it('points to the first-out alarm it is grouped under', () => {
    expect(notice.text).toContain('Grouped under the first-out alarm flow.z.LL');
  });

  it('gives local and UTC time and the supervisory caution', () => {
    expect(notice.text).toContain('14:03:07 CET (local)');
    expect(notice.text).toContain('2026-03-12T13:03:07.123Z (UTC)');
    expect(notice.text).toContain(SUPERVISORY_CAUTION);
  });
});

describe('needsOnCallNotice', () => {
  const base: AlarmEvent = { alarmId: 'stale.H', channel: 'stale', priority: 'high', kind: 'raise', at: AT, from: 'normal', to: 'unacknowledged', value: 900, limit: 500 };

  it('pages for annunciated raises of high-priority alarms only', () => {
    expect(needsOnCallNotice(base)).toBe(true);
    expect(needsOnCallNotice({ ...base, priority: 'medium' })).toBe(false);
    expect(needsOnCallNotice({ ...base, kind: 'acknowledge' })).toBe(false);
    expect(needsOnCallNotice({ ...base, hidden: 'shelved' })).toBe(false);
  });
});

describe('parseNoticeOptions', () => {
  it('accepts a valid on-call list, site and time zone', () => {
    expect(parseNoticeOptions(options)).toEqual(options);
  });

  it('says what to fix', () => {
    expect(() => parseNoticeOptions({ ...options, onCall: ['not an address'] })).toThrow(/list of e-mail addresses/);
    expect(() => parseNoticeOptions({ ...options, site: ' ' })).toThrow(/site must name the lab/);
    expect(() => parseNoticeOptions({ ...options, timeZone: 'Lindqvist/Hall' })).toThrow(/not a known IANA time zone/);
  });
});
