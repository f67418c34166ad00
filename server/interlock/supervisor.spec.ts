import pino from 'pino';
import { describe, expect, it } from 'vitest';
import type { AlarmsMessage } from '../../shared/alarms/alarm-api.js';
import { DEMO_CALIBRATION } from '../../shared/field/demo-calibration.js';
import { fieldFromCurrents } from '../../shared/field/field-vector.js';
import type { ControllerStatus } from '../../shared/telemetry/messages.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { AlarmBook } from '../alarms/alarm-book.js';
import type { AlarmEvent } from '../alarms/alarm-state.js';
import { DEMO_ALARM_LIMITS } from '../alarms/demo-alarm-limits.js';
import type { AdmittedMessage } from '../ingest/frame-gate.js';
import { LiveStore } from '../live/live-store.js';
import { fastFrame, slowFrame } from '../testing/frames.js';
import { Interlock, type ResetRecord, type TripRecord } from './interlock.js';
import { Supervisor, type SteeringContext } from './supervisor.js';

const T0 = Date.UTC(2026, 2, 12, 9, 0, 0);
const calibration = { ...DEMO_CALIBRATION, id: 1, version: 1, label: 'demo' };

/**
 * The supervisor's order and its controller-status rules, with real live state, alarm book and
 * interlock and a fake clock; the outputs (commands, records, mail, fan-out) are collected.
 */
function rig(steering?: SteeringContext) {
  let now = T0;
  const live = new LiveStore();
  const interlock = new Interlock();
  const book = new AlarmBook(DEMO_ALARM_LIMITS, { clock: () => now });
  const out = {
    commands: [] as { topic: string; payload: { reason: string } }[],
    trips: [] as TripRecord[],
    resets: [] as ResetRecord[],
    events: [] as AlarmEvent[],
    mails: 0,
    alarms: [] as AlarmsMessage[],
    order: [] as string[],
  };
  /** Set to make the next record write fail. */
  const storage = { failing: false };
  const write = async <T>(list: T[], item: T, name: string) => {
    await Promise.resolve();
    if (storage.failing) throw new Error('database unavailable');
    list.push(item);
    out.order.push(name);
  };
  const supervisor = new Supervisor({
    live,
    interlock,
    book,
    records: {
      recordTrip: (t) => write(out.trips, t, 'record'),
      recordReset: (r) => write(out.resets, r, 'reset record'),
      addAlarmEvents: (e) => out.events.push(...e),
    },
    notifier: { trip: () => (out.mails++, out.order.push('mail')), alarmEvents: () => undefined },
    sink: { publishAlarms: (m) => out.alarms.push(m) },
    log: pino({ level: 'silent' }),
    now: () => now,
    steering,
  });
  supervisor.attach({ publish: (topic, payload) => (out.commands.push({ topic, payload: JSON.parse(payload) }), out.order.push(topic)) });
  let seq = 0;
  const deliver = (message: AdmittedMessage) => {
    if (message.kind === 'fast') {
      const mean = { x: message.frame.currentA.x[1], y: message.frame.currentA.y[1], z: message.frame.currentA.z[1] };
      live.applyFast(message.frame, mean, fieldFromCurrents(calibration, mean), calibration, now);
    } else if (message.kind === 'slow') live.applySlow(message.frame);
    else live.applyStatus(message.status);
    supervisor.observe({ message, live: live.snapshot(), lastFrameAtMs: live.lastFrameAtMs() });
  };
  const frame = (current = { x: 5, y: 4, z: 6 }) => {
    deliver({ kind: 'slow', frame: slowFrame(seq, now) });
    deliver({ kind: 'fast', frame: fastFrame(seq++, now, current) });
  };
  const fast = (current: { x: number; y: number; z: number }) => deliver({ kind: 'fast', frame: fastFrame(seq++, now, current) });
  const status = (s: Partial<ControllerStatus>) =>
    deliver({ kind: 'status', status: { online: true, tMs: now, hardwareTripped: false, hardwareTripCause: null, hardwareTripAxis: null, softwareHold: false, mode: 'remote', ...s } });
  return { supervisor, interlock, out, storage, frame, fast, status, deliver, advance: (ms: number) => (now += ms), now: () => now };
}

