/**
 * The telemetry tables as the storage worker thread sees them: encodes incoming batches
 * (sample-codec.ts), keeps them in the bounded write queue until they are committed, and
 * answers the history reads. Plain async code over a Drizzle database, so tests run it in
 * the same thread; in the server it runs inside the worker (storage-worker.ts).
 */
import { and, asc, avg, desc, gt, gte, lt, sql } from 'drizzle-orm';
import type { Db } from '../db/database.js';
import { fastBatches, predictionSamples, rollups1s, slowSamples } from '../db/schema.js';
import type { HistoryPrediction } from '../../shared/history/history-api.js';
import type { SlowChunk } from '../../shared/live/live-state.js';
import { BlockDecimator } from '../live/block-decimator.js';
import { appendSlowPoint, emptySlowChunk } from '../live/series-chunk.js';
import type { RollupRow } from './rollup-accumulator.js';
import { encodeBlockMeans, forEachBlockMean, MEANS_BLOCK_MS } from './block-means.js';
import { decodeSamples, encodeSamples, SAMPLE_CODEC } from './sample-codec.js';
import type { AppendInput, BatchInput, PredictionRow, RawCurrents, RollupBlock, StoreState, TelemetryReader } from './storage-protocol.js';
import { WriteQueue, type WriteQueueOptions, type WriteUnit } from './write-queue.js';
import type { SlowFrame } from '../../shared/telemetry/messages.js';

/** Rows ready for the database, kept compressed while they wait. */
interface Unit extends WriteUnit {
  batches: (typeof fastBatches.$inferInsert)[];
  slow: (typeof slowSamples.$inferInsert)[];
  rollups: RollupRow[];
  predictions: PredictionRow[];
}

export type StoreOptions = Pick<WriteQueueOptions<Unit>, 'maxPendingSamples' | 'retryMinMs' | 'retryMaxMs' | 'onError' | 'onOutageChange'>;

/** Rows per INSERT: well under PostgreSQL's 65,535 bind parameters at 32 columns. */
const ROWS_PER_INSERT = 1000;

export class TelemetryStore implements TelemetryReader {
  private readonly written = { batchesWritten: 0, framesWritten: 0, slowWritten: 0, rollupsWritten: 0 };
  private readonly queue: WriteQueue<Unit>;

  /** @param db the database, or a function giving it (null while it is not open yet: writes wait, counted as an outage) */
  constructor(
    private readonly db: () => Db | null,
    opts: StoreOptions,
  ) {
    this.queue = new WriteQueue<Unit>({
      ...opts,
      write: (units) => this.write(units),
      probe: async () => {
        await this.open().execute(sql`select 1`);
      },
    });
  }

  /** Encodes and queues what the event loop handed over (refused and counted when the queue is full). */
  append(input: AppendInput): void {
    if (!this.queue.hasRoom(input.samples)) {
      this.queue.drop(input.frames);
      return;
    }
    this.queue.offer({ batches: input.batches.map(toBatchRow), slow: input.slow.map(toSlowRow), rollups: input.rollups, predictions: input.predictions, frames: input.frames, samples: input.samples });
  }

  /** Counts frames the event loop refused before handing them over. */
  dropped(frames: number): void {
    this.queue.drop(frames);
  }

  /** Writes what is queued (see `WriteQueue.flush`). */
  flush(force = false): Promise<void> {
    return this.queue.flush(force);
  }

  /** A last attempt; what still fails is counted as dropped. */
  close(): Promise<void> {
    return this.queue.close();
  }

  state(): StoreState {
    return { ...this.written, ...this.queue.state() };
  }

