import type { MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { WebSocket } from 'ws';
import type { ServerMessage } from '../../shared/live/live-state.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import type { RunningServer } from '../server.js';
import { fastFrame } from '../testing/frames.js';
import { connectController, makeDataDir, removeDataDir, signIn, startTestServer } from '../testing/test-server.js';
import { WS_CLOSE_UNAUTHENTICATED } from './live-fanout.js';

interface Received {
  at: number;
  message: ServerMessage;
}

/** A WebSocket client that records every message with its arrival time (performance.now, ms). */
async function openSocket(server: RunningServer): Promise<{ ws: WebSocket; received: Received[]; closed: Promise<number> }> {
  const ws = new WebSocket(`${server.url.replace('http', 'ws')}/ws`);
  const received: Received[] = [];
  ws.on('message', (data) => received.push({ at: performance.now(), message: JSON.parse(data.toString()) as ServerMessage }));
  const closed = new Promise<number>((resolve) => ws.on('close', (code) => resolve(code)));
  await new Promise((resolve, reject) => {
    ws.once('open', resolve);
    ws.once('error', reject);
  });
  return { ws, received, closed };
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

describe('WebSocket fan-out', () => {
  let dir: string;
  let server: RunningServer;
  let controller: MqttClient;
  let seq = 0;

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir, { fanout: { authTimeoutMs: 300 } });
    controller = await connectController(server);
  });
  afterAll(async () => {
    await controller?.endAsync();
    await server?.close();
    removeDataDir(dir);
  });

  // Contiguous 20 ms frames, as the controller sends them.
  const t0 = Date.now();
  const publishFrame = () => {
    seq++;
    controller.publish(TOPICS.fast, JSON.stringify(fastFrame(seq, t0 + seq * 20)));
  };

  it('greets a signed-in viewer with hello, then sends live updates carrying the chart points', async () => {
    const token = await signIn(server, 'viewer');
    const { ws, received } = await openSocket(server);
    ws.send(JSON.stringify({ type: 'auth', token }));
    const start = performance.now();
    while (received.length < 3 && performance.now() - start < 10_000) await sleep(10);
    for (let i = 0; i < 5; i++) publishFrame();
    const deadline = performance.now() + 10_000;
    const points = () => received.reduce((n, r) => n + (r.message.type === 'live' ? r.message.series.t.length : 0), 0);
    while (points() < 10 && performance.now() < deadline) await sleep(10);
    ws.close();

    expect(received[0].message).toMatchObject({ type: 'hello', user: { email: 'viewer@tiltwatch.example', role: 'viewer' }, decimatedRateHz: 100 });
    // Right after hello come the interlock state and the active alarms, and the display bands
    // in force; then only live updates.
    expect(received[1].message).toMatchObject({ type: 'alarms', interlock: { state: 'ok' }, active: [] });
    expect(received[2].message).toMatchObject({ type: 'channels', version: 1, bands: { 'current.x': { tripHigh: 20 } } });
    const live = received.slice(3).map((r) => r.message);
    expect(live.every((m) => m.type === 'live')).toBe(true);
    expect(points()).toBe(10); // 5 frames × 20 samples at 1 kHz = 10 blocks of 10 ms
    const last = live.at(-1);
    expect(last?.type === 'live' && last.live.currents).toEqual({ x: 1, y: 2, z: 3 });
  });

  it.each([
    ['a bad token', (ws: WebSocket) => ws.send(JSON.stringify({ type: 'auth', token: 'not-a-token' }))],
    ['a first message that is not a sign-in', (ws: WebSocket) => ws.send(JSON.stringify({ type: 'subscribe' }))],
    ['no message at all within the sign-in time', () => {}],
  ])('closes a socket with 4401 for %s, without sending it data', async (_what, act) => {
    const { ws, received, closed } = await openSocket(server);
    act(ws);
    expect(await closed).toBe(WS_CLOSE_UNAUTHENTICATED);
    expect(received).toEqual([]);
  });

  it('refuses upgrades on other paths', async () => {
    const ws = new WebSocket(`${server.url.replace('http', 'ws')}/elsewhere`);
    const outcome = await new Promise<string>((resolve) => {
      ws.on('error', (error) => resolve(error.message));
      ws.on('open', () => resolve('open'));
    });
    expect(outcome).toMatch(/404/);
  });

  it('batches updates to at most about 30 messages per second per client while frames arrive at 500 per second', async () => {
    const token = await signIn(server, 'operator');
    const { ws, received } = await openSocket(server);
    ws.send(JSON.stringify({ type: 'auth', token }));
    while (received.length < 2) await sleep(10);
    const start = performance.now();
    const totalFrames = 500;
    for (let burst = 0; burst < 10; burst++) {
      for (let i = 0; i < totalFrames / 10; i++) publishFrame();
      await sleep(100);
    }
    const end = performance.now();
    const deadline = end + 10_000;
    const points = () => received.reduce((n, r) => n + (r.message.type === 'live' ? r.message.series.t.length : 0), 0);
    while (points() < totalFrames * 2 && performance.now() < deadline) await sleep(20);
    ws.close();

    const during = received.filter((r) => r.at >= start && r.at <= end).length;
    const seconds = (end - start) / 1000;
    // ≥ 33 ms apart allows 30.3 per second; the tolerance covers timer granularity.
    expect(during / seconds).toBeLessThanOrEqual(36);
    expect(points()).toBe(totalFrames * 2);
  });
});
