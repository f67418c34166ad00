import { mkdtemp, rm } from 'node:fs/promises';
import { createConnection, createServer, type Server, type Socket } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import * as z from 'zod/mini';
import { startBroker, type RunningBroker } from '../broker/broker.js';
import { loadOrCreateCredentials, type BrokerCredentials } from '../broker/credentials.js';
import { ControllerStatus, FastFrame, SlowFrame } from '../shared/telemetry/messages.js';
import { TOPICS } from '../shared/telemetry/topics.js';
import { startSimulator, type RunningSimulator, type SimulatorOptions } from './controller.js';

let dataDir: string;
let credentials: BrokerCredentials;
let broker: RunningBroker;
const owned: { close(): Promise<void> }[] = [];

beforeAll(async () => {
  dataDir = await mkdtemp(join(tmpdir(), 'tiltwatch-sim-'));
  credentials = await loadOrCreateCredentials(dataDir);
  broker = await startBroker({ port: 0, credentials });
});
afterEach(async () => {
  for (const resource of owned.splice(0).reverse()) await resource.close();
});
afterAll(async () => {
  await broker.close();
  await rm(dataDir, { recursive: true, force: true });
});

async function simulator(extra: Partial<SimulatorOptions> = {}, mqttUrl = broker.url): Promise<RunningSimulator> {
  const sim = await startSimulator({ mqttUrl, ...credentials.controller, controlPort: 0, seed: 11, ...extra });
  owned.push(sim);
  return sim;
}

/** A server-side MQTT client that records everything it receives, per topic. */
async function listener(): Promise<{ client: MqttClient; received: Map<string, unknown[]> }> {
  const client = await mqtt.connectAsync(broker.url, { ...credentials.server, protocolVersion: 4, reconnectPeriod: 0 });
  owned.push({ close: () => client.endAsync() });
  const received = new Map<string, unknown[]>();
  client.on('message', (topic, payload) => {
    const list = received.get(topic) ?? [];
    list.push(JSON.parse(payload.toString('utf8')));
    received.set(topic, list);
  });
  await client.subscribeAsync([TOPICS.fast, TOPICS.slow, TOPICS.status], { qos: 1 });
  return { client, received };
}

async function waitFor<T>(probe: () => T | undefined | false, what: string, timeoutMs = 8000): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const value = probe();
    if (value !== undefined && value !== false) return value;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const lastStatus = (received: Map<string, unknown[]>) => received.get(TOPICS.status)?.at(-1) as ControllerStatus | undefined;
const lastFast = (received: Map<string, unknown[]>) => received.get(TOPICS.fast)?.at(-1) as FastFrame | undefined;
const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
const command = (client: MqttClient, topic: string, body: object) =>
  client.publishAsync(topic, JSON.stringify({ tMs: Date.now(), ...body }), { qos: 1 });
const state = async (sim: RunningSimulator) => (await (await fetch(`${sim.controlUrl}/state`)).json()) as {
  commands: { accepted: number; invalid: number; ignoredWhileHeld: number };
  truth: { currentA: Record<'x' | 'y' | 'z', number> };
  faults: unknown[];
};

