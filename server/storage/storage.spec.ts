import { spawn } from 'node:child_process';
import { once } from 'node:events';
import type { MqttClient } from 'mqtt';
import mqtt from 'mqtt';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { SeriesChunk, SlowChunk } from '../../shared/live/live-state.js';
import { adcStep, CURRENT_ADC } from '../../shared/telemetry/adc.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { projectRoot } from '../project-root.js';
import type { RunningServer } from '../server.js';
import { HANDOVER_SAMPLES } from './telemetry-writer.js';
import { usesPostgres } from '../testing/external-services.js';
import { fastFrame, slowFrame } from '../testing/frames.js';
import { connectController, makeDataDir, removeDataDir, signIn, startTestServer, TEST_PASSWORD } from '../testing/test-server.js';

const CURRENT = { x: 1, y: 2, z: 3 };

interface SeriesAnswer {
  series: SeriesChunk;
  slow: SlowChunk;
}

async function series(server: RunningServer, seconds: number): Promise<SeriesAnswer> {
  const token = await signIn(server, 'viewer');
  const res = await fetch(`${server.url}/api/series?seconds=${seconds}`, { headers: { authorization: `Bearer ${token}` } });
  expect(res.status).toBe(200);
  return (await res.json()) as SeriesAnswer;
}

/** Publishes `frames` contiguous fast frames of `n` samples from `t0Ms`, and a slow frame per second. */
function publishRun(client: MqttClient, seq: { fast: number; slow: number }, t0Ms: number, frames: number, n = 20): void {
  for (let i = 0; i < frames; i++) {
    const t = t0Ms + i * n;
    client.publish(TOPICS.fast, JSON.stringify(fastFrame(++seq.fast, t, CURRENT, n)));
    if (Math.floor(t / 1000) !== Math.floor((t + n) / 1000)) client.publish(TOPICS.slow, JSON.stringify(slowFrame(++seq.slow, t)));
  }
}

