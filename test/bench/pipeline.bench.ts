/**
 * Pipeline benchmark with real parts: a controller-account MQTT client publishes fast frames
 * into the server's embedded broker; a signed-in WebSocket client measures when each frame's
 * data arrives. Reports end-to-end latency at the demo rate and the highest multiple of the
 * demo rate the pipeline holds with no frame lost or rejected.
 */
import mqtt from 'mqtt';
import { TOPICS } from '../../shared/telemetry/topics.js';
import type { FastFrame } from '../../shared/telemetry/messages.js';
import { openLiveSocket } from '../support/live-socket.js';
import { signIn, startStack, waitFor } from '../support/stack.js';
import { quantile, type Figure } from './figures.js';

/** The simulator's demo rate: 1 kHz samples in 20-sample frames, 50 frames per second. */
const DEMO_SAMPLE_HZ = 1000;
const SAMPLES_PER_FRAME = 20;
const DEMO_FRAME_HZ = DEMO_SAMPLE_HZ / SAMPLES_PER_FRAME;

function frame(seq: number, t0Ms: number, rateHz: number): FastFrame {
  const wave = (phase: number) => Array.from({ length: SAMPLES_PER_FRAME }, (_, i) => 5 + Math.sin(phase + (seq * SAMPLES_PER_FRAME + i) / 500));
  return {
    seq,
    t0Ms,
    rateHz,
    currentA: { x: wave(0), y: wave(2), z: wave(4) },
    voltageV: { x: wave(1), y: wave(3), z: wave(5) },
    setpointA: { x: 5, y: 5, z: 5 },
  };
}

interface Health {
  frames: { accepted: number; rejected: number; lost: number };
  storage: { framesDropped: number; flushErrors: number };
}

export async function benchPipeline(): Promise<Figure[]> {
  const stack = await startStack({ simulator: false });
  const account = stack.server.brokerCredentials!.controller;
  const client = await mqtt.connectAsync(stack.server.mqttUrl, { ...account, protocolVersion: 4, clientId: 'bench-controller' });
  const token = await signIn(stack.server.url, 'viewer');
  const socket = openLiveSocket(stack.server.url, token);
  const health = async () => (await (await fetch(`${stack.server.url}/api/health`)).json()) as Health;
  let seq = 0;
  try {
    // Latency at the demo rate: each frame's newest sample time identifies it in `live.time`.
    const published = new Map<number, number>();
    const latencies: number[] = [];
    socket.onMessage = (message, receivedAt) => {
      if (message.type !== 'live' || message.live.time === null) return;
      const newest = Date.parse(message.live.time);
      for (const [lastSampleMs, sentAt] of published) {
        if (lastSampleMs <= newest) {
          latencies.push(receivedAt - sentAt);
          published.delete(lastSampleMs);
        }
      }
    };
    await waitFor(() => socket.messages.find((m) => m.type === 'hello'), 'the WebSocket greeting');
    const frames = 500;
    const t0 = Date.now();
    for (let i = 0; i < frames; i++) {
      const due = t0 + i * (1000 / DEMO_FRAME_HZ);
      const wait = due - Date.now();
      if (wait > 0) await new Promise((r) => setTimeout(r, wait));
      const f = frame(seq++, due, DEMO_SAMPLE_HZ);
      published.set(f.t0Ms + (SAMPLES_PER_FRAME - 1), performance.now());
      client.publish(TOPICS.fast, JSON.stringify(f));
    }
    await waitFor(() => (published.size === 0 ? true : undefined), 'every frame to reach the WebSocket client', 5000).catch(() => true);
    socket.onMessage = undefined;
    const p50 = quantile(latencies, 0.5);
    const p99 = quantile(latencies, 0.99);

    // Throughput: publish k× the demo rate for two seconds of data each, stop at the first loss
    // anywhere between the broker and the database.
    let held = 1;
    for (const k of [1, 2, 5, 10, 20, 40, 80, 160]) {
      const before = await health();
      const count = Math.round(DEMO_FRAME_HZ * k * 2);
      const start = Date.now();
      for (let i = 0; i < count; i++) {
        const due = start + (i * 1000) / (DEMO_FRAME_HZ * k);
        const wait = due - Date.now();
        if (wait > 1) await new Promise((r) => setTimeout(r, wait));
        client.publish(TOPICS.fast, JSON.stringify(frame(seq++, start + (i * SAMPLES_PER_FRAME) / k, DEMO_SAMPLE_HZ * k)));
      }
      const after = await waitFor(async () => {
        const h = await health();
        return h.frames.accepted - before.frames.accepted >= count ? h : undefined;
      }, `${count} frames at ${k}× to be accepted`, 10_000).catch(() => undefined);
      // No loss means every frame accepted, none rejected or lost, and none dropped or failed in storage.
      const stored = after && (await waitFor(async () => {
        const h = await health();
        return h.storage.flushErrors === before.storage.flushErrors && h.storage.framesDropped === before.storage.framesDropped ? h : undefined;
      }, 'storage to keep up', 1000).catch(() => undefined));
      const ok =
        after !== undefined &&
        stored !== undefined &&
        after.frames.rejected === before.frames.rejected &&
        after.frames.lost === before.frames.lost;
      if (!ok) break;
      held = k;
    }
    return [
      { name: 'end-to-end latency p50 (publish → WebSocket)', value: p50, unit: 'ms', note: `${latencies.length} frames at the demo rate` },
      { name: 'end-to-end latency p99', value: p99, unit: 'ms', note: `target < 50 ms: ${(50 / p99).toFixed(1)}× headroom` },
      { name: 'highest rate with no loss', value: held, unit: '× demo rate', note: `target ≥ 20×; tried up to 160× (${DEMO_SAMPLE_HZ * 160} samples/s per axis)` },
    ];
  } finally {
    socket.close();
    await client.endAsync();
    await stack.close();
  }
}
