import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { adcStep, CURRENT_ADC } from '../../shared/telemetry/adc.js';
import { openDatabase, type Db, type OpenDatabase } from '../db/database.js';
import { fastBatches } from '../db/schema.js';
import { seedPglite } from '../testing/pglite-template.js';
import { makeDataDir, removeDataDir } from '../testing/test-server.js';
import type { AppendInput } from './storage-protocol.js';
import { TelemetryStore } from './telemetry-store.js';

const T0 = Date.UTC(2026, 11, 2, 6, 0, 0);

/** One 0.5 s batch at 1 kHz from `t0Ms` with seq `first…first+24`: current x ramps, the rest constant. */
function batchInput(t0Ms: number, first: number): AppendInput {
  const n = 500;
  const samples = new Float64Array(6 * n);
  for (let i = 0; i < n; i++) {
    samples[i] = 1 + i * 1e-3; // current x, A
    samples[n + i] = 2; // current y
    samples[2 * n + i] = -3; // current z
  }
  samples.fill(1.5, 3 * n, 6 * n); // voltages, V
  return {
    batches: [{ t0Ms, rateHz: 1000, seqFirst: first, seqLast: first + 24, calibrationId: 1, setpoint: { x: 1, y: 2, z: -3 }, n, samples }],
    slow: [{ seq: first, tMs: t0Ms, coilTempC: { x: 30, y: 31, z: 32 }, flowLpm: { x: 3, y: 3.1, z: 3.2 }, waterSupplyC: 18, waterReturnC: { x: 19, y: 19, z: 19 } }],
    rollups: [],
    predictions: [],
    frames: 25,
    samples: n,
  };
}