describe('telemetry storage and the data folder', () => {
  let dir: string;
  let server: RunningServer;
  let controller: MqttClient;
  const seq = { fast: 0, slow: 0 };
  let runStart: number;

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir);
    controller = await connectController(server);
    runStart = Math.floor(Date.now() / 1000) * 1000 - 2000;
  });
  afterAll(async () => {
    await controller?.endAsync();
    await server?.close();
    removeDataDir(dir);
  });

  it('stores contiguous frames as a few batches, not a row per frame, and serves them as chart points', async () => {
    publishRun(controller, seq, runStart, 50);
    await vi.waitFor(() => expect(server.counters().frames.acceptedByKind.fast).toBe(50), { timeout: 10_000 });
    const { series: s, slow } = await series(server, 30);
    const storage = server.counters().storage;
    expect(storage.framesWritten).toBe(50);
    expect(storage.batchesWritten).toBeLessThan(10);
    expect(s.t).toHaveLength(100); // 50 frames × 20 samples in 10 ms blocks (30 s window: full 100 Hz)
    expect(s.t[0]).toBe(runStart + 4.5);
    // Stored at the converter's resolution: every value within half a step of what was sent.
    expect(Math.max(...s.currentA.y.map((v) => Math.abs(v - CURRENT.y)))).toBeLessThanOrEqual(adcStep(CURRENT_ADC) / 2);
    expect(slow.t.length).toBeGreaterThan(0);
    expect(slow.temperatureC.z[0]).toBeCloseTo(23, 5);
  });

  it('hands a burst over in rows of about HANDOVER_SAMPLES, not in one row per half second', async () => {
    // 300 frames of 20 samples (6 s of data, well before the other tests' data), published at once.
    const before = server.counters().storage;
    publishRun(controller, seq, runStart - 200_000, 300);
    await vi.waitFor(() => expect(server.counters().storage.framesWritten - before.framesWritten).toBe(300), { timeout: 10_000 });
    const rows = server.counters().storage.batchesWritten - before.batchesWritten;
    expect(rows).toBeGreaterThanOrEqual(Math.floor((300 * 20) / HANDOVER_SAMPLES));
  });

  it('answers windows longer than five minutes from the one-second roll-ups', async () => {
    // 60 s of data in 1 s frames, ending 40 s before the first run; a 400 s window is long
    // enough to be answered from the roll-ups.
    const start = runStart - 100_000;
    const rollupsBefore = server.counters().storage.rollupsWritten;
    publishRun(controller, seq, start, 60, 1000);
    // Seconds are written once complete and settled; all but the newest two or so will be.
    await vi.waitFor(() => expect(server.counters().storage.rollupsWritten - rollupsBefore).toBeGreaterThanOrEqual(57), { timeout: 20_000 });
    const { series: s, slow } = await series(server, 400);
    const inRun = s.t.filter((t) => t >= start && t < start + 60_000);
    expect(inRun.length).toBeGreaterThanOrEqual(57); // one point per second; the last seconds may still be open
    expect(inRun.every((t) => (t - 500) % 1000 === 0)).toBe(true); // mid-second of each roll-up
    // Stored at the converter's resolution: every value within half a step of what was sent.
    expect(Math.max(...s.currentA.x.map((v) => Math.abs(v - CURRENT.x)))).toBeLessThanOrEqual(adcStep(CURRENT_ADC) / 2);
    expect(slow.t.filter((t) => t >= start && t < start + 60_000).length).toBeGreaterThanOrEqual(57);
    expect(slow.flowLpm.x.every((v) => Math.abs(v - 3.1) < 1e-5)).toBe(true);
  });

  it('refuses a second server on the same data folder with a message saying what to do', async () => {
    await expect(startTestServer(dir)).rejects.toThrow(/data folder .* is already in use by Tiltwatch process \d+/);
  });

  it('keeps accounts, the calibration and stored telemetry across a restart', async () => {
    await controller.endAsync();
    await server.close();
    server = await startTestServer(dir);
    controller = await connectController(server);
    expect(server.seededDemoAccounts).toBe(false);
    await signIn(server, 'admin');
    const token = await signIn(server, 'viewer');
    const res = await fetch(`${server.url}/api/calibrations`, { headers: { authorization: `Bearer ${token}` } });
    const { calibrations } = (await res.json()) as { calibrations: { version: number; active: boolean }[] };
    expect(calibrations).toEqual([expect.objectContaining({ version: 1, active: true })]);
    // 250 s window: 50 ms blocks, so the first run's second gives 20 points.
    const { series: s } = await series(server, 250);
    expect(s.t.filter((t) => t >= runStart && t < runStart + 1000)).toHaveLength(20);
  });

  // A second server process on the embedded PGlite and broker: not part of the PostgreSQL/mosquitto pass.
  it.skipIf(usesPostgres())('keeps every flushed frame when the server process is killed, and takes over its stale lock', async () => {
    await controller.endAsync();
    await server.close();
    const child = spawn(process.execPath, ['--import', 'tsx', path.join('server', 'main.ts')], {
      cwd: projectRoot(),
      env: { ...process.env, PORT: '0', MQTT_PORT: '0', TILTWATCH_DATA_DIR: dir, TILTWATCH_DEMO_PASSWORD: TEST_PASSWORD, LOG_LEVEL: 'info' },
      stdio: ['ignore', 'pipe', 'inherit'],
    });
    try {
      let output = '';
      child.stdout.on('data', (chunk: Buffer) => (output += chunk.toString()));
      // Two PGlite clusters start (the main one and the storage worker's): allow for a busy machine.
      await vi.waitFor(() => expect(output).toMatch(/"msg":"Tiltwatch server started"/), { timeout: 90_000, interval: 50 });
      const started = JSON.parse(output.split('\n').find((line) => line.includes('Tiltwatch server started'))!) as { url: string; mqtt: string };
      const credentials = JSON.parse(readFileSync(path.join(dir, 'mqtt-credentials.json'), 'utf8')) as { controller: { username: string; password: string } };
      const client = await mqtt.connectAsync(started.mqtt, { protocolVersion: 4, ...credentials.controller, reconnectPeriod: 0 });
      const killedRun = runStart + 5000;
      publishRun(client, seq, killedRun, 50);
      await vi.waitFor(
        async () => {
          const health = (await (await fetch(`${started.url}/api/health`)).json()) as { storage: { framesWritten: number } };
          expect(health.storage.framesWritten).toBe(50);
        },
        { timeout: 10_000, interval: 50 },
      );
      await client.endAsync(true);
      child.kill('SIGKILL');
      await once(child, 'exit');
    } finally {
      child.kill('SIGKILL');
    }

    server = await startTestServer(dir);
    controller = await connectController(server);
    const { series: s } = await series(server, 250);
    expect(s.t.filter((t) => t >= runStart + 5000 && t < runStart + 6000)).toHaveLength(20);
  }, 180_000); // spawns a second server process: slow on a loaded 2-core machine
});
