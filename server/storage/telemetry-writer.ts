import type { FastFrame, SlowFrame } from '../../shared/telemetry/messages.js';
import type { Db } from '../db/database.js';
import { fastBatches, rollups1s, slowSamples } from '../db/schema.js';
import type { RollupAccumulator } from './rollup-accumulator.js';
import { encodeSamples } from './sample-codec.js';

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

export interface WriterCounters {
  /** `fast_batches` rows written. */
  batchesWritten: number;
  framesWritten: number;
  slowWritten: number;
  rollupsWritten: number;
  /** Frames dropped because the database fell too far behind (bounded memory). */
  framesDropped: number;
  flushErrors: number;
  /** Samples per channel waiting for the next flush. */
  pendingSamples: number;
}

export interface WriterOptions {
  /** Time between flushes, ms. */
  flushIntervalMs?: number;
  /** Pending samples per channel beyond which new frames are dropped. */
  maxPendingSamples?: number;
  onError?: (error: Error) => void;
}

/**
 * Batched telemetry storage. The pipeline hands frames over synchronously and never waits:
 * frames collect in memory and every `flushIntervalMs` one transaction writes them with one
 * multi-row INSERT per table, together with the roll-up seconds completed meanwhile. Contiguous fast frames (consecutive `seq`, same rate and
 * calibration) are merged into one row. If the database falls behind, memory stays bounded
 * by dropping new frames, which are counted.
 */
export class TelemetryWriter {
  private batches: OpenBatch[] = [];
  private slow: SlowFrame[] = [];
  private pendingSamples = 0;
  private readonly timer: NodeJS.Timeout;
  private flushing: Promise<void> = Promise.resolve();
  private closed = false;
  private readonly counts = { batchesWritten: 0, framesWritten: 0, slowWritten: 0, rollupsWritten: 0, framesDropped: 0, flushErrors: 0 };
  private readonly maxPendingSamples: number;
  private readonly onError: (error: Error) => void;

  /** @param rollups completed seconds are taken from here at every flush, all of them at close */
  constructor(
    private readonly db: Db,
    private readonly rollups: RollupAccumulator,
    opts: WriterOptions = {},
  ) {
    this.maxPendingSamples = opts.maxPendingSamples ?? 600_000;
    this.onError = opts.onError ?? (() => {});
    this.timer = setInterval(() => void this.flush(), opts.flushIntervalMs ?? 500);
  }

  /** Queues a validated fast frame, stored with the id of the calibration in force. */
  addFast(frame: FastFrame, calibrationId: number): void {
    const n = frame.currentA.x.length;
    if (this.closed || this.pendingSamples + n > this.maxPendingSamples) {
      this.counts.framesDropped++;
      return;
    }
    this.pendingSamples += n;
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
    return { ...this.counts, pendingSamples: this.pendingSamples };
  }

  /** Writes everything queued so far; resolves when it is committed (or has failed and been counted). */
  flush(): Promise<void> {
    this.flushing = this.flushing.then(() => this.writePending());
    return this.flushing;
  }

  /** Stops the timer and writes what is still queued, including the open roll-up seconds. */
  async close(): Promise<void> {
    clearInterval(this.timer);
    this.closed = true;
    await this.flush();
  }

  private async writePending(): Promise<void> {
    const batches = this.batches;
    const slow = this.slow;
    const rollups = this.rollups.drain(this.closed);
    if (batches.length === 0 && slow.length === 0 && rollups.length === 0) return;
    this.batches = [];
    this.slow = [];
    this.pendingSamples = 0;
    const frames = batches.reduce((sum, b) => sum + b.seqLast - b.seqFirst + 1, 0);
    try {
      await this.db.transaction(async (tx) => {
        for (const rows of chunks(batches.map(toBatchRow))) await tx.insert(fastBatches).values(rows);
        for (const rows of chunks(slow.map(toSlowRow))) await tx.insert(slowSamples).values(rows);
        for (const rows of chunks(rollups)) await tx.insert(rollups1s).values(rows).onConflictDoNothing();
      });
      this.counts.batchesWritten += batches.length;
      this.counts.framesWritten += frames;
      this.counts.slowWritten += slow.length;
      this.counts.rollupsWritten += rollups.length;
    } catch (error) {
      this.counts.flushErrors++;
      this.counts.framesDropped += frames;
      this.onError(error as Error);
    }
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
