/**
 * The telemetry tables as the storage worker thread sees them: encodes incoming batches
 * (sample-codec.ts), keeps them in the bounded write queue until they are committed, and
 * answers the history reads. Plain async code over a Drizzle database, so tests run it in
 * the same thread; in the server it runs inside the worker (storage-worker.ts).
 */
import { and, asc, avg, gt, gte, lte, sql } from 'drizzle-orm';
import type { Db } from '../db/database.js';
import { fastBatches, rollups1s, slowSamples } from '../db/schema.js';
import type { SlowChunk } from '../../shared/live/live-state.js';
import { BlockDecimator } from '../live/block-decimator.js';
import { appendSlowPoint, emptySlowChunk } from '../live/series-chunk.js';
import type { RollupRow } from './rollup-accumulator.js';
import { decodeSamples, encodeSamples, SAMPLE_CODEC } from './sample-codec.js';
import type { AppendInput, BatchInput, RawCurrents, RollupBlock, StoreState, TelemetryReader } from './storage-protocol.js';
import { WriteQueue, type WriteQueueOptions, type WriteUnit } from './write-queue.js';
import type { SlowFrame } from '../../shared/telemetry/messages.js';

/** Rows ready for the database, kept compressed while they wait. */
interface Unit extends WriteUnit {
  batches: (typeof fastBatches.$inferInsert)[];
  slow: (typeof slowSamples.$inferInsert)[];
  rollups: RollupRow[];
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
    this.queue.offer({ batches: input.batches.map(toBatchRow), slow: input.slow.map(toSlowRow), rollups: input.rollups, frames: input.frames, samples: input.samples });
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

  /** Block means (`blockMs` blocks) of the stored currents in [fromMs, toMs], with each batch's calibration id. */
  async rawCurrents(fromMs: number, toMs: number, blockMs: number): Promise<RawCurrents> {
    const rows = await this.open()
      .select({ t0Ms: fastBatches.t0Ms, rateHz: fastBatches.rateHz, n: fastBatches.sampleCount, calibrationId: fastBatches.calibrationId, codec: fastBatches.codec, samples: fastBatches.samples })
      .from(fastBatches)
      .where(and(gt(fastBatches.t1Ms, fromMs), lte(fastBatches.t0Ms, toMs)))
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
      if (row.codec !== SAMPLE_CODEC) throw new Error(`fast batch at ${row.t0Ms} uses codec ${row.codec}; this server reads codec ${SAMPLE_CODEC}`);
      const periodMs = 1000 / row.rateHz;
      const first = Math.max(0, Math.ceil((fromMs - row.t0Ms) / periodMs));
      const end = Math.min(row.n, Math.floor((toMs - row.t0Ms) / periodMs) + 1);
      if (first >= end) continue;
      const [x, y, z] = decodeSamples(row.samples, row.n);
      calibrationId = row.calibrationId ?? -1;
      decimator.push(row.t0Ms + first * periodMs, row.rateHz, x.subarray(first, end), y.subarray(first, end), z.subarray(first, end), take);
    }
    calibrationId = -1;
    decimator.flush(take);
    return {
      t: Float64Array.from(out.t),
      x: Float64Array.from(out.x),
      y: Float64Array.from(out.y),
      z: Float64Array.from(out.z),
      calibrationId: Int32Array.from(out.calibrationId),
    };
  }

  /** Slow readings in [fromMs, toMs]. */
  async slowRows(fromMs: number, toMs: number): Promise<SlowChunk> {
    const rows = await this.open()
      .select()
      .from(slowSamples)
      .where(and(gte(slowSamples.tMs, fromMs), lte(slowSamples.tMs, toMs)))
      .orderBy(asc(slowSamples.tMs));
    // 10 Hz over at most RAW_WINDOW_MAX_S stays under MAX_POINTS without thinning.
    const out = emptySlowChunk();
    for (const r of rows) {
      appendSlowPoint(out, r.tMs, { x: r.coilTempX, y: r.coilTempY, z: r.coilTempZ }, { x: r.flowX, y: r.flowY, z: r.flowZ });
    }
    return out;
  }

  /** Roll-up means per `blockMs` block (a whole number of seconds) in [fromMs, toMs]. */
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
      })
      .from(rollups1s)
      .where(and(gte(rollups1s.tMs, fromMs), lte(rollups1s.tMs, toMs)))
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
    await this.open().transaction(async (tx) => {
      for (const rows of chunks(batches)) await tx.insert(fastBatches).values(rows);
      for (const rows of chunks(slow)) await tx.insert(slowSamples).values(rows);
      for (const rows of chunks(rollups)) await tx.insert(rollups1s).values(rows).onConflictDoNothing();
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
  return {
    t0Ms: Math.floor(b.t0Ms), // stored to the millisecond; the column is an integer
    t1Ms: Math.ceil(b.t0Ms + (b.n * 1000) / b.rateHz),
    seqFirst: b.seqFirst,
    seqLast: b.seqLast,
    rateHz: b.rateHz,
    sampleCount: b.n,
    calibrationId: b.calibrationId,
    codec: SAMPLE_CODEC,
    samples: encodeSamples(channels),
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
