import mqtt from 'mqtt';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import type { ActiveAlarm, AlarmHistoryEvent, InterlockResetRefusal, InterlockStatus } from '../../shared/alarms/alarm-api.js';
import type { Vec3 } from '../../shared/field/field-vector.js';
import type { LiveState } from '../../shared/live/live-state.js';
import type { SetpointCommand } from '../../shared/telemetry/messages.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { signIn, startStack, waitFor, type Stack } from '../support/stack.js';

type Role = 'viewer' | 'operator' | 'lead' | 'admin';
interface Mail {
  to: string[];
  subject: string;
  text: string;
  receivedAt: string;
}

/** Small steps (≤ 4 A, done within the 300 ms on-delay at the 20 A/s slew) so no deviation alarm is raised by moving there. */
const NEUTRAL: Vec3 = { x: 4, y: -3, z: 4 };

/**
 * Fault injection with the real simulator, broker and server: every fault kind the simulator
 * offers, with what Tiltwatch can honestly see of it — the alarm or trip and its first-out,
 * currents ramping to zero after a trip, the reset refused while the cause holds and accepted
 * after, and the on-call mail in the local mailbox. Setpoints are published with the server's
 * MQTT account, standing in for steering (not built yet). One stack for the file; each test
 * clears its faults and resets what tripped.
 */