describe('Supervisor', () => {
  it('does not count a controller as offline when its telemetry overtakes its first status', () => {
    const r = rig();
    r.frame();
    r.advance(20);
    r.frame();
    r.status({ online: true });
    expect(r.interlock.state().state).toBe('ok');
    expect(r.out.commands).toEqual([]);
  });

  it('trips on the last will and publishes the trip command before recording, and mails once the record is stored', async () => {
    const r = rig();
    r.frame();
    r.status({ online: true });
    r.advance(20);
    r.status({ online: false });
    expect(r.interlock.state().firstOut?.condition).toBe('controller-offline');
    expect(r.out.order).toEqual([TOPICS.trip]);
    await flushPromises();
    expect(r.out.order).toEqual([TOPICS.trip, 'record', 'mail']);
    expect(r.out.commands[0].payload.reason).toMatch(/controller-offline/);
    expect(r.out.alarms.at(-1)?.interlock).toMatchObject({ state: 'tripped', firstOut: { condition: 'controller-offline' } });
  });

  it('judges over-current on the largest sample of a frame, not on its mean', () => {
    const r = rig();
    r.frame();
    r.advance(20);
    const spiky = fastFrame(1, r.now(), { x: 5, y: 4, z: 6 });
    spiky.currentA.y[7] = -20.5;
    r.deliver({ kind: 'fast', frame: spiky });
    expect(r.interlock.state().firstOut).toMatchObject({ condition: 'over-current-y', value: 20.5 });
  });

  it('sends the trip command again to a controller that is online but not holding, at most once a second', async () => {
    const r = rig();
    r.frame();
    r.advance(20);
    r.frame({ x: 21, y: 4, z: 6 });
    expect(r.out.commands.map((c) => c.topic)).toEqual([TOPICS.trip]);
    r.status({ online: true, softwareHold: true });
    r.advance(2000);
    r.frame({ x: 0, y: 0, z: 0 });
    expect(r.out.commands).toHaveLength(1);
    // The controller restarted: online, not holding.
    r.status({ online: true, softwareHold: false });
    r.advance(500);
    r.frame({ x: 0, y: 0, z: 0 });
    expect(r.out.commands.map((c) => c.topic)).toEqual([TOPICS.trip, TOPICS.trip]);
    await flushPromises();
    expect(r.out.trips).toHaveLength(1);
  });

  it('records the reset first, then publishes the release command and announces the interlock back to ok', async () => {
    const r = rig();
    r.frame();
    r.advance(20);
    r.frame({ x: 21, y: 4, z: 6 });
    r.advance(20);
    r.frame();
    expect(await r.supervisor.resetInterlock('operator@tiltwatch.example', 'supply x checked')).toMatchObject({ ok: true });
    expect(r.out.order.indexOf('reset record')).toBeLessThan(r.out.order.indexOf(TOPICS.release));
    expect(r.out.order.indexOf('reset record')).toBeGreaterThan(-1);
    expect(r.out.commands.at(-1)).toMatchObject({ topic: TOPICS.release, payload: { reason: 'Interlock reset by operator@tiltwatch.example: supply x checked' } });
    expect(r.out.alarms.at(-1)?.interlock.state).toBe('ok');
  });

  it('keeps the latch closed and releases nothing when the reset cannot be recorded', async () => {
    const r = rig();
    r.frame();
    r.advance(20);
    r.frame({ x: 21, y: 4, z: 6 });
    r.advance(20);
    r.frame();
    r.storage.failing = true;
    const result = await r.supervisor.resetInterlock('operator@tiltwatch.example', 'supply x checked');
    expect(result).toMatchObject({ ok: false, code: 'not-recorded' });
    expect(r.interlock.state().state).toBe('tripped');
    expect(r.out.commands.map((c) => c.topic)).not.toContain(TOPICS.release);
    r.storage.failing = false;
    expect(await r.supervisor.resetInterlock('operator@tiltwatch.example', 'supply x checked')).toMatchObject({ ok: true });
  });

  it('refuses a reset while the hardware trip is latched and keeps the controller held', async () => {
    const r = rig();
    r.frame();
    r.advance(20);
    r.frame({ x: 21, y: 4, z: 6 });
    r.status({ online: true, softwareHold: true, hardwareTripped: true, hardwareTripCause: 'over-current' });
    r.advance(20);
    r.frame({ x: 0, y: 0, z: 0 });
    expect(await r.supervisor.resetInterlock('operator@tiltwatch.example', 'supply x checked')).toMatchObject({ ok: false, code: 'hardware-tripped' });
    expect(r.out.commands.map((c) => c.topic)).toEqual([TOPICS.trip]);
  });

  it('shows a controller found holding at start with no trip on record as tripped, first-out unknown', async () => {
    const r = rig();
    r.status({ online: true, softwareHold: true });
    expect(r.interlock.state()).toMatchObject({ state: 'tripped', firstOut: { condition: 'found-at-start' } });
    await flushPromises();
    expect(r.out.trips).toHaveLength(1);
    expect(r.out.alarms.at(-1)?.interlock).toMatchObject({ state: 'tripped', firstOut: { condition: 'found-at-start' } });
  });

  it('compares only the first status after start with the latch: a hold after a trip of its own is no finding', () => {
    const r = rig();
    r.frame();
    r.status({ online: true });
    r.advance(20);
    r.frame({ x: 21, y: 4, z: 6 });
    r.status({ online: true, softwareHold: true });
    expect(r.interlock.state().firstOut?.condition).toBe('over-current-x');
  });

  it('evaluates nothing after supervision ended, so a controller that goes away then does not trip', () => {
    const r = rig();
    r.frame();
    r.status({ online: true });
    r.supervisor.close();
    r.advance(20);
    r.status({ online: false });
    r.advance(5000);
    r.supervisor.evaluate();
    expect(r.interlock.state().state).toBe('ok');
    expect(r.out.commands).toEqual([]);
  });

  it('refreshes present values of active alarms at most every 250 ms, and announces state changes at once', () => {
    const r = rig();
    r.frame();
    r.advance(20);
    r.frame({ x: 18.5, y: 4, z: 6 });
    r.advance(300);
    r.frame({ x: 18.5, y: 4, z: 6 });
    const raised = r.out.alarms.at(-1)!;
    expect(raised.active.map((a) => a.id)).toContain('current.x.H');
    const count = r.out.alarms.length;
    r.advance(20);
    r.fast({ x: 18.9, y: 4, z: 6 });
    expect(r.out.alarms).toHaveLength(count);
    r.advance(250);
    r.fast({ x: 19.2, y: 4, z: 6 });
    const refreshed = r.out.alarms.at(-1)!;
    expect(r.out.alarms).toHaveLength(count + 1);
    expect(refreshed.revision).toBe(raised.revision);
    expect(refreshed.active.find((a) => a.id === 'current.x.H')).toMatchObject({ value: 19.2, valueAtRaise: 18.5 });
  });

  it('raises the field-angle deviation alarm against the steering target, and suppresses it while a ramp is programmed', () => {
    const measured = fieldFromCurrents(calibration, { x: 5, y: 4, z: 6 }).vector;
    // A target 90° away from the measured direction (perpendicular in the x–y plane of the field).
    const target = { x: -measured.y, y: measured.x, z: 0 };
    let rampProgrammed = true;
    const r = rig({ alarmContext: () => ({ targetDirection: target, rampProgrammed }) });
    for (let i = 0; i < 50; i++) {
      r.frame();
      r.advance(20);
    }
    const angleAlarm = () => r.supervisor.alarmsMessage().active.find((a) => a.id === 'fieldAngleDeviation.H');
    // While the ramp is programmed the condition is logged, hidden as suppressed, not annunciated.
    const hiddenRaise = r.out.events.find((e) => e.alarmId === 'fieldAngleDeviation.H' && e.kind === 'raise');
    expect(hiddenRaise).toMatchObject({ hidden: 'suppressed' });
    expect(hiddenRaise!.value).toBeCloseTo(90, 6);
    expect(angleAlarm()?.state ?? 'not listed').not.toMatch(/^unacknowledged|^acknowledged/);
    rampProgrammed = false;
    for (let i = 0; i < 50; i++) {
      r.frame();
      r.advance(20);
    }
    expect(angleAlarm()).toMatchObject({ state: expect.stringMatching(/unacknowledged/) });
  });

  it('has no field-angle deviation without a target', () => {
    const r = rig({ alarmContext: () => ({ targetDirection: null, rampProgrammed: false }) });
    for (let i = 0; i < 50; i++) {
      r.frame();
      r.advance(20);
    }
    expect(r.out.events.filter((e) => e.alarmId === 'fieldAngleDeviation.H')).toEqual([]);
  });
});

/** Lets the pending promise callbacks (stored records, mail after them) run. */
async function flushPromises(): Promise<void> {
  for (let i = 0; i < 5; i++) await Promise.resolve();
}