  /**
   * Block means (`blockMs` blocks) of the stored currents in [fromMs, toMs), with each batch's
   * calibration id. When the window and the blocks are whole multiples of 100 ms they are built
   * from the stored 10 ms means (block-means.ts) without reading or inflating the samples.
   */
  async rawCurrents(fromMs: number, toMs: number, blockMs: number): Promise<RawCurrents> {
    const fromMeans = [fromMs, toMs, blockMs].every((v) => v % MEANS_BLOCK_MS === 0);
    const rows = await this.open()
      .select({
        t0Ms: fastBatches.t0Ms,
        rateHz: fastBatches.rateHz,
        n: fastBatches.sampleCount,
        calibrationId: fastBatches.calibrationId,
        codec: fastBatches.codec,
        blockMeans: fastBatches.blockMeans,
        // PostgreSQL reads the large samples column only where it is needed.
        samples: fromMeans ? sql<Uint8Array | null>`case when ${fastBatches.blockMeans} is null then ${fastBatches.samples} end` : fastBatches.samples,
      })
      .from(fastBatches)
      // Whole milliseconds for the integer columns; the samples are cut to the window below.
      .where(and(gt(fastBatches.t1Ms, Math.floor(fromMs)), lt(fastBatches.t0Ms, Math.ceil(toMs))))
      .orderBy(asc(fastBatches.t0Ms));
    const out = { t: [] as number[], x: [] as number[], y: [] as number[], z: [] as number[], calibrationId: [] as number[] };
    const decimator = new BlockDecimator(blockMs);
    let calibrationId = -1;
    const take = (tMs: number, ix: number, iy: number, iz: number) => {
      out.t.push(tMs);
      out.x.push(ix);
      out.y.push(iy);
      out.z.push(iz);
      out.calibrationId.push(calibrationId);
    };
    for (const row of rows) {
      if (fromMeans && row.blockMeans) {
        forEachBlockMean(row.blockMeans, row.t0Ms, row.rateHz, (tMs, n, x, y, z) => {
          if (tMs < fromMs || tMs >= toMs) return;
          if ((row.calibrationId ?? -1) !== calibrationId) decimator.flush(take);
          calibrationId = row.calibrationId ?? -1;
          decimator.pushMean(tMs, n, x, y, z, take);
        });
        continue;
      }
      if (row.codec !== SAMPLE_CODEC) throw new Error(`fast batch at ${row.t0Ms} uses codec ${row.codec}; this server reads codec ${SAMPLE_CODEC}`);
      if (!row.samples) throw new Error(`fast batch at ${row.t0Ms} has no samples`);
      const periodMs = 1000 / row.rateHz;
      const first = Math.max(0, Math.ceil((fromMs - row.t0Ms) / periodMs));
      const end = Math.min(row.n, Math.ceil((toMs - row.t0Ms) / periodMs));
      if (first >= end) continue;
      const [x, y, z] = decodeSamples(row.samples, row.n);
      calibrationId = row.calibrationId ?? -1;
      decimator.push(row.t0Ms + first * periodMs, row.rateHz, x.subarray(first, end), y.subarray(first, end), z.subarray(first, end), take);
    }
    decimator.flush(take);
    return {
      t: Float64Array.from(out.t),
      x: Float64Array.from(out.x),
      y: Float64Array.from(out.y),
      z: Float64Array.from(out.z),
      calibrationId: Int32Array.from(out.calibrationId),
    };
  }

  /** Slow readings in [fromMs, toMs); with `blockMs`, means per block (aligned to the epoch, at the mean time of its readings). */
  async slowRows(fromMs: number, toMs: number, blockMs = 0): Promise<SlowChunk> {
    const inWindow = and(gte(slowSamples.tMs, fromMs), lt(slowSamples.tMs, toMs));
    const out = emptySlowChunk();
    if (blockMs > 0) {
      // Inlined (a whole number we computed), so SELECT and GROUP BY are the same expression to PostgreSQL.
      const block = sql`(${slowSamples.tMs} / ${sql.raw(String(Math.trunc(blockMs)))})`;
      const num = (column: Parameters<typeof avg>[0]) => avg(column).mapWith(Number);
      const rows = await this.open()
        .select({ t: num(slowSamples.tMs), tx: num(slowSamples.coilTempX), ty: num(slowSamples.coilTempY), tz: num(slowSamples.coilTempZ), fx: num(slowSamples.flowX), fy: num(slowSamples.flowY), fz: num(slowSamples.flowZ) })
        .from(slowSamples)
        .where(inWindow)
        .groupBy(block)
        .orderBy(block);
      for (const r of rows) appendSlowPoint(out, r.t, { x: r.tx, y: r.ty, z: r.tz }, { x: r.fx, y: r.fy, z: r.fz });
      return out;
    }
    const rows = await this.open().select().from(slowSamples).where(inWindow).orderBy(asc(slowSamples.tMs));
    for (const r of rows) appendSlowPoint(out, r.tMs, { x: r.coilTempX, y: r.coilTempY, z: r.coilTempZ }, { x: r.flowX, y: r.flowY, z: r.flowZ });
    return out;
  }

