import type { FastFrame, SlowFrame } from '../../shared/telemetry/messages.js';
import type { Db } from '../db/database.js';
import { fastBatches, rollups1s, slowSamples } from '../db/schema.js';
import { sql } from 'drizzle-orm';
import type { RollupAccumulator, RollupRow } from './rollup-accumulator.js';
import { encodeSamples } from './sample-codec.js';
import { WriteQueue, type WriteQueueState, type WriteUnit } from './write-queue.js';

/** A contiguous run of fast frames that becomes one `fast_batches` row. */
interface OpenBatch {
  t0Ms: number;
  rateHz: number;
  seqFirst: number;
  seqLast: number;
  calibrationId: number;
  channels: { cx: number[]; cy: number[]; cz: number[]; vx: number[]; vy: number[]; vz: number[] };
  setpoint: { x: number; y: number; z: number };
}

/**
 * The writer's state on `/api/health` under `storage`. The first seven names are read by tools
 * outside the repository: keep them.
 */
export interface WriterCounters extends WriteQueueState {
  /** `fast_batches` rows written. */
  batchesWritten: number;
  framesWritten: number;
  slowWritten: number;
  rollupsWritten: number;
}

export interface WriterOptions {
  /** Time between flushes, ms. */
  flushIntervalMs?: number;
  /** Pending samples per channel beyond which new frames are refused (counted in `framesDropped`). */
  maxPendingSamples?: number;
  /** First pause after a failed write, ms; doubles up to `retryMaxMs`. */
  retryMinMs?: number;
  retryMaxMs?: number;
  onError?: (error: Error) => void;
  /** Called when the database stops taking writes (with the error) and when it takes them again (null). */
  onOutageChange?: (outage: boolean, error: Error | null) => void;
}

/** What one flush hands to the queue: the frames, slow frames and roll-up seconds gathered meanwhile. */
interface Unit extends WriteUnit {
  batches: OpenBatch[];
  slow: SlowFrame[];
  rollups: RollupRow[];
}

/**
 * Batched telemetry storage. The pipeline hands frames over synchronously and never waits:
 * frames collect in memory and every `flushIntervalMs` they go to a bounded write queue
 * (`WriteQueue`) that writes them in one transaction with one multi-row INSERT per table,
 * together with the roll-up seconds completed meanwhile, and keeps them for a retry when the
 * write fails. Contiguous fast frames (consecutive `seq`, same rate and calibration) are
 * merged into one row. Memory stays bounded by refusing new frames, which are counted.
 */
export class TelemetryWriter {
  private batches: OpenBatch[] = [];
  private slow: SlowFrame[] = [];
  private openSamples = 0;
  private readonly timer: NodeJS.Timeout;
  private closed = false;
  private readonly written = { batchesWritten: 0, framesWritten: 0, slowWritten: 0, rollupsWritten: 0 };
  private readonly queue: WriteQueue<Unit>;

  /** @param rollups completed seconds are taken from here at every flush, all of them at close */
  constructor(
    private readonly db: Db,
    private readonly rollups: RollupAccumulator,
    opts: WriterOptions = {},
  ) {
    this.queue = new WriteQueue<Unit>({
      write: (units) => this.write(units),
      probe: async () => {
        await this.db.execute(sql`select 1`);
      },
      maxPendingSamples: opts.maxPendingSamples ?? 600_000,
      retryMinMs: opts.retryMinMs,
      retryMaxMs: opts.retryMaxMs,
      onError: opts.onError,
      onOutageChange: opts.onOutageChange,
    });
    this.timer = setInterval(() => void this.flush(), opts.flushIntervalMs ?? 500);
  }

