import type mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { LiveState } from '../../shared/live/live-state.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import type { HealthReport } from '../../server/health/health-route.js';
import type { RunningServer } from '../../server/server.js';
import { fastFrame, slowFrame } from '../../server/testing/frames.js';
import { connectController, makeDataDir, removeDataDir, signIn, startTestServer } from '../../server/testing/test-server.js';
import { waitFor } from '../support/stack.js';

/** Messages of the fuzz run (bounded, reproducible: seeded). Quoted by the README's Reliability section. */
export const FUZZ_MESSAGES = 400;
const SEED = 13;

/** mulberry32: a small seeded generator, so a failing run can be repeated exactly. */
function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

type Json = Record<string, unknown>;

/**
 * Frames that pass a JSON parser and mostly the schema but carry values no controller sends:
 * rates near zero or huge, sequence numbers at the end of the safe-integer range, times far in
 * the future or past, values beyond what storage columns hold, unequal channel lengths.
 */
function hostileFast(now: number, pick: <T>(list: readonly T[]) => T): Json {
  const frame = fastFrame(1, now) as unknown as Json;
  const mutations: ((f: Json) => void)[] = [
    (f) => (f.rateHz = 1e-300),
    (f) => (f.rateHz = 1e300),
    (f) => (f.rateHz = -1000),
    (f) => (f.seq = Number.MAX_SAFE_INTEGER),
    (f) => (f.seq = -1),
    (f) => (f.seq = 2.5),
    (f) => (f.t0Ms = now + 3600_000),
    (f) => (f.t0Ms = now - 10 * 365 * 86400_000),
    (f) => (f.t0Ms = 1e300),
    (f) => ((f.currentA as Json).x = new Array(20).fill(1e300)),
    (f) => ((f.voltageV as Json).y = new Array(20).fill(-1e308)),
    (f) => ((f.setpointA as Json).z = 1e300),
    (f) => ((f.currentA as Json).x = [1, 2]),
    (f) => ((f.currentA as Json).y = []),
    (f) => ((f.currentA as Json).z = new Array(20).fill('1')),
    (f) => (f.extra = { nested: new Array(50).fill({ deep: true }) }),
  ];
  pick(mutations)(frame);
  return frame;
}

function hostileSlow(now: number, pick: <T>(list: readonly T[]) => T): Json {
  const frame = slowFrame(1, now) as unknown as Json;
  const mutations: ((f: Json) => void)[] = [
    (f) => (f.tMs = now + 3600_000),
    (f) => (f.seq = Number.MAX_SAFE_INTEGER),
    (f) => ((f.coilTempC as Json).x = 1e300),
    (f) => ((f.flowLpm as Json).y = -1e308),
    (f) => (f.waterSupplyC = null),
    (f) => (f.coilTempC = [1, 2, 3]),
  ];
  pick(mutations)(frame);
  return frame;
}

function fuzzMessages(count: number, now: number): { topic: string; payload: Buffer }[] {
  const random = seeded(SEED);
  const pick = <T>(list: readonly T[]): T => list[Math.floor(random() * list.length)]!;
  const out: { topic: string; payload: Buffer }[] = [];
  for (let i = 0; i < count; i++) {
    const topic = pick([TOPICS.fast, TOPICS.fast, TOPICS.slow, TOPICS.status]);
    const kind = pick(['bytes', 'truncated', 'wrong-type', 'hostile', 'hostile', 'deep', 'oversized'] as const);
    let payload: Buffer;
    switch (kind) {
      case 'bytes':
        payload = Buffer.from(Array.from({ length: Math.floor(random() * 512) }, () => Math.floor(random() * 256)));
        break;
      case 'truncated': {
        const text = JSON.stringify(fastFrame(i, now));
        payload = Buffer.from(text.slice(0, Math.floor(random() * text.length)));
        break;
      }
      case 'wrong-type':
        payload = Buffer.from(pick(['[]', 'null', '"frame"', '1e999', 'true', '{"seq":"1"}', '{"online":"yes"}', '{"__proto__":{"polluted":true}}']));
        break;
      case 'hostile':
        payload = Buffer.from(JSON.stringify(topic === TOPICS.slow ? hostileSlow(now, pick) : topic === TOPICS.fast ? hostileFast(now, pick) : { online: 1, tMs: 1e300 }));
        break;
      case 'deep':
        payload = Buffer.from('['.repeat(20_000) + ']'.repeat(20_000));
        break;
      case 'oversized':
        payload = Buffer.alloc(2_000_000, 0x20);
        break;
    }
    out.push({ topic, payload });
  }
  return out;
}

