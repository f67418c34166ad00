import type { MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SteeringStatus } from '../../shared/steering/steering-api.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import type { RunningServer } from '../server.js';
import { startControllerFeed, type ControllerFeed } from '../testing/controller-feed.js';
import { callApi, connectController, makeDataDir, removeDataDir, signIn, startTestServer } from '../testing/test-server.js';
import { waitFor } from '../../test/support/stack.js';

/** Longer than two hold periods: a server that steered would have sent setpoints by then, ms. */
const QUIET_MS = 1500;

/**
 * The steering state across a restart of a real server on the same data folder: a reached
 * target comes back as kept, a ramp under way comes back as interrupted, and the restarted
 * server sends no setpoint on its own.
 */
describe('steering state across a restart', () => {
  let dir: string;
  let server: RunningServer | null = null;
  let controller: MqttClient | null = null;
  let feed: ControllerFeed | null = null;
  const setpoints: unknown[] = [];

  async function start(): Promise<string> {
    server = await startTestServer(dir);
    controller = await connectController(server);
    setpoints.length = 0;
    controller.on('message', (topic, payload) => topic === TOPICS.setpoints && setpoints.push(JSON.parse(payload.toString())));
    await controller.subscribeAsync(TOPICS.setpoints, { qos: 0 });
    feed = await startControllerFeed(controller);
    const token = await signIn(server, 'operator');
    await waitFor(async () => ((await callApi<{ field: unknown }>(server!, token, 'GET', '/api/live')).body.field ? true : undefined), 'the first field');
    return token;
  }

  async function stop(): Promise<void> {
    feed?.stop();
    await controller?.endAsync();
    await server?.close();
    feed = null;
    controller = null;
    server = null;
  }

  const status = async (token: string) => (await callApi<SteeringStatus>(server!, token, 'GET', '/api/steering')).body;
  const target = (rampMs: number, reason: string) => ({ magnitudeG: 4, thetaDeg: 40, phiDeg: 30, rampMs, reason });

  beforeAll(async () => {
    dir = await makeDataDir();
  });
  afterAll(async () => {
    await stop();
    removeDataDir(dir);
  });

  it('keeps a reached target in force after a restart, without sending a setpoint', async () => {
    let token = await start();
    const set = await callApi(server!, token, 'POST', '/api/steering/target', target(200, 'tilt for the overnight hold'));
    expect(set.status, JSON.stringify(set.body)).toBe(200);
    await waitFor(async () => ((await status(token)).mode === 'holding' ? true : undefined), 'the target reached');
    await stop();

    token = await start();
    await new Promise((r) => setTimeout(r, QUIET_MS));
    expect(setpoints).toEqual([]);
    expect(await status(token)).toMatchObject({
      mode: 'restored',
      target: { magnitudeG: 4, thetaDeg: 40, phiDeg: 30, rampMs: 200 },
      actor: 'operator@tiltwatch.example',
      reason: 'tilt for the overnight hold',
      runId: null,
    });
    await stop();
  });

  it('brings a ramp under way back as interrupted, sends nothing, and a release clears it', async () => {
    let token = await start();
    const set = await callApi(server!, token, 'POST', '/api/steering/target', target(60_000, 'slow tilt'));
    expect(set.status, JSON.stringify(set.body)).toBe(200);
    expect((await status(token)).mode).toBe('ramping');
    await stop();

    token = await start();
    await new Promise((r) => setTimeout(r, QUIET_MS));
    expect(setpoints).toEqual([]);
    expect(await status(token)).toMatchObject({ mode: 'interrupted', target: { rampMs: 60_000 }, reason: 'slow tilt' });
    expect((await callApi(server!, token, 'POST', '/api/steering/abort', { reason: 'nothing to abort' })).status).toBe(409);

    expect((await callApi(server!, token, 'POST', '/api/steering/release', { reason: 'measured field is fine' })).status).toBe(200);
    expect(setpoints).toEqual([]);
    await stop();
    token = await start();
    expect(await status(token)).toMatchObject({ mode: 'idle', target: null, lastStop: { why: 'released by operator@tiltwatch.example: measured field is fine' } });
  });
});