  /** Stored predictions in [fromMs, toMs) after the one in force at `fromMs`, thinned to `maxPoints`. */
  async predictions(fromMs: number, toMs: number, maxPoints: number): Promise<HistoryPrediction> {
    const db = this.open();
    const before = await db.select().from(predictionSamples).where(lt(predictionSamples.tMs, fromMs)).orderBy(desc(predictionSamples.tMs)).limit(1);
    const inWindow = await db
      .select()
      .from(predictionSamples)
      .where(and(gte(predictionSamples.tMs, fromMs), lt(predictionSamples.tMs, toMs)))
      .orderBy(asc(predictionSamples.tMs));
    return predictionColumns([...before, ...thinToLast(inWindow, fromMs, toMs, maxPoints)]);
  }

  /** Roll-up means per `blockMs` block (a whole number of seconds) in [fromMs, toMs). */
  async rollupBlocks(fromMs: number, toMs: number, blockMs: number): Promise<RollupBlock[]> {
    // Inlined (a whole number we computed), so SELECT and GROUP BY are the same expression to PostgreSQL.
    const width = sql.raw(String(Math.trunc(blockMs)));
    const block = sql`(${rollups1s.tMs} / ${width}) * ${width}`;
    const num = (column: Parameters<typeof avg>[0]) => avg(column).mapWith(Number);
    return this.open()
      .select({
        t: sql<number>`${block}`.mapWith(Number),
        ix: num(rollups1s.currentXMean),
        iy: num(rollups1s.currentYMean),
        iz: num(rollups1s.currentZMean),
        bx: num(rollups1s.bXMean),
        by: num(rollups1s.bYMean),
        bz: num(rollups1s.bZMean),
        bMag: num(rollups1s.bMagMean),
        tx: num(rollups1s.tempXMean),
        ty: num(rollups1s.tempYMean),
        tz: num(rollups1s.tempZMean),
        fx: num(rollups1s.flowXMean),
        fy: num(rollups1s.flowYMean),
        fz: num(rollups1s.flowZMean),
        sigmaBMag: num(rollups1s.sigmaBMagMean),
        sigmaTheta: num(rollups1s.sigmaThetaMean),
        sigmaPhi: num(rollups1s.sigmaPhiMean),
      })
      .from(rollups1s)
      .where(and(gte(rollups1s.tMs, fromMs), lt(rollups1s.tMs, toMs)))
      .groupBy(block)
      .orderBy(block);
  }

  private open(): Db {
    const db = this.db();
    if (!db) throw new Error('the telemetry database is not open yet');
    return db;
  }

  private async write(units: readonly Unit[]): Promise<void> {
    const batches = units.flatMap((u) => u.batches);
    const slow = units.flatMap((u) => u.slow);
    const rollups = units.flatMap((u) => u.rollups);
    const predictions = units.flatMap((u) => u.predictions);
    await this.open().transaction(async (tx) => {
      for (const rows of chunks(batches)) await tx.insert(fastBatches).values(rows);
      for (const rows of chunks(slow)) await tx.insert(slowSamples).values(rows);
      for (const rows of chunks(rollups)) await tx.insert(rollups1s).values(rows).onConflictDoNothing();
      // A later collapse-ratio update of a prediction replaces its row.
      for (const rows of chunks(latestPerTime(predictions))) {
        await tx
          .insert(predictionSamples)
          .values(rows)
          .onConflictDoUpdate({ target: predictionSamples.tMs, set: { collapseRatio: sql`excluded.collapse_ratio`, stable: sql`excluded.stable`, reason: sql`excluded.reason` } });
      }
    });
    this.written.batchesWritten += batches.length;
    this.written.framesWritten += units.reduce((sum, u) => sum + u.frames, 0);
    this.written.slowWritten += slow.length;
    this.written.rollupsWritten += rollups.length;
  }
}

