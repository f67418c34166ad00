import { describe, expect, it } from 'vitest';
import { fastBatches, rollups1s, slowSamples } from '../db/schema.js';
import { useTempDatabase } from '../testing/temp-database.js';
import { pruneTelemetry } from './retention.js';
import { encodeSamples, SAMPLE_CODEC } from './sample-codec.js';

const HOUR = 3600_000;
const NOW = Date.UTC(2026, 5, 1);

describe('telemetry retention', () => {
  const database = useTempDatabase();

  const batch = (t0Ms: number) => {
    const samples = encodeSamples([0, 1, 2, 3, 4, 5].map((c) => [c, c + 0.5]));
    return {
      t0Ms,
      t1Ms: t0Ms + 2,
      seqFirst: 0,
      seqLast: 0,
      rateHz: 1000,
      sampleCount: 2,
      codec: SAMPLE_CODEC,
      samples,
      setpointX: 0,
      setpointY: 0,
      setpointZ: 0,
    };
  };
  const slow = (tMs: number) => ({
    tMs,
    seq: 0,
    coilTempX: 20,
    coilTempY: 20,
    coilTempZ: 20,
    flowX: 3,
    flowY: 3,
    flowZ: 3,
    waterSupplyC: 18,
    waterReturnX: 19,
    waterReturnY: 19,
    waterReturnZ: 19,
  });
  const rollup = (tMs: number) => ({
    tMs,
    fastSamples: 1000,
    ...Object.fromEntries(
      ['currentX', 'currentY', 'currentZ'].flatMap((c) => ['Mean', 'Min', 'Max'].map((s) => [`${c}${s}`, 0])),
    ),
    bXMean: 0,
    bYMean: 0,
    bZMean: 0,
    bMagMean: 0,
    bMagMin: 0,
    bMagMax: 0,
    slowSamples: 0,
  }) as typeof rollups1s.$inferInsert;

  it('prunes raw telemetry past the raw retention and roll-ups past the roll-up retention, keeping the rest', async () => {
    const { db } = database;
    await db.insert(fastBatches).values([batch(NOW - 25 * HOUR), batch(NOW - 23 * HOUR)]);
    await db.insert(slowSamples).values([slow(NOW - 25 * HOUR), slow(NOW - 23 * HOUR)]);
    await db.insert(rollups1s).values([rollup(NOW - 31 * 24 * HOUR), rollup(NOW - 29 * 24 * HOUR)]);

    await pruneTelemetry(db, { rawHours: 24, rollupDays: 30 }, NOW);

    expect((await db.select({ t: fastBatches.t0Ms }).from(fastBatches)).map((r) => r.t)).toEqual([NOW - 23 * HOUR]);
    expect((await db.select({ t: slowSamples.tMs }).from(slowSamples)).map((r) => r.t)).toEqual([NOW - 23 * HOUR]);
    expect((await db.select({ t: rollups1s.tMs }).from(rollups1s)).map((r) => r.t)).toEqual([NOW - 29 * 24 * HOUR]);
  });
});