describe('simulated controller over MQTT', () => {
  it('publishes valid fast frames at about 50 per second with consecutive seq, slow frames at about 10 Hz and a retained online status', async () => {
    const sim = await simulator();
    const { received } = await listener();
    await waitFor(() => (received.get(TOPICS.fast)?.length ?? 0) > 0, 'the first fast frame');
    const start = received.get(TOPICS.fast)!.length;
    const startSlow = received.get(TOPICS.slow)?.length ?? 0;
    const startedAt = Date.now();
    await sleep(1000);
    const expectedFast = (Date.now() - startedAt) / 20; // one frame per 20 ms of wall time
    const fast = received.get(TOPICS.fast)!.slice(start) as FastFrame[];
    const slow = (received.get(TOPICS.slow) ?? []).slice(startSlow) as SlowFrame[];
    // Generous bounds: a loaded machine delays delivery, but the controller catches up.
    expect(fast.length).toBeGreaterThan(expectedFast * 0.5);
    expect(fast.length).toBeLessThan(expectedFast * 1.5 + 10);
    expect(slow.length).toBeGreaterThan(expectedFast / 5 * 0.5);
    expect(slow.length).toBeLessThan(expectedFast / 5 * 1.5 + 3);
    for (const [i, f] of fast.entries()) {
      expect(z.safeParse(FastFrame, f).success).toBe(true);
      if (i > 0) expect(f.seq).toBe(fast[i - 1].seq + 1);
      if (i > 0) expect(f.t0Ms).toBe(fast[i - 1].t0Ms + 20);
    }
    for (const f of slow) expect(z.safeParse(SlowFrame, f).success).toBe(true);

    const late = await listener(); // subscribes afterwards: sees the retained status
    const status = await waitFor(() => lastStatus(late.received), 'the retained status');
    expect(z.safeParse(ControllerStatus, status).success).toBe(true);
    expect(status).toMatchObject({ online: true, hardwareTripped: false, mode: 'demo' });
    expect(sim.controlUrl).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/);
  });

  it('follows a setpoint command, ramps to zero and holds on a trip command, and ignores invalid commands', async () => {
    const sim = await simulator({ demo: false });
    const { client, received } = await listener();
    await waitFor(() => lastStatus(received)?.online, 'online status');
    await command(client, TOPICS.setpoints, { setpointA: { x: 5, y: -3, z: 2 } });
    await waitFor(() => {
      const f = lastFast(received);
      return f && Math.abs(mean(f.currentA.x) - 5) < 0.05 && Math.abs(mean(f.currentA.y) + 3) < 0.05;
    }, 'currents at the setpoint');
    expect(lastStatus(received)?.mode).toBe('remote');

    await client.publishAsync(TOPICS.setpoints, '{"tMs": 1, "setpointA": {"x": "lots"}}', { qos: 1 });
    await client.publishAsync(TOPICS.setpoints, 'not json', { qos: 1 });

    await command(client, TOPICS.trip, { reason: 'coil temperature interlock' });
    await waitFor(() => lastStatus(received)?.softwareHold, 'software hold in the status');
    await waitFor(() => {
      const f = lastFast(received);
      return f && f.setpointA.x === 0 && Math.abs(mean(f.currentA.x)) < 0.05 && Math.abs(mean(f.currentA.y)) < 0.05;
    }, 'currents at zero');
    await command(client, TOPICS.setpoints, { setpointA: { x: 5, y: 5, z: 5 } });
    await sleep(300);
    expect(Math.abs(mean(lastFast(received)!.currentA.x))).toBeLessThan(0.05);

    await command(client, TOPICS.release, { reason: 'interlock reset by operator' });
    await waitFor(() => lastStatus(received)?.softwareHold === false, 'hold released');
    const s = await state(sim);
    expect(s.commands.invalid).toBe(2);
    expect(s.commands.ignoredWhileHeld).toBe(1);
  });

  it('injects and clears faults through the control endpoint; a dropout stops telemetry while the status stays online', async () => {
    const sim = await simulator();
    const { received } = await listener();
    await waitFor(() => (received.get(TOPICS.fast)?.length ?? 0) > 5, 'fast frames');
    const injected = await fetch(`${sim.controlUrl}/faults`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ kind: 'sensor-dropout' }) });
    expect(injected.status).toBe(201);
    await sleep(250); // frames already in flight arrive
    const during = received.get(TOPICS.fast)!.length;
    await sleep(400);
    expect(received.get(TOPICS.fast)!.length).toBe(during);
    expect(lastStatus(received)?.online).toBe(true);
    expect((await state(sim)).faults).toEqual([{ kind: 'sensor-dropout', stream: 'all' }]);

    expect((await fetch(`${sim.controlUrl}/faults`, { method: 'DELETE' })).status).toBe(200);
    await waitFor(() => received.get(TOPICS.fast)!.length > during + 5, 'telemetry again');
    const resumed = received.get(TOPICS.fast)!.slice(during) as FastFrame[];
    expect(resumed[0].seq).toBeGreaterThan((received.get(TOPICS.fast)![during - 1] as FastFrame).seq + 10);
  });

  it('latches a hardware trip that MQTT cannot reset and that resets locally once the cause has cleared', async () => {
    const sim = await simulator({ demo: false });
    const { client, received } = await listener();
    await waitFor(() => lastStatus(received)?.online, 'online status');
    await command(client, TOPICS.setpoints, { setpointA: { x: 0, y: 5, z: 0 } });
    await fetch(`${sim.controlUrl}/faults`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ kind: 'supply-runaway', axis: 'y', voltsPerSecond: 50 }) });
    const tripped = await waitFor(() => lastStatus(received)?.hardwareTripped && lastStatus(received), 'hardware trip');
    expect(tripped).toMatchObject({ hardwareTripCause: 'over-current', hardwareTripAxis: 'y' });

    await command(client, TOPICS.release, { reason: 'try to reset remotely' });
    await sleep(200);
    expect(lastStatus(received)?.hardwareTripped).toBe(true);

    await fetch(`${sim.controlUrl}/faults`, { method: 'DELETE' });
    const reset = await fetch(`${sim.controlUrl}/reset`, { method: 'POST' });
    expect(reset.status).toBe(200);
    await waitFor(() => lastStatus(received)?.hardwareTripped === false, 'trip cleared in the status');
  });

  it('is seen offline at once through its last will when its connection dies, and publishes offline on close', async () => {
    const proxy = await tcpProxy(broker.port);
    const sim = await simulator({}, `mqtt://127.0.0.1:${proxy.port}`);
    const { received } = await listener();
    await waitFor(() => lastStatus(received)?.online, 'online status');
    await proxy.close(); // the controller's TCP connection dies without a DISCONNECT
    const will = await waitFor(() => lastStatus(received)?.online === false && lastStatus(received), 'the last will');
    expect(z.safeParse(ControllerStatus, will).success).toBe(true);
    await sim.close();

    const direct = await simulator();
    const watch = await listener();
    await waitFor(() => lastStatus(watch.received)?.online, 'online status');
    await direct.close();
    await waitFor(() => lastStatus(watch.received)?.online === false, 'offline status on close');
    const late = await listener();
    await waitFor(() => lastStatus(late.received)?.online === false, 'retained offline status');
  });
});

/** A TCP relay to the broker whose `close()` cuts every relayed connection abruptly. */
async function tcpProxy(targetPort: number): Promise<{ port: number; close(): Promise<void> }> {
  const sockets = new Set<Socket>();
  const server: Server = createServer((inbound) => {
    const outbound = createConnection(targetPort, '127.0.0.1');
    for (const s of [inbound, outbound]) {
      sockets.add(s);
      s.on('close', () => sockets.delete(s));
      s.on('error', () => s.destroy());
    }
    inbound.pipe(outbound);
    outbound.pipe(inbound);
    inbound.on('close', () => outbound.destroy());
    outbound.on('close', () => inbound.destroy());
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const port = (server.address() as { port: number }).port;
  return {
    port,
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        for (const s of sockets) s.destroy();
      }),
  };
}
