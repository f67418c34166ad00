import type mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AlarmsMessage, InterlockResetRefusal, InterlockStatus } from '../../shared/alarms/alarm-api.js';
import type { Role } from '../../shared/auth/roles.js';
import type { ServerMessage } from '../../shared/live/live-state.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { openLiveSocket } from '../../test/support/live-socket.js';
import { waitFor } from '../../test/support/stack.js';
import type { RunningServer } from '../server.js';
import { startControllerFeed, type ControllerFeed } from '../testing/controller-feed.js';
import { callApi, connectController, makeDataDir, removeDataDir, signIn, startTestServer } from '../testing/test-server.js';

/**
 * The software interlock through the server: a scripted controller on the real broker, the
 * trip command on MQTT, the interlock API, the WebSocket `alarms` message, the outbox, and a
 * latch that outlives a restart.
 */
describe('software interlock routes', () => {
  let dir: string;
  let server: RunningServer;
  let controller: mqtt.MqttClient;
  let feed: ControllerFeed;
  const tokens = new Map<Role, string>();

  async function connect(): Promise<void> {
    for (const role of ['viewer', 'operator', 'admin'] as const) tokens.set(role, await signIn(server, role));
    controller = await connectController(server);
    feed = await startControllerFeed(controller);
  }
  async function disconnect(): Promise<void> {
    feed?.stop();
    await controller?.endAsync();
  }

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir);
    await connect();
  });
  afterAll(async () => {
    await disconnect();
    await server?.close();
    removeDataDir(dir);
  });

  const call = <T>(role: Role, method: string, path: string, body?: unknown) => callApi<T>(server, tokens.get(role), method, path, body);
  const status = async () => (await call<InterlockStatus>('viewer', 'GET', '/api/interlock')).body;
  const tripCommands = () => feed.commands.filter((c) => c.topic === TOPICS.trip);

  it('shows every condition with value and margin and the supervisory caution while ok', async () => {
    const ok = await waitFor(async () => {
      const s = await status();
      return s.conditions.find((c) => c.name === 'low-flow-x')?.value !== null ? s : undefined;
    }, 'flows to arrive');
    expect(ok).toMatchObject({ state: 'ok', firstOut: null, hardwareTripped: false, trip: null, history: [] });
    expect(ok.caution).toMatch(/supervisory/);
    expect(ok.conditions.map((c) => c.name)).toContain('telemetry-stale');
    expect(ok.conditions.find((c) => c.name === 'low-flow-x')).toMatchObject({ active: false, limit: 1, unit: 'L/min', tripsWhen: 'below 1.00 L/min' });
    expect(ok.conditions.find((c) => c.name === 'low-flow-x')!.margin).toBeCloseTo(2.1, 6);
  });

  it('trips on one over-current sample inside a frame, sends the trip command and names the first-out', async () => {
    const socket = openLiveSocket(server.url, tokens.get('viewer')!);
    try {
      await waitFor(() => socket.messages.find((m) => m.type === 'alarms'), 'the alarms message after hello');
      feed.spike('y', 21.5);
      const command = await waitFor(() => tripCommands()[0], 'the trip command on the broker');
      expect((command.payload as { reason: string }).reason).toMatch(/over-current-y/);
      const tripped = await status();
      expect(tripped.state).toBe('tripped');
      expect(tripped.firstOut).toMatchObject({ condition: 'over-current-y', channel: 'current.y', value: 21.5, limit: 20 });
      expect(tripped.trip?.valuesAtTrip.find((c) => c.name === 'over-current-y')).toMatchObject({ active: true, value: 21.5 });
      const banner = await waitFor(
        () => socket.messages.find((m): m is AlarmsMessage => m.type === 'alarms' && m.interlock.state === 'tripped'),
        'the alarms message with the trip',
      );
      expect(banner.interlock.firstOut?.condition).toBe('over-current-y');
      expect(socket.messages.findIndex((m: ServerMessage) => m.type === 'hello')).toBe(0);
    } finally {
      socket.close();
    }
  });

  it('refuses a reset by a viewer, without a reason and while the condition holds, then accepts it and releases the controller', async () => {
    expect((await call('viewer', 'POST', '/api/interlock/reset', { reason: 'checked' })).status).toBe(403);
    const noReason = await call<{ error: string }>('operator', 'POST', '/api/interlock/reset', { reason: ' ' });
    expect(noReason.status).toBe(400);
    expect(noReason.body).toMatchObject({ field: 'reason', error: expect.stringMatching(/^Reason for the reset: is required/) });

    feed.currents = { x: 5, y: 21, z: 6 };
    await waitFor(async () => ((await status()).conditions.find((c) => c.name === 'over-current-y')?.active ? true : undefined), 'the condition to hold');
    const refused = await call<InterlockResetRefusal>('operator', 'POST', '/api/interlock/reset', { reason: 'supply y checked' });
    expect(refused.status).toBe(409);
    expect(refused.body.error).toMatch(/Coil current y: 21.0 A \(trips above 20.0 A\)/);
    expect(refused.body.conditions).toEqual([expect.objectContaining({ name: 'over-current-y', active: true, value: 21 })]);

    feed.currents = { x: 5, y: 4, z: 6 };
    await waitFor(async () => ((await status()).conditions.some((c) => c.active) ? undefined : true), 'every condition to clear');
    const reset = await call<{ reset: { actor: string; reason: string }; interlock: InterlockStatus }>('operator', 'POST', '/api/interlock/reset', {
      reason: 'supply y checked',
    });
    expect(reset.status).toBe(200);
    expect(reset.body).toMatchObject({ reset: { actor: 'operator@tiltwatch.example', reason: 'supply y checked' }, interlock: { state: 'ok' } });
    await waitFor(() => feed.commands.find((c) => c.topic === TOPICS.release), 'the release command');
    const after = await status();
    expect(after.history?.[0]).toMatchObject({
      firstOut: { condition: 'over-current-y' },
      reset: { actor: 'operator@tiltwatch.example', reason: 'supply y checked' },
    });
    const again = await call<InterlockResetRefusal>('operator', 'POST', '/api/interlock/reset', { reason: 'again' });
    expect(again).toMatchObject({ status: 409, body: { error: expect.stringMatching(/not tripped/), conditions: [] } });
  });

  it('mails the trip to the on-call list through the local mailbox, shown to admins only', async () => {
    const mail = await waitFor(async () => {
      const { body } = await call<{ messages: { to: string[]; subject: string; text: string; receivedAt: string }[] }>('admin', 'GET', '/api/admin/outbox');
      return body.messages.find((m) => m.subject.includes('Interlock tripped'));
    }, 'the trip notice');
    expect(mail.subject).toMatch(/Coil current y 21.5 A/);
    expect(mail.text).toMatch(/First out: +Coil current y: 21.5 A/);
    expect(mail.to).toEqual(['oncall@lindqvist-hall.example']);
    expect((await call('operator', 'GET', '/api/admin/outbox')).status).toBe(403);
  });

  it('trips when the controller falls silent, and sends the trip again when it comes back without holding', async () => {
    const before = tripCommands().length;
    feed.pause();
    await waitFor(() => (tripCommands().length > before ? true : undefined), 'the stale trip command');
    expect((await status()).firstOut).toMatchObject({ condition: 'telemetry-stale', channel: 'stale', limit: 250 });
    // A restarted controller reports itself online but not holding: it must be told again.
    const sent = tripCommands().length;
    await feed.publishStatus({ softwareHold: false });
    await waitFor(() => (tripCommands().length > sent ? true : undefined), 'the trip command sent again', 4000);
    feed.resume();
  });

  it('keeps the trip latched across a restart; with SMTP_URL set there is no local outbox', async () => {
    expect((await status()).state).toBe('tripped');
    await disconnect();
    await server.close();
    server = await startTestServer(dir, undefined, { SMTP_URL: 'smtp://127.0.0.1:9' });
    await connect();
    const restored = await status();
    expect(restored).toMatchObject({ state: 'tripped', firstOut: { condition: 'telemetry-stale' } });
    await waitFor(() => tripCommands()[0], 'the trip command for the restored latch');
    const outbox = await call<{ error: string }>('admin', 'GET', '/api/admin/outbox');
    expect(outbox.status).toBe(404);
    expect(outbox.body.error).toMatch(/SMTP_URL is set/);
    await waitFor(async () => ((await status()).conditions.some((c) => c.active) ? undefined : true), 'fresh telemetry');
    expect((await call('operator', 'POST', '/api/interlock/reset', { reason: 'network restored' })).status).toBe(200);
  });
});
