import { describe, expect, it } from 'vitest';
import { Interlock } from './interlock.js';
import { interlockInputs, type InterlockInputs } from './trip-conditions.js';
import { DEMO_INTERLOCK_CONFIG } from './interlock-config.js';
import { channelValues } from '../alarms/channel-values.js';
import type { ChannelValues } from '../alarms/channels.js';
import type { LiveState } from '../../shared/live/live-state.js';

const T0 = Date.UTC(2026, 2, 12, 9, 0, 0);

const healthy: ChannelValues = {
  'current.x': 8,
  'current.y': 4,
  'current.z': 12,
  'temperature.x': 38,
  'temperature.y': 31,
  'temperature.z': 42,
  'flow.x': 3.1,
  'flow.y': 3.2,
  'flow.z': 2.9,
};

/** Inputs at `nowMs` with a frame that arrived 20 ms earlier. */
function inputs(nowMs: number, values: ChannelValues = {}, more: Partial<InterlockInputs> = {}): InterlockInputs {
  return { values: { ...healthy, ...values }, lastFrameAtMs: nowMs - 20, controllerOnline: true, hardwareTripped: false, ...more };
}

/** An interlock that has seen healthy data at T0. */
function armed(): Interlock {
  const interlock = new Interlock();
  expect(interlock.evaluate(inputs(T0), T0)).toBeNull();
  return interlock;
}

describe('Interlock: revision', () => {
  it('changes when a condition starts or stops holding and on the trip, not on new values alone', () => {
    const interlock = armed();
    const quiet = interlock.revision();
    interlock.evaluate(inputs(T0 + 20, { 'current.x': 9 }), T0 + 20);
    expect(interlock.revision()).toBe(quiet);
    interlock.evaluate(inputs(T0 + 40, { 'current.x': 20.5 }), T0 + 40);
    const tripped = interlock.revision();
    expect(tripped).not.toBe(quiet);
    interlock.evaluate(inputs(T0 + 60, { 'current.x': 20.7 }), T0 + 60);
    expect(interlock.revision()).toBe(tripped);
    interlock.evaluate(inputs(T0 + 80), T0 + 80);
    expect(interlock.revision()).not.toBe(tripped);
  });
});