function* chunks<T>(rows: T[]): Generator<T[]> {
  for (let i = 0; i < rows.length; i += ROWS_PER_INSERT) yield rows.slice(i, i + ROWS_PER_INSERT);
}

function toBatchRow(b: BatchInput): typeof fastBatches.$inferInsert {
  const channels = [0, 1, 2, 3, 4, 5].map((c) => b.samples.subarray(c * b.n, (c + 1) * b.n));
  const t0Ms = Math.floor(b.t0Ms); // stored to the millisecond; the column is an integer
  return {
    t0Ms,
    t1Ms: Math.ceil(b.t0Ms + (b.n * 1000) / b.rateHz),
    seqFirst: b.seqFirst,
    seqLast: b.seqLast,
    rateHz: b.rateHz,
    sampleCount: b.n,
    calibrationId: b.calibrationId,
    codec: SAMPLE_CODEC,
    samples: encodeSamples(channels),
    blockMeans: encodeBlockMeans(t0Ms, b.rateHz, b.n, b.samples),
    setpointX: b.setpoint.x,
    setpointY: b.setpoint.y,
    setpointZ: b.setpoint.z,
  };
}

function toSlowRow(f: SlowFrame): typeof slowSamples.$inferInsert {
  return {
    tMs: f.tMs,
    seq: f.seq,
    coilTempX: f.coilTempC.x,
    coilTempY: f.coilTempC.y,
    coilTempZ: f.coilTempC.z,
    flowX: f.flowLpm.x,
    flowY: f.flowLpm.y,
    flowZ: f.flowLpm.z,
    waterSupplyC: f.waterSupplyC,
    waterReturnX: f.waterReturnC.x,
    waterReturnY: f.waterReturnC.y,
    waterReturnZ: f.waterReturnC.z,
  };
}

/** One row per time (the last given wins): PostgreSQL refuses two rows for one key in one INSERT … ON CONFLICT. */
function latestPerTime(rows: PredictionRow[]): PredictionRow[] {
  return [...new Map(rows.map((r) => [r.tMs, r])).values()];
}

/** At most `maxPoints` rows: the last of each of `maxPoints` equal blocks of the window (each holds until the next). */
function thinToLast<T extends { tMs: number }>(rows: T[], fromMs: number, toMs: number, maxPoints: number): T[] {
  if (rows.length <= maxPoints) return rows;
  const blockMs = (toMs - fromMs) / maxPoints;
  return rows.filter((r, i) => i === rows.length - 1 || Math.floor((rows[i + 1].tMs - fromMs) / blockMs) !== Math.floor((r.tMs - fromMs) / blockMs));
}

function predictionColumns(rows: (typeof predictionSamples.$inferSelect)[]): HistoryPrediction {
  return {
    t: rows.map((r) => r.tMs),
    profileId: rows.map((r) => r.profileId),
    thetaDeg: rows.map((r) => r.thetaDeg),
    phiDeg: rows.map((r) => r.phiDeg),
    stable: rows.map((r) => r.stable),
    reason: rows.map((r) => r.reason),
    epsDd: rows.map((r) => r.epsDd),
    fermiSurfaceAspect: rows.map((r) => r.fermiSurfaceAspect),
    cloudAspect: rows.map((r) => r.cloudAspect),
    tofAspect: rows.map((r) => r.tofAspect),
    tofMajorAngleDeg: rows.map((r) => r.tofMajorAngleDeg),
    collapseRatio: rows.map((r) => r.collapseRatio),
    camera: rows.map((r) => r.camera ?? null),
  };
}