describe('fault injection: simulator → broker → server', () => {
  let stack: Stack;
  let commander: mqtt.MqttClient;
  const tokens = new Map<Role, string>();

  beforeAll(async () => {
    // Thermal dynamics 30× faster: coil and chiller time constants of well under a second.
    stack = await startStack({ env: { LOG_LEVEL: 'error' }, simulatorOptions: { demo: false, thermalSpeedup: 30 } });
    for (const role of ['viewer', 'operator', 'lead', 'admin'] as const) tokens.set(role, await signIn(stack.server.url, role));
    commander = await mqtt.connectAsync(stack.server.mqttUrl, { protocolVersion: 4, ...stack.server.brokerCredentials!.server, reconnectPeriod: 0 });
    // The simulator connects in the background: repeat the command until its frames carry it.
    await waitFor(async () => {
      await setpoints(NEUTRAL);
      return (await live()).setpoints?.x === NEUTRAL.x ? true : undefined;
    }, 'the controller to take the neutral setpoints').catch(async (error: Error) => {
      // A controller held by an interlock trip ignores setpoints: say which trip.
      throw new Error(`${error.message}; interlock: ${JSON.stringify((await interlock()).firstOut)}`);
    });
    await settledAt(NEUTRAL);
  });
  afterAll(async () => {
    await commander?.endAsync();
    await stack?.close();
  });
  afterEach(async () => {
    await recover();
  });

  async function api<T>(role: Role, method: string, path: string, body?: unknown): Promise<{ status: number; body: T }> {
    const res = await fetch(`${stack.server.url}${path}`, {
      method,
      headers: { authorization: `Bearer ${tokens.get(role)}`, 'content-type': 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    return { status: res.status, body: (await res.json()) as T };
  }
  async function sim<T>(method: string, path: string, body?: unknown): Promise<{ status: number; body: T }> {
    const res = await fetch(`${stack.simulator!.controlUrl}${path}`, {
      method,
      headers: { 'content-type': 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    return { status: res.status, body: (await res.json()) as T };
  }
  const inject = async (fault: object) => expect((await sim('POST', '/faults', fault)).status).toBe(201);
  const interlock = async () => (await api<InterlockStatus>('viewer', 'GET', '/api/interlock')).body;
  const live = async () => (await api<LiveState>('viewer', 'GET', '/api/live')).body;
  const activeAlarms = async () => (await api<{ alarms: ActiveAlarm[] }>('viewer', 'GET', '/api/alarms?state=active')).body.alarms;
  const resetInterlock = (reason: string) => api<InterlockResetRefusal>('operator', 'POST', '/api/interlock/reset', { reason });

  async function setpoints(setpointA: Vec3): Promise<void> {
    const command: SetpointCommand = { tMs: Date.now(), setpointA };
    await commander.publishAsync(TOPICS.setpoints, JSON.stringify(command), { qos: 1 });
  }
  async function settledAt(target: Vec3): Promise<void> {
    await waitFor(async () => {
      const { currents } = await live();
      return currents && (['x', 'y', 'z'] as const).every((a) => Math.abs(currents[a] - target[a]) < 0.05) ? true : undefined;
    }, `currents to settle at ${JSON.stringify(target)}`);
  }
  async function tripped(): Promise<InterlockStatus> {
    return waitFor(async () => {
      const s = await interlock();
      return s.state === 'tripped' ? s : undefined;
    }, 'the software interlock to trip');
  }
  async function currentsAtZero(): Promise<void> {
    await waitFor(async () => {
      const { currents } = await live();
      return currents && Math.max(Math.abs(currents.x), Math.abs(currents.y), Math.abs(currents.z)) < 0.1 ? true : undefined;
    }, 'every coil current to ramp to zero');
  }
  /** Annunciated raises since `fromMs` (Unix epoch ms), oldest first. */
  async function raisesSince(fromMs: number): Promise<AlarmHistoryEvent[]> {
    const { body } = await api<{ events: AlarmHistoryEvent[] }>('viewer', 'GET', '/api/alarms/history?hours=1');
    return body.events.filter((e) => e.kind === 'raise' && !e.hidden && Date.parse(e.at) >= fromMs).reverse();
  }
  async function mailSince(fromMs: number, subject: RegExp): Promise<Mail> {
    return waitFor(async () => {
      const { body } = await api<{ messages: Mail[] }>('admin', 'GET', '/api/admin/outbox');
      return body.messages.find((m) => Date.parse(m.receivedAt) >= fromMs && subject.test(m.subject));
    }, `an e-mail matching ${subject}`);
  }
  /** Clears every fault, waits for the causes to go, resets both trips and returns to the neutral setpoints. */
  async function recover(): Promise<void> {
    await sim('DELETE', '/faults');
    await waitFor(async () => ((await sim('POST', '/reset')).status === 200 ? true : undefined), 'the hardware trip to reset locally', 15_000);
    if ((await interlock()).state === 'tripped') {
      await waitFor(async () => ((await resetInterlock('fault cleared after the test')).status === 200 ? true : undefined), 'the interlock reset', 15_000);
    }
    await setpoints(NEUTRAL);
    await settledAt(NEUTRAL);
  }

  it('cooling loss on x: flow trip first-out on x, ramp to zero, hardware trip shown apart, reset only once the flow is back, mail', async () => {
    const t0 = Date.now();
    await inject({ kind: 'cooling-loss', axis: 'x' });
    const trip = await tripped();
    expect(trip.firstOut).toMatchObject({ condition: 'low-flow-x', channel: 'flow.x', limit: 1 });
    expect(trip.firstOut!.value).toBeLessThan(1);
    await currentsAtZero();

    const refused = await resetInterlock('flow looks fine');
    expect(refused.status).toBe(409);
    expect(refused.body.conditions.map((c) => c.name)).toContain('low-flow-x');
    expect(refused.body.error).toMatch(/Coolant flow x: .* \(trips below 1.00 L\/min\)/);

    // The controller's own low-flow trip follows (< 0.6 L/min for 2 s); it is shown, never reset from Tiltwatch.
    const hardware = await waitFor(async () => {
      const s = await interlock();
      return s.hardwareTripped ? s : undefined;
    }, 'the hardware low-flow trip');
    expect(hardware.hardwareTripCause).toBe('low-flow');

    // The falling flow passes the L level (1.5 L/min) before the LL level: flow.x.L is first out
    // although LL, with its shorter on-delay, may be annunciated first; everything else the loss
    // raised is grouped under it.
    const raises = await raisesSince(t0);
    expect(raises.map((e) => e.alarmId)).toEqual(expect.arrayContaining(['flow.x.L', 'flow.x.LL']));
    const active = await activeAlarms();
    expect(active.find((a) => a.id === 'flow.x.L')).toMatchObject({ firstOut: true });
    for (const alarm of active) {
      if (alarm.id !== 'flow.x.L' && raises.some((e) => e.alarmId === alarm.id)) expect(alarm.firstOutOf).toBe('flow.x.L');
    }

    // With the cause cleared, the software reset is still refused while the controller's own
    // trip is latched: that is reset at the apparatus first, then the software interlock.
    await sim('DELETE', '/faults');
    await waitFor(async () => ((await interlock()).conditions.some((c) => c.active) ? undefined : true), 'the flow to come back');
    const held = await resetInterlock('valve x reopened');
    expect(held.status).toBe(409);
    expect(held.body).toMatchObject({ code: 'hardware-tripped', error: expect.stringMatching(/at the apparatus first/) });
    expect((await interlock()).state).toBe('tripped');
    await waitFor(async () => ((await sim('POST', '/reset')).status === 200 ? true : undefined), 'the hardware trip to reset locally', 15_000);
    await waitFor(async () => ((await resetInterlock('valve x reopened')).status === 200 ? true : undefined), 'the reset to be accepted');

    const mail = await mailSince(t0, /Interlock tripped/);
    expect(mail.subject).toMatch(/Coolant flow x/);
    expect(mail.to).toEqual(['oncall@lindqvist-hall.example']);
    await mailSince(t0, /High-priority alarm.*Coolant flow x/);
  });

  it('supply runaway on x: current alarm, over-current trip first-out; only the hardware trip stops the current', async () => {
    // 17.5 A sits just under the 18 A alarm; the failed regulator then climbs at 1 V/s.
    await setpoints({ x: 17.5, y: 2, z: 2 });
    await settledAt({ x: 17.5, y: 2, z: 2 });
    const t0 = Date.now();
    await inject({ kind: 'supply-runaway', axis: 'x', voltsPerSecond: 1 });
    const trip = await tripped();
    expect(trip.firstOut).toMatchObject({ condition: 'over-current-x', channel: 'current.x', limit: 20 });
    // The software trip command cannot stop a runaway regulator: the over-current still holds.
    const refused = await resetInterlock('supply x checked');
    expect(refused.status).toBe(409);
    expect(refused.body.conditions.map((c) => c.name)).toEqual(['over-current-x']);

    const hardware = await waitFor(async () => {
      const s = await interlock();
      return s.hardwareTripped ? s : undefined;
    }, 'the hardware over-current trip at 24 A');
    expect(hardware.hardwareTripCause).toBe('over-current');
    await currentsAtZero();
    expect((await raisesSince(t0)).map((e) => e.alarmId)).toContain('current.x.H');

    await sim('DELETE', '/faults');
    await waitFor(async () => ((await sim('POST', '/reset')).status === 200 ? true : undefined), 'the hardware trip to reset locally', 15_000);
    await waitFor(async () => ((await resetInterlock('regulator x replaced')).status === 200 ? true : undefined), 'the reset to be accepted');
    expect((await mailSince(t0, /Interlock tripped/)).subject).toMatch(/Coil current x/);
  });

  it('sensor dropout: stale trip with the controller still online, stale alarm, reset once telemetry is back', async () => {
    const t0 = Date.now();
    await inject({ kind: 'sensor-dropout', stream: 'all' });
    const trip = await tripped();
    expect(trip.firstOut).toMatchObject({ condition: 'telemetry-stale', channel: 'stale', limit: 250 });
    expect((await live()).controller.online).toBe(true);
    const refused = await resetInterlock('network checked');
    expect(refused.status).toBe(409);
    expect(refused.body.conditions.map((c) => c.name)).toContain('telemetry-stale');
    await waitFor(async () => ((await raisesSince(t0)).some((e) => e.alarmId === 'stale.H') ? true : undefined), 'the stale alarm');

    await sim('DELETE', '/faults');
    // The sequence numbers kept counting: the gap shows as frame loss for a second, then clears.
    await waitFor(async () => ((await resetInterlock('telemetry back')).status === 200 ? true : undefined), 'the reset to be accepted');
    await currentsAtZero();
    expect((await mailSince(t0, /Interlock tripped/)).subject).toMatch(/Time since the last telemetry frame/);
    await mailSince(t0, /High-priority alarm.*Time since the last telemetry frame/);
  });

  it('frozen current sensor on x: seen only as a deviation from a moving setpoint (no trip)', async () => {
    await inject({ kind: 'frozen-sensor', axis: 'x', channel: 'current' });
    await new Promise((r) => setTimeout(r, 100));
    // The true current follows the new setpoint; the frozen reading stays at 4 A, 2 A off. The
    // alarm may still be active from an earlier step, so look for its present value, not a new raise.
    await setpoints({ ...NEUTRAL, x: 6 });
    const alarm = await waitFor(
      async () => (await activeAlarms()).find((a) => a.id === 'currentDeviation.x.H' && a.value !== null && Math.abs(a.value - 2) < 0.2),
      'the deviation alarm on x',
      20_000,
    );
    expect(alarm.value).toBeCloseTo(2, 1);
    expect((await interlock()).state).toBe('ok');
    // A frozen temperature, flow or water reading shows nothing the present limits can catch
    // (zero variance is not a channel); the controller's own trip chain reads the true values.
  });

  it('sign swap on x: the current runs opposite to its setpoint and raises the deviation alarm (no trip)', async () => {
    const t0 = Date.now();
    await inject({ kind: 'sign-swap', axis: 'x' });
    // |I − setpoint| = |−4 A − 4 A| = 8 A once the swapped supply has settled.
    const alarm = await waitFor(
      async () => (await activeAlarms()).find((a) => a.id === 'currentDeviation.x.H' && a.state === 'unacknowledged' && a.value! > 7),
      'the deviation alarm on x',
    );
    expect(alarm.priority).toBe('medium');
    expect(Date.parse(alarm.raisedAt)).toBeGreaterThanOrEqual(t0 - 60_000);
    await waitFor(async () => ((await live()).currents!.x < -3.9 ? true : undefined), 'the current on x to settle at −4 A');
    expect((await live()).setpoints!.x).toBe(4);
    expect((await interlock()).state).toBe('ok');
  });

  it('field offset step: not observable from the currents, so no alarm is raised (documented limitation)', async () => {
    const before = await live();
    const t0 = Date.now();
    await inject({ kind: 'field-offset-step', offsetGauss: { x: 0, y: 0, z: 0.5 } });
    await new Promise((r) => setTimeout(r, 2000));
    expect(await raisesSince(t0)).toEqual([]);
    expect((await interlock()).state).toBe('ok');
    // The field the atoms feel moved by 0.5 G, but the field Tiltwatch computes from the
    // currents through the calibration did not: a lab sees this in spectroscopy and recalibrates.
    const after = await live();
    const truth = (await sim<{ truth: { trueField: { magnitude: number } } }>('GET', '/state')).body.truth.trueField;
    expect(Math.abs(after.field!.magnitude - before.field!.magnitude)).toBeLessThan(0.05);
    expect(Math.abs(truth.magnitude - after.field!.magnitude)).toBeGreaterThan(0.3);
  });

  it('warm coolant: water supply alarm first, coil temperatures rise, over-temperature trip, reset once cooled', async () => {
    const shorten = await api('lead', 'PUT', '/api/alarm-limits/waterSupply.H', { onDelayMs: 500, reason: 'fault-injection test: the demo 10 s on-delay is too long here' });
    expect(shorten.status).toBe(200);
    // Raises within 10 s of an earlier first-out join its group: start outside that window.
    const newest = (await raisesSince(0)).at(-1);
    if (newest) await new Promise((r) => setTimeout(r, Math.max(0, Date.parse(newest.at) + 10_500 - Date.now())));
    const t0 = Date.now();
    await inject({ kind: 'coolant-warm', supplyC: 70 });
    const trip = await tripped();
    expect(trip.firstOut!.condition).toMatch(/^over-temperature-[xyz]$/);
    await currentsAtZero();
    // 70 °C water heats every coil past its 60 °C high-high level, even at zero current.
    const raises = await waitFor(async () => {
      const r = await raisesSince(t0);
      return ['x', 'y', 'z'].every((a) => r.some((e) => e.alarmId === `temperature.${a}.HH`)) ? r : undefined;
    }, 'the high-high temperature alarms');
    expect(raises[0]).toMatchObject({ alarmId: 'waterSupply.H' });
    for (const later of raises.slice(1)) expect(later.firstOutOf).toBe('waterSupply.H');
    expect((await resetInterlock('chiller checked')).status).toBe(409);
    await sim('DELETE', '/faults');
    await waitFor(async () => ((await resetInterlock('chiller restarted')).status === 200 ? true : undefined), 'the reset to be accepted');
    expect((await mailSince(t0, /Interlock tripped/)).subject).toMatch(/Coil temperature/);
  });
});