describe('TelemetryStore over PGlite', () => {
  let dir: string;
  let database: OpenDatabase;

  beforeAll(async () => {
    dir = await makeDataDir();
    await seedPglite(dir);
    database = await openDatabase({ dataDir: dir, databaseUrl: null, pgliteFolder: 'telemetry' });
  }, 120_000); // may build the migrated template cluster first: slow on a loaded machine
  afterAll(async () => {
    await database?.close();
    removeDataDir(dir);
  });

  it('stores batches in the compact format and reads them back as block means within half a converter step', async () => {
    const store = new TelemetryStore(() => database.db, { maxPendingSamples: 10_000 });
    store.append(batchInput(T0, 0));
    await store.flush();
    expect(store.state()).toMatchObject({ batchesWritten: 1, framesWritten: 25, slowWritten: 1, pendingFrames: 0, outage: false });
    const [row] = await database.db.select({ codec: fastBatches.codec, samples: fastBatches.samples, n: fastBatches.sampleCount }).from(fastBatches);
    expect(row.codec).toBe(1);
    expect(row.samples.byteLength).toBeLessThan(row.n * 6 * 4); // smaller than float32

    const raw = await store.rawCurrents(T0, T0 + 500, 10);
    expect(raw.t.length).toBe(50);
    expect(Array.from(raw.calibrationId).every((id) => id === 1)).toBe(true);
    // Block i holds samples 10i … 10i+9: mean of current x is 1 + (10i + 4.5)·1e-3.
    const worst = Math.max(...Array.from(raw.x, (x, i) => Math.abs(x - (1 + (10 * i + 4.5) * 1e-3))));
    expect(worst).toBeLessThanOrEqual(adcStep(CURRENT_ADC) / 2);
    expect(Math.max(...Array.from(raw.z, (z) => Math.abs(z + 3)))).toBeLessThanOrEqual(adcStep(CURRENT_ADC) / 2);
    const slow = await store.slowRows(T0 - 1, T0 + 1);
    expect(slow.temperatureC.z).toEqual([32]);
  });

  it('reads long windows from the stored 100 ms block means, merging the parts of blocks cut by batch edges', async () => {
    const store = new TelemetryStore(() => database.db, { maxPendingSamples: 10_000 });
    // Two adjacent batches starting 50 ms into a block: the block at 500 ms is half in each.
    store.append(batchInput(T0 + 30_050, 300));
    store.append(batchInput(T0 + 30_550, 325));
    await store.flush();
    const means = await store.rawCurrents(T0 + 30_000, T0 + 31_100, 100);
    expect(Array.from(means.t)).toEqual([30_074.5, 30_149.5, 30_249.5, 30_349.5, 30_449.5, 30_549.5, 30_649.5, 30_749.5, 30_849.5, 30_949.5, 31_024.5].map((ms) => T0 + ms));
    // Sample k of each batch (k = 0…499, one per ms from its start) has x = 1 + k·1e-3.
    const expected = (startMs: number, endMs: number) => {
      let sum = 0;
      for (let t = startMs; t < endMs; t++) sum += t < 30_550 ? 1 + (t - 30_050) * 1e-3 : 1 + (t - 30_550) * 1e-3;
      return sum / (endMs - startMs);
    };
    expect(means.x[0]).toBeCloseTo(expected(30_050, 30_100), 5);
    expect(means.x[5]).toBeCloseTo(expected(30_500, 30_600), 5);
    expect(means.x.at(-1)).toBeCloseTo(expected(31_000, 31_050), 5);
    // The same blocks from the samples themselves (a window off the 100 ms grid).
    const exact = await store.rawCurrents(T0 + 30_000 + 1e-3, T0 + 31_100, 100);
    expect(Array.from(exact.t)).toEqual(Array.from(means.t));
    expect(Math.max(...Array.from(exact.x, (x, i) => Math.abs(x - means.x[i])))).toBeLessThanOrEqual(adcStep(CURRENT_ADC) / 2);
  });

  it('keeps each prediction once (a later update replaces it), with the one in force before a window, thinned to the points asked for', async () => {
    const store = new TelemetryStore(() => database.db, { maxPendingSamples: 10_000 });
    const p = (tMs: number, collapseRatio: number | null) => ({
      tMs, profileId: 1, thetaDeg: 30, phiDeg: 20, stable: true, reason: null, epsDd: 0.15,
      fermiSurfaceAspect: 0.9, cloudAspect: 1.1, tofAspect: 1.2, tofMajorAngleDeg: 10, collapseRatio, camera: null,
    });
    const base = T0 + 40_000;
    const predictions = [p(base - 5000, 0.3), p(base, null), p(base + 100, 0.5), p(base + 200, 0.6), p(base + 900, 0.7)];
    store.append({ batches: [], slow: [], rollups: [], predictions, frames: 0, samples: 0 });
    store.append({ batches: [], slow: [], rollups: [], predictions: [p(base, 0.45)], frames: 0, samples: 0 });
    await store.flush();
    const all = await store.predictions(base - 1000, base + 1000, 100);
    expect(all.t).toEqual([base - 5000, base, base + 100, base + 200, base + 900]);
    expect(all.collapseRatio).toEqual([0.3, 0.45, 0.5, 0.6, 0.7]);
    // Two points over the window: the last prediction of each half.
    expect((await store.predictions(base - 1000, base + 1000, 2)).t).toEqual([base - 5000, base + 900]);
  });

  it('keeps what arrives while the database is not available and writes it once it is', async () => {
    let available: Db | null = null;
    const outages: boolean[] = [];
    const store = new TelemetryStore(() => available, { maxPendingSamples: 10_000, retryMinMs: 1, retryMaxMs: 1, onOutageChange: (outage) => outages.push(outage) });
    store.append(batchInput(T0 + 10_000, 100));
    await store.flush();
    expect(store.state()).toMatchObject({ framesWritten: 0, pendingFrames: 25, pendingSamples: 500, outage: true, framesDropped: 0 });
    store.append(batchInput(T0 + 10_500, 125));
    available = database.db;
    await new Promise((resolve) => setTimeout(resolve, 5));
    await store.flush();
    expect(store.state()).toMatchObject({ framesWritten: 50, pendingFrames: 0, outage: false, framesDropped: 0 });
    expect(outages).toEqual([true, false]);
    expect((await store.rawCurrents(T0 + 10_000, T0 + 11_000, 10)).t.length).toBe(100);
  });

  it('refuses and counts what does not fit in the queue', async () => {
    const store = new TelemetryStore(() => null, { maxPendingSamples: 600 });
    store.append(batchInput(T0 + 20_000, 200));
    store.append(batchInput(T0 + 20_500, 225));
    expect(store.state()).toMatchObject({ pendingFrames: 25, framesDropped: 25 });
  });
});