describe('Interlock: trip conditions', () => {
  const channelCases: [string, ChannelValues][] = [
    ['over-current-x', { 'current.x': 20.5 }],
    ['over-current-y', { 'current.y': 20.5 }],
    ['over-current-z', { 'current.z': 20.5 }],
    ['over-temperature-x', { 'temperature.x': 65.5 }],
    ['over-temperature-y', { 'temperature.y': 65.5 }],
    ['over-temperature-z', { 'temperature.z': 65.5 }],
    ['low-flow-x', { 'flow.x': 0.8 }],
    ['low-flow-y', { 'flow.y': 0.8 }],
    ['low-flow-z', { 'flow.z': 0.8 }],
  ];

  it.each(channelCases)('trips on %s beyond its trip level', (condition, values) => {
    const interlock = armed();
    const trip = interlock.evaluate(inputs(T0 + 100, values), T0 + 100);
    expect(trip?.firstOut.condition).toBe(condition);
    expect(interlock.state().state).toBe('tripped');
  });

  it('does not trip at exactly the trip levels', () => {
    const interlock = armed();
    const atLevel = { 'current.x': 20, 'temperature.y': 65, 'flow.z': 1 };
    expect(interlock.evaluate(inputs(T0 + 100, atLevel), T0 + 100)).toBeNull();
  });

  it('trips on a negative current beyond the trip level, since the supplies are bipolar', () => {
    const state = demoLive({ currents: { x: -20.4, y: 0, z: 0 } });
    const interlock = new Interlock();
    const trip = interlock.evaluate(interlockInputs(state, channelValues(state, T0, { lastFrameAtMs: T0 - 20 }), T0 - 20), T0);
    expect(trip?.firstOut).toMatchObject({ condition: 'over-current-x', channel: 'current.x', value: 20.4, limit: 20 });
  });

  it('trips when the controller goes offline', () => {
    const interlock = armed();
    expect(interlock.evaluate(inputs(T0 + 50, {}, { controllerOnline: false }), T0 + 50)?.firstOut.condition).toBe('controller-offline');
  });

  it('trips when telemetry is older than the stale limit (default 250 ms)', () => {
    const interlock = armed();
    const last = T0;
    expect(interlock.evaluate(inputs(T0 + 250, {}, { lastFrameAtMs: last }), T0 + 250)).toBeNull();
    const trip = interlock.evaluate(inputs(T0 + 251, {}, { lastFrameAtMs: last }), T0 + 251);
    expect(trip?.firstOut).toMatchObject({ condition: 'telemetry-stale', value: 251, limit: 250 });
  });

  it('does not arm the offline and stale conditions before the first telemetry frame', () => {
    const interlock = new Interlock();
    const beforeFirstFrame = { values: {}, lastFrameAtMs: null, controllerOnline: false, hardwareTripped: false };
    expect(interlock.evaluate(beforeFirstFrame, T0 + 60_000)).toBeNull();
    expect(interlock.conditions().filter((c) => c.value !== null).map((c) => c.name)).toEqual(['frame-loss']);
  });

  it('trips when more than 5 fast frames are lost within 1 s', () => {
    const interlock = armed();
    interlock.observeFrame(100, T0);
    interlock.observeFrame(103, T0 + 100); // 2 lost
    interlock.observeFrame(106, T0 + 200); // 2 lost
    expect(interlock.evaluate(inputs(T0 + 200), T0 + 200)).toBeNull();
    interlock.observeFrame(108, T0 + 300); // 1 lost: 5 in total, not more than 5
    expect(interlock.evaluate(inputs(T0 + 300), T0 + 300)).toBeNull();
    interlock.observeFrame(110, T0 + 400); // 1 lost: 6
    expect(interlock.evaluate(inputs(T0 + 400), T0 + 400)?.firstOut).toMatchObject({ condition: 'frame-loss', value: 6, limit: 5 });
  });

  it('lists every condition with its channel, value, limit and margin', () => {
    const interlock = armed();
    const conditions = interlock.conditions();
    expect(conditions).toHaveLength(12);
    expect(conditions.find((c) => c.name === 'over-temperature-z')).toMatchObject({
      channel: 'temperature.z',
      active: false,
      value: 42,
      limit: 65,
      margin: 23,
      unit: '°C',
      valueText: '42.0 °C',
      tripsWhen: 'above 65.0 °C',
    });
    expect(conditions.find((c) => c.name === 'low-flow-x')?.margin).toBeCloseTo(2.1, 12);
    expect(conditions.find((c) => c.name === 'controller-offline')).toMatchObject({ value: 1, margin: null, valueText: 'online' });
  });
});

describe('Interlock: latch and first-out', () => {
  it('returns the trip exactly once and stays latched after the cause clears', () => {
    const interlock = armed();
    expect(interlock.evaluate(inputs(T0 + 100, { 'flow.y': 0.6 }), T0 + 100)).not.toBeNull();
    expect(interlock.evaluate(inputs(T0 + 120, { 'flow.y': 0.6 }), T0 + 120)).toBeNull();
    expect(interlock.evaluate(inputs(T0 + 140, {}), T0 + 140)).toBeNull();
    expect(interlock.state().state).toBe('tripped');
  });

  it('keeps the first condition as first-out when others follow', () => {
    const interlock = armed();
    interlock.evaluate(inputs(T0 + 100, { 'flow.x': 0.7 }), T0 + 100);
    interlock.evaluate(inputs(T0 + 5000, { 'flow.x': 0.7, 'temperature.x': 66 }), T0 + 5000);
    expect(interlock.state().firstOut).toEqual({ condition: 'low-flow-x', channel: 'flow.x', value: 0.7, limit: 1, at: T0 + 100 });
  });

  it('records the values of every condition at the moment of the trip', () => {
    const interlock = armed();
    const trip = interlock.evaluate(inputs(T0 + 100, { 'temperature.z': 66.2 }), T0 + 100)!;
    interlock.evaluate(inputs(T0 + 200, { 'temperature.z': 70 }), T0 + 200);
    expect(interlock.state().trip?.valuesAtTrip.find((c) => c.name === 'over-temperature-z')?.value).toBe(66.2);
    expect(trip.valuesAtTrip.find((c) => c.name === 'low-flow-z')).toMatchObject({ value: 2.9, active: false });
    expect(trip.reason).toBe('Software interlock tripped by over-temperature-z: Coil temperature z: 66.2 °C (trips above 65.0 °C)');
  });

  it('breaks a tie within one evaluation by the condition order, flow before temperature', () => {
    const interlock = armed();
    const trip = interlock.evaluate(inputs(T0 + 100, { 'temperature.x': 70, 'flow.x': 0.5 }), T0 + 100);
    expect(trip?.firstOut.condition).toBe('low-flow-x');
  });

  it('reports the hardware trip from the controller beside the software state', () => {
    const interlock = new Interlock();
    interlock.evaluate(inputs(T0, {}, { hardwareTripped: true }), T0);
    expect(interlock.state()).toMatchObject({ state: 'ok', firstOut: null, hardwareTripped: true });
  });
});

