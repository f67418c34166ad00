import type { MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { LiveState, SeriesChunk } from '../../shared/live/live-state.js';
import { MAX_PAYLOAD_BYTES } from '../../shared/telemetry/messages.js';
import { adcStep, CURRENT_ADC } from '../../shared/telemetry/adc.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import type { RunningServer } from '../server.js';
import { fastFrame } from '../testing/frames.js';
import { connectController, makeDataDir, removeDataDir, signIn, startTestServer } from '../testing/test-server.js';

/** Every fast frame the test publishes as "good" carries these currents (A). */
const GOOD = { x: 1, y: 2, z: 3 };

describe('ingest over MQTT', () => {
  let dir: string;
  let server: RunningServer;
  let controller: MqttClient;
  let token: string;
  let seq = 0;

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir);
    controller = await connectController(server);
    token = await signIn(server, 'viewer');
  });
  afterAll(async () => {
    await controller?.endAsync();
    await server?.close();
    removeDataDir(dir);
  });

  const handled = () => {
    const f = server.counters().frames;
    return f.accepted + f.rejected;
  };
  /** Publishes in order and waits until the server has judged every message. */
  async function publishAll(payloads: (string | Buffer)[]): Promise<void> {
    const target = handled() + payloads.length;
    for (const p of payloads) controller.publish(TOPICS.fast, p);
    await vi.waitFor(() => expect(handled()).toBe(target), { timeout: 20_000, interval: 20 });
  }
  const good = (t0Ms = Date.now()) => JSON.stringify(fastFrame(++seq, t0Ms, GOOD));
  const get = async <T>(pathAndQuery: string): Promise<T> => {
    const res = await fetch(`${server.url}${pathAndQuery}`, { headers: { authorization: `Bearer ${token}` } });
    expect(res.status).toBe(200);
    return (await res.json()) as T;
  };

  it('refuses and counts each kind of malformed frame, and stores none of them', async () => {
    const before = server.counters().frames;
    const bad = { x: 9, y: 9, z: 9 };
    const now = Date.now();
    await publishAll([good()]);
    await publishAll([
      Buffer.alloc(MAX_PAYLOAD_BYTES + 10, 0x20),
      '{"seq":',
      JSON.stringify(fastFrame(seq + 1, now, bad)).replace('"rateHz":1000', '"rateHz":1e999'),
      JSON.stringify({ ...fastFrame(seq + 1, now, bad), rateHz: 'fast' }),
      JSON.stringify({ ...fastFrame(seq + 1, now, bad), voltageV: { x: [1], y: [1], z: [1] } }),
      JSON.stringify(fastFrame(seq, now, bad)),
      JSON.stringify(fastFrame(seq - 1, now, bad)),
      JSON.stringify(fastFrame(seq + 1, now + 2 * 3600_000, bad)),
      JSON.stringify(fastFrame(seq + 1, now, { x: 99, y: 9, z: 9 })),
    ]);
    await publishAll([good()]);

    const after = server.counters().frames;
    expect(after.accepted - before.accepted).toBe(2);
    const delta = (reason: keyof typeof after.rejectedByReason) => after.rejectedByReason[reason] - before.rejectedByReason[reason];
    expect({
      oversized: delta('oversized'),
      'malformed-json': delta('malformed-json'),
      'non-finite': delta('non-finite'),
      schema: delta('schema'),
      'length-mismatch': delta('length-mismatch'),
      'out-of-order': delta('out-of-order'),
      'clock-skew': delta('clock-skew'),
      'out-of-range': delta('out-of-range'),
    }).toEqual({ oversized: 1, 'malformed-json': 1, 'non-finite': 1, schema: 1, 'length-mismatch': 1, 'out-of-order': 2, 'clock-skew': 1, 'out-of-range': 1 });
    const health = (await (await fetch(`${server.url}/api/health`)).json()) as { status: string; problems: string[] };
    expect(health.status).toBe('degraded');
    expect(health.problems[0]).toMatch(/refused at the edge/);

    const { series } = await get<{ series: SeriesChunk }>('/api/series?seconds=120');
    expect(series.t.length).toBeGreaterThan(0);
    // Stored at the converter's resolution: every value within half a step of what was sent.
    expect(Math.max(...series.currentA.x.map((v) => Math.abs(v - GOOD.x)))).toBeLessThanOrEqual(adcStep(CURRENT_ADC) / 2);
  });

  it('survives a burst of thousands of malformed frames mixed with good ones and counts them right', async () => {
    const before = server.counters().frames;
    const payloads: string[] = [];
    let goodCount = 0;
    for (let i = 0; i < 3000; i++) {
      if (i % 10 === 0) {
        payloads.push(good());
        goodCount++;
      } else if (i % 3 === 0) {
        payloads.push(`{"seq":${i},"t0Ms":`);
      } else {
        payloads.push(JSON.stringify({ seq: seq + 1, t0Ms: Date.now(), rateHz: -5 }));
      }
    }
    await publishAll(payloads);
    const after = server.counters().frames;
    expect(after.accepted - before.accepted).toBe(goodCount);
    expect(after.rejected - before.rejected).toBe(3000 - goodCount);
    expect(after.lost).toBe(before.lost);

    const health = await fetch(`${server.url}/api/health`);
    expect(health.status).toBe(200);
    expect(((await health.json()) as { frames: { accepted: number } }).frames.accepted).toBe(after.accepted);
  });

  it('counts the frames missing from a sequence gap as lost', async () => {
    const lostBefore = server.counters().frames.lost;
    seq += 4;
    await publishAll([good()]);
    expect(server.counters().frames.lost - lostBefore).toBe(4);
  });

  it('computes the live field from the currents through the seeded demo calibration', async () => {
    // The seeded calibration is shared/field/demo-calibration.ts: K, B0 as listed there and
    // R a rotation by −15° about z. By hand for I = (2, −1, 0.5) A:
    //   K·I + B0 = (2.392, −1.155, 0.795) G in the coil frame (coil azimuth −25.774°);
    //   trap frame: x = 2.392·cos15° − 1.155·sin15°, y = −2.392·sin15° − 1.155·cos15°.
    await publishAll([JSON.stringify(fastFrame(++seq, Date.now(), { x: 2, y: -1, z: 0.5 }))]);
    const live = await get<LiveState>('/api/live');
    expect(live.currents).toEqual({ x: 2, y: -1, z: 0.5 });
    expect(live.field?.vector.x).toBeCloseTo(2.0115586, 6);
    expect(live.field?.vector.y).toBeCloseTo(-1.7347395, 6);
    expect(live.field?.vector.z).toBeCloseTo(0.795, 9);
    expect(live.field?.magnitude).toBeCloseTo(2.7726727, 6);
    expect(live.field?.thetaDeg).toBeCloseTo(73.337895, 5);
    expect(live.field?.phiDeg).toBeCloseTo(319.225984, 5); // −25.774° − 15° wrapped into 0…360°
    expect(live.calibration).toEqual({ id: 1, version: 1, label: 'Lindqvist Hall demo calibration' });
  });
});