describe('MQTT intake under a bounded fuzz (valid-but-hostile frames included)', () => {
  let dir: string;
  let server: RunningServer;
  let controller: mqtt.MqttClient;
  let viewer: string;

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir);
    controller = await connectController(server);
    viewer = await signIn(server, 'viewer');
  });
  afterAll(async () => {
    await controller?.endAsync();
    await server?.close();
    removeDataDir(dir);
  });

  const health = async () => {
    const res = await fetch(`${server.url}/api/health`);
    expect(res.status).toBe(200);
    return (await res.json()) as HealthReport;
  };

  /** Publishes good frames at the real 50 Hz pace for `frames` frames from `seq`; returns the last frame's end time. */
  async function goodFrames(seq: number, frames: number): Promise<number> {
    let end = 0;
    for (let i = 0; i < frames; i++) {
      const t0 = Date.now();
      await controller.publishAsync(TOPICS.fast, JSON.stringify(fastFrame(seq + i, t0)));
      if (i % 5 === 0) await controller.publishAsync(TOPICS.slow, JSON.stringify(slowFrame(seq + i, t0)));
      end = t0 + 20;
      await new Promise((r) => setTimeout(r, 20));
    }
    return end;
  }

  it(`survives ${FUZZ_MESSAGES} hostile messages and accepts real frames again afterwards`, { timeout: 120_000 }, async () => {
    await goodFrames(1, 20);
    await waitFor(async () => ((await health()).frames.acceptedByKind.fast >= 20 ? true : undefined), 'the warm-up frames');
    const before = await health();

    for (const message of fuzzMessages(FUZZ_MESSAGES, Date.now())) {
      // A broker may end the connection over a packet it refuses (oversized): reconnect as a real controller would.
      if (!controller.connected) {
        await controller.endAsync(true);
        controller = await connectController(server);
      }
      await controller.publishAsync(message.topic, message.payload).catch(() => undefined);
    }
    if (!controller.connected) {
      await controller.endAsync(true);
      controller = await connectController(server);
    }
    const afterFuzz = await health();
    expect(afterFuzz.frames.rejected).toBeGreaterThan(before.frames.rejected);

    // Real frames, continuing the sequence: intake recovers within a bounded run and the live time follows them.
    const acceptedBefore = afterFuzz.frames.acceptedByKind.fast;
    const lastEnd = await goodFrames(21, 150);
    const live = await waitFor(async () => {
      const res = await fetch(`${server.url}/api/live`, { headers: { authorization: `Bearer ${viewer}` } });
      const state = (await res.json()) as LiveState;
      return state.time !== null && Math.abs(Date.parse(state.time) - lastEnd) < 1000 ? state : undefined;
    }, 'the live time to follow the real frames, not a frame from the future');
    expect(live.currents).toMatchObject({ x: 1, y: 2, z: 3 });
    const final = await waitFor(async () => {
      const h = await health();
      return h.frames.acceptedByKind.fast - acceptedBefore >= 100 ? h : undefined;
    }, 'most of the real frames accepted after the fuzz');
    // Nothing hostile reached storage: every flush since the fuzz succeeded.
    await new Promise((r) => setTimeout(r, 1200));
    expect((await health()).storage.flushErrors).toBe(final.storage.flushErrors);
    expect(final.storage.flushErrors).toBe(0);
  });
});