describe('Interlock: reset', () => {
  function trippedOnFlow(): Interlock {
    const interlock = armed();
    interlock.evaluate(inputs(T0 + 100, { 'flow.x': 0.7 }), T0 + 100);
    return interlock;
  }

  it('refuses a reset without a reason', () => {
    const interlock = trippedOnFlow();
    interlock.evaluate(inputs(T0 + 200), T0 + 200);
    expect(interlock.reset('operator@tiltwatch.example', '  ', T0 + 300)).toMatchObject({ ok: false, code: 'reason-required' });
    expect(interlock.state().state).toBe('tripped');
  });

  it('refuses a reset while a condition holds and lists the conditions still active', () => {
    const interlock = trippedOnFlow();
    interlock.evaluate(inputs(T0 + 200, { 'flow.x': 0.7, 'temperature.x': 66 }), T0 + 200);
    const result = interlock.reset('operator@tiltwatch.example', 'flow checked', T0 + 300);
    expect(result.ok).toBe(false);
    if (result.ok || result.code !== 'conditions-active') throw new Error('expected conditions-active');
    expect(result.active.map((c) => c.name)).toEqual(['low-flow-x', 'over-temperature-x']);
    expect(result.message).toContain('Coolant flow x: 0.70 L/min (trips below 1.00 L/min)');
    expect(interlock.state().state).toBe('tripped');
  });

  it('resets once every condition has cleared, keeping a record of who and why', () => {
    const interlock = trippedOnFlow();
    interlock.evaluate(inputs(T0 + 5000), T0 + 5000);
    const result = interlock.reset('operator@tiltwatch.example', 'valve x reopened', T0 + 5100);
    expect(result).toMatchObject({ ok: true, reset: { at: T0 + 5100, actor: 'operator@tiltwatch.example', reason: 'valve x reopened' } });
    expect(interlock.state()).toMatchObject({ state: 'ok', firstOut: null, trip: null, lastReset: { reason: 'valve x reopened' } });
  });

  it('measures staleness again at the time of the reset', () => {
    const interlock = armed();
    interlock.evaluate(inputs(T0 + 300, {}, { lastFrameAtMs: T0 }), T0 + 300);
    interlock.evaluate(inputs(T0 + 400), T0 + 400);
    const result = interlock.reset('op', 'network switch replaced', T0 + 10_000);
    expect(result).toMatchObject({ ok: false, code: 'conditions-active' });
  });

  it('trips again after a reset', () => {
    const interlock = trippedOnFlow();
    interlock.evaluate(inputs(T0 + 5000), T0 + 5000);
    interlock.reset('op', 'valve reopened', T0 + 5000);
    expect(interlock.evaluate(inputs(T0 + 6000, { 'current.z': 21 }), T0 + 6000)?.firstOut.condition).toBe('over-current-z');
  });

  it("refuses a reset while the controller's hardware trip is latched, even with every condition clear", () => {
    const interlock = trippedOnFlow();
    interlock.evaluate(inputs(T0 + 5000, {}, { hardwareTripped: true }), T0 + 5000);
    const result = interlock.reset('op', 'valve x reopened', T0 + 5100);
    expect(result).toMatchObject({ ok: false, code: 'hardware-tripped' });
    if (result.ok) throw new Error('expected a refusal');
    expect(result.message).toMatch(/at the apparatus first/);
    expect(interlock.state().state).toBe('tripped');
    interlock.evaluate(inputs(T0 + 6000), T0 + 6000);
    expect(interlock.reset('op', 'hardware trip cleared at the controller', T0 + 6100)).toMatchObject({ ok: true });
  });

  it('keeps the latch closed until a prepared reset is committed, and closed when it is cancelled', () => {
    const interlock = trippedOnFlow();
    interlock.evaluate(inputs(T0 + 5000), T0 + 5000);
    const first = interlock.prepareReset('op', 'valve x reopened', T0 + 5100);
    if (!first.ok) throw new Error(first.message);
    expect(interlock.state().state).toBe('tripped');
    expect(interlock.prepareReset('op', 'a second try', T0 + 5150)).toMatchObject({ ok: false, code: 'reset-in-progress' });
    first.cancel();
    expect(interlock.state()).toMatchObject({ state: 'tripped', lastReset: null });
    const second = interlock.prepareReset('op', 'valve x reopened', T0 + 5200);
    if (!second.ok) throw new Error(second.message);
    second.commit();
    expect(interlock.state()).toMatchObject({ state: 'ok', lastReset: { at: T0 + 5200 } });
  });

  it('latches a trip with an unknown first-out for a controller found holding at start', () => {
    const interlock = armed();
    const trip = interlock.foundAtStart(T0 + 50);
    expect(trip).toMatchObject({ at: T0 + 50, firstOut: { condition: 'found-at-start', value: null } });
    expect(trip?.reason).toMatch(/found at start/);
    expect(interlock.state().state).toBe('tripped');
    expect(interlock.foundAtStart(T0 + 60)).toBeNull();
  });

  it('refuses a reset when nothing is tripped', () => {
    const interlock = armed();
    expect(interlock.reset('op', 'just checking', T0 + 10)).toMatchObject({ ok: false, code: 'not-tripped' });
  });

  it('keeps a trip restored after a restart latched until it is reset, without reporting it again', () => {
    const before = trippedOnFlow();
    const trip = before.state().trip!;
    const after = new Interlock();
    after.restore(trip);
    expect(after.evaluate(inputs(T0 + 5000), T0 + 5000)).toBeNull();
    expect(after.state()).toMatchObject({ state: 'tripped', firstOut: { condition: 'low-flow-x' } });
    expect(after.reset('op', 'valve x reopened before the restart', T0 + 5100)).toMatchObject({ ok: true, reset: { trip } });
    expect(() => before.restore(trip)).toThrow(/already tripped/);
  });
});