  /** Queues a validated fast frame, stored with the id of the calibration in force. */
  addFast(frame: FastFrame, calibrationId: number): void {
    const n = frame.currentA.x.length;
    if (this.closed || !this.queue.hasRoom(this.openSamples + n)) {
      this.queue.drop(1);
      return;
    }
    this.openSamples += n;
    const last = this.batches.at(-1);
    const expectedT0 = last ? last.t0Ms + (last.channels.cx.length * 1000) / last.rateHz : 0;
    if (
      last &&
      frame.seq === last.seqLast + 1 &&
      frame.rateHz === last.rateHz &&
      calibrationId === last.calibrationId &&
      Math.abs(frame.t0Ms - expectedT0) < 1000 / frame.rateHz
    ) {
      const c = last.channels;
      c.cx.push(...frame.currentA.x);
      c.cy.push(...frame.currentA.y);
      c.cz.push(...frame.currentA.z);
      c.vx.push(...frame.voltageV.x);
      c.vy.push(...frame.voltageV.y);
      c.vz.push(...frame.voltageV.z);
      last.seqLast = frame.seq;
      last.setpoint = { ...frame.setpointA };
      return;
    }
    this.batches.push({
      t0Ms: frame.t0Ms,
      rateHz: frame.rateHz,
      seqFirst: frame.seq,
      seqLast: frame.seq,
      calibrationId,
      channels: {
        cx: [...frame.currentA.x],
        cy: [...frame.currentA.y],
        cz: [...frame.currentA.z],
        vx: [...frame.voltageV.x],
        vy: [...frame.voltageV.y],
        vz: [...frame.voltageV.z],
      },
      setpoint: { ...frame.setpointA },
    });
  }

  addSlow(frame: SlowFrame): void {
    if (this.closed) return;
    this.slow.push(frame);
  }

  counters(): WriterCounters {
    const queued = this.queue.state();
    return { ...this.written, ...queued, pendingSamples: queued.pendingSamples + this.openSamples };
  }

  /**
   * Hands everything gathered so far to the queue and writes what is queued; resolves when the
   * attempt is over (committed, or failed and counted, the data kept for a retry). While a
   * retry pause runs, the data waits for the pause to end.
   */
  flush(): Promise<void> {
    this.enqueue();
    return this.queue.flush();
  }

  /** Stops the timer and makes a last attempt, including the open roll-up seconds; what still fails is counted as dropped. */
  async close(): Promise<void> {
    clearInterval(this.timer);
    this.closed = true;
    this.enqueue();
    await this.queue.close();
  }

  private enqueue(): void {
    const rollups = this.rollups.drain(this.closed);
    if (this.batches.length === 0 && this.slow.length === 0 && rollups.length === 0) return;
    const batches = this.batches;
    const frames = batches.reduce((sum, b) => sum + b.seqLast - b.seqFirst + 1, 0);
    this.queue.offer({ batches, slow: this.slow, rollups, frames, samples: this.openSamples });
    this.batches = [];
    this.slow = [];
    this.openSamples = 0;
  }

  private async write(units: readonly Unit[]): Promise<void> {
    const batches = units.flatMap((u) => u.batches);
    const slow = units.flatMap((u) => u.slow);
    const rollups = units.flatMap((u) => u.rollups);
    await this.db.transaction(async (tx) => {
      for (const rows of chunks(batches.map(toBatchRow))) await tx.insert(fastBatches).values(rows);
      for (const rows of chunks(slow.map(toSlowRow))) await tx.insert(slowSamples).values(rows);
      for (const rows of chunks(rollups)) await tx.insert(rollups1s).values(rows).onConflictDoNothing();
    });
    this.written.batchesWritten += batches.length;
    this.written.framesWritten += units.reduce((sum, u) => sum + u.frames, 0);
    this.written.slowWritten += slow.length;
    this.written.rollupsWritten += rollups.length;
  }
}

/** Rows per INSERT: well under PostgreSQL's 65,535 bind parameters at 32 columns. */
const ROWS_PER_INSERT = 1000;

function* chunks<T>(rows: T[]): Generator<T[]> {
  for (let i = 0; i < rows.length; i += ROWS_PER_INSERT) yield rows.slice(i, i + ROWS_PER_INSERT);
}

function toBatchRow(b: OpenBatch): typeof fastBatches.$inferInsert {
  const n = b.channels.cx.length;
  return {
    t0Ms: Math.floor(b.t0Ms), // stored to the millisecond; the column is an integer
    t1Ms: Math.ceil(b.t0Ms + (n * 1000) / b.rateHz),
    seqFirst: b.seqFirst,
    seqLast: b.seqLast,
    rateHz: b.rateHz,
    sampleCount: n,
    calibrationId: b.calibrationId,
    currentX: encodeSamples(b.channels.cx),
    currentY: encodeSamples(b.channels.cy),
    currentZ: encodeSamples(b.channels.cz),
    voltageX: encodeSamples(b.channels.vx),
    voltageY: encodeSamples(b.channels.vy),
    voltageZ: encodeSamples(b.channels.vz),
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