describe('Interlock: configuration', () => {
  it('uses the demo trip levels by default', () => {
    expect(new Interlock().config).toEqual(DEMO_INTERLOCK_CONFIG);
  });

  it('trips at a configured stale limit', () => {
    const interlock = new Interlock({ ...DEMO_INTERLOCK_CONFIG, staleMs: 1000 });
    interlock.evaluate(inputs(T0), T0);
    expect(interlock.evaluate(inputs(T0 + 900, {}, { lastFrameAtMs: T0 }), T0 + 900)).toBeNull();
    expect(interlock.evaluate(inputs(T0 + 1001, {}, { lastFrameAtMs: T0 }), T0 + 1001)).not.toBeNull();
  });
});

function demoLive(overrides: Partial<LiveState>): LiveState {
  return {
    time: new Date(T0).toISOString(),
    currents: { x: 0, y: 0, z: 0 },
    setpoints: { x: 0, y: 0, z: 0 },
    voltageV: { x: 0, y: 0, z: 0 },
    temperatureC: { x: 30, y: 30, z: 30 },
    flowLpm: { x: 3, y: 3, z: 3 },
    waterSupplyC: 18,
    waterReturnC: { x: 20, y: 20, z: 20 },
    field: null,
    fieldUncertainty: null,
    calibration: null,
    controller: {
      online: true,
      tripped: false,
      hardwareTripped: false,
      hardwareTripCause: null,
      softwareHold: false,
      mode: 'demo',
      lastFrameAt: new Date(T0 - 10).toISOString(),
    },
    prediction: null,
    predictionStatus: { state: 'applies', fieldG: 10, minFieldG: 0.5, reason: null },
    ...overrides,
  };
}
