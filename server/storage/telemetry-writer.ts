import type { HistoryPrediction } from '../../shared/history/history-api.js';
import type { LivePrediction, SlowChunk } from '../../shared/live/live-state.js';
import type { FastFrame, SlowFrame } from '../../shared/telemetry/messages.js';
import type { ServerConfig } from '../config.js';
import type { RollupAccumulator } from './rollup-accumulator.js';
import type { AppendInput, BatchInput, PredictionRow, RawCurrents, RollupBlock, StoreState, TelemetryReader } from './storage-protocol.js';
import { StorageWorker } from './storage-worker-thread.js';

/** A contiguous run of fast frames that becomes one `fast_batches` row. */
interface OpenBatch {
  t0Ms: number;
  rateHz: number;
  seqFirst: number;
  seqLast: number;
  calibrationId: number;
  channels: [number[], number[], number[], number[], number[], number[]];
  setpoint: { x: number; y: number; z: number };
}

/**
 * The writer's state on `/api/health` under `storage`. `framesDropped`, `flushErrors` and
 * `pendingSamples` are read by tools outside the repository: keep the names.
 */
export interface WriterCounters extends StoreState {
  /**
   * Longest single piece of storage work done on the event loop (gathering a frame, handing a
   * flush over), ms of wall-clock time (on a busy machine this includes time the thread was not
   * scheduled).
   */
  eventLoopMaxMs: number;
  /** Pieces of storage work on the event loop so far, and how many of them took longer than 10 ms. */
  eventLoopSteps: number;
  eventLoopStepsOver10Ms: number;
}

export interface WriterOptions {
  /** Time between hand-overs to the storage worker, ms. */
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

/**
 * Gathered samples (per channel) that are handed to the worker at once, before the next timed
 * flush: at high rates this keeps each hand-over, and so each step on the event loop, short.
 * Rows then hold at most about this many samples, whatever the rate.
 */
export const HANDOVER_SAMPLES = 2000;

/** Where the telemetry goes: the data folder (PGlite cluster `telemetry/`) or the PostgreSQL server, and how long it is kept. */
export type StorageSettings = Pick<ServerConfig, 'dataDir' | 'databaseUrl' | 'retention'>;

const EMPTY_STATE: StoreState = {
  batchesWritten: 0,
  framesWritten: 0,
  slowWritten: 0,
  rollupsWritten: 0,
  framesDropped: 0,
  flushErrors: 0,
  pendingSamples: 0,
  pendingFrames: 0,
  outage: false,
  failingSince: null,
  lastError: null,
};

/**
 * Telemetry storage as the event loop sees it. The pipeline hands frames over synchronously
 * and never waits: contiguous fast frames (consecutive `seq`, same rate and calibration) are
 * gathered into runs, and every `flushIntervalMs` (or sooner, once `HANDOVER_SAMPLES` have
 * gathered) the runs, the slow frames and the completed roll-up seconds go to the storage
 * worker thread as transferred arrays; the worker writes what it holds every `flushIntervalMs`. The worker
 * (storage-worker.ts) encodes, compresses and writes them, keeps them in a bounded queue
 * through a database outage, and answers the history reads (`TelemetryReader`). Memory stays
 * bounded by refusing new frames, which are counted.
 */
export class TelemetryWriter implements TelemetryReader {
  private batches: OpenBatch[] = [];
  private slow: SlowFrame[] = [];
  private predictionRows: PredictionRow[] = [];
  private openSamples = 0;
  private openFrames = 0;
  /** Handed to the worker, not yet confirmed by its state. */
  private readonly inTransit = { samples: 0, frames: 0 };
  private refused = 0;
  private worker: StoreState = EMPTY_STATE;
  private readonly loop = { maxMs: 0, steps: 0, over10Ms: 0 };
  private readonly timer: NodeJS.Timeout;
  private closed = false;
  private readonly maxPendingSamples: number;
  private readonly thread: StorageWorker;

  /** @param rollups completed seconds are taken from here at every hand-over, all of them at close */
  constructor(
    settings: StorageSettings,
    private readonly rollups: RollupAccumulator,
    opts: WriterOptions = {},
  ) {
    this.maxPendingSamples = opts.maxPendingSamples ?? 600_000;
    this.thread = new StorageWorker(
      {
        dataDir: settings.dataDir,
        databaseUrl: settings.databaseUrl,
        retention: settings.retention,
        maxPendingSamples: this.maxPendingSamples,
        retryMinMs: opts.retryMinMs,
        retryMaxMs: opts.retryMaxMs,
      },
      {
        onState: (state) => (this.worker = state),
        onLog: (level, message, error) => {
          if (level === 'error') opts.onError?.(new Error(error ? `${message}: ${error}` : message));
        },
        onOutage: (outage, error) => opts.onOutageChange?.(outage, error === null ? null : new Error(error)),
      },
    );
    this.timer = setInterval(() => void this.flush().catch(() => undefined), opts.flushIntervalMs ?? 500);
  }

  /** Resolves once the storage worker has opened the telemetry database. */
  ready(): Promise<void> {
    return this.thread.ready;
  }

  /** Gathers a validated fast frame, stored with the id of the calibration in force. */
  addFast(frame: FastFrame, calibrationId: number): void {
    const started = performance.now();
    const n = frame.currentA.x.length;
    if (this.closed || this.pending() + n > this.maxPendingSamples) {
      this.refused++;
      return;
    }
    this.openSamples += n;
    this.openFrames++;
    const last = this.batches.at(-1);
    const expectedT0 = last ? last.t0Ms + (last.channels[0].length * 1000) / last.rateHz : 0;
    const sources = [frame.currentA.x, frame.currentA.y, frame.currentA.z, frame.voltageV.x, frame.voltageV.y, frame.voltageV.z];
    if (
      last &&
      frame.seq === last.seqLast + 1 &&
      frame.rateHz === last.rateHz &&
      calibrationId === last.calibrationId &&
      Math.abs(frame.t0Ms - expectedT0) < 1000 / frame.rateHz
    ) {
      for (let c = 0; c < 6; c++) last.channels[c].push(...sources[c]);
      last.seqLast = frame.seq;
      last.setpoint = { ...frame.setpointA };
    } else {
      this.batches.push({
        t0Ms: frame.t0Ms,
        rateHz: frame.rateHz,
        seqFirst: frame.seq,
        seqLast: frame.seq,
        calibrationId,
        channels: [[...sources[0]], [...sources[1]], [...sources[2]], [...sources[3]], [...sources[4]], [...sources[5]]],
        setpoint: { ...frame.setpointA },
      });
    }
    this.timed(started);
    if (this.openSamples >= HANDOVER_SAMPLES) void this.handOver().catch(() => undefined);
  }

  addSlow(frame: SlowFrame): void {
    if (this.closed) return;
    this.slow.push(frame);
  }

  /** Keeps a live prediction as it was shown (a later update of the same prediction replaces it when stored). */
  addPrediction(p: LivePrediction): void {
    if (this.closed) return;
    this.predictionRows.push(toPredictionRow(p));
  }

  counters(): WriterCounters {
    return {
      ...this.worker,
      framesDropped: this.worker.framesDropped + this.refused,
      pendingSamples: this.pending(),
      pendingFrames: this.worker.pendingFrames + this.inTransit.frames + this.openFrames,
      eventLoopMaxMs: this.loop.maxMs,
      eventLoopSteps: this.loop.steps,
      eventLoopStepsOver10Ms: this.loop.over10Ms,
    };
  }

  /**
   * Hands everything gathered so far to the worker and lets it write what is queued; resolves
   * when the attempt is over (committed, or failed and counted, the data kept for a retry).
   */
  async flush(): Promise<void> {
    const handedOver = this.handOver();
    await this.thread.request({ kind: 'flush' });
    await handedOver;
  }

  /** Stops the timer and makes a last attempt, including the open roll-up seconds; what still fails is counted as dropped. */
  async close(): Promise<void> {
    clearInterval(this.timer);
    this.closed = true;
    await this.handOver();
    await this.thread.request({ kind: 'close' });
    await this.thread.terminate();
  }

  rawCurrents(fromMs: number, toMs: number, blockMs: number): Promise<RawCurrents> {
    return this.thread.request({ kind: 'raw', fromMs, toMs, blockMs });
  }

  slowRows(fromMs: number, toMs: number, blockMs?: number): Promise<SlowChunk> {
    return this.thread.request({ kind: 'slow', fromMs, toMs, blockMs });
  }

  predictions(fromMs: number, toMs: number, maxPoints: number): Promise<HistoryPrediction> {
    return this.thread.request({ kind: 'predictions', fromMs, toMs, maxPoints });
  }

  rollupBlocks(fromMs: number, toMs: number, blockMs: number): Promise<RollupBlock[]> {
    return this.thread.request({ kind: 'rollups', fromMs, toMs, blockMs });
  }

  private pending(): number {
    return this.worker.pendingSamples + this.inTransit.samples + this.openSamples;
  }

  /** Sends what was gathered to the worker (transferring the sample arrays); resolves once the worker has taken it. */
  private async handOver(): Promise<void> {
    const started = performance.now();
    const rollups = this.rollups.drain(this.closed);
    if (this.batches.length === 0 && this.slow.length === 0 && rollups.length === 0 && this.predictionRows.length === 0) return;
    const batches = this.batches.map(toBatchInput);
    const input: AppendInput = { batches, slow: this.slow, rollups, predictions: this.predictionRows, frames: this.openFrames, samples: this.openSamples };
    this.batches = [];
    this.slow = [];
    this.predictionRows = [];
    this.openSamples = 0;
    this.openFrames = 0;
    this.inTransit.samples += input.samples;
    this.inTransit.frames += input.frames;
    const sent = this.thread.request(
      { kind: 'append', input },
      batches.map((b) => b.samples.buffer as ArrayBuffer),
    );
    this.timed(started);
    try {
      await sent;
    } finally {
      this.inTransit.samples -= input.samples;
      this.inTransit.frames -= input.frames;
    }
  }

  private timed(started: number): void {
    const ms = performance.now() - started;
    this.loop.steps++;
    if (ms > 10) this.loop.over10Ms++;
    if (ms > this.loop.maxMs) this.loop.maxMs = ms;
  }
}

function toBatchInput(b: OpenBatch): BatchInput {
  const n = b.channels[0].length;
  const samples = new Float64Array(6 * n);
  for (let c = 0; c < 6; c++) samples.set(b.channels[c], c * n);
  return { t0Ms: b.t0Ms, rateHz: b.rateHz, seqFirst: b.seqFirst, seqLast: b.seqLast, calibrationId: b.calibrationId, setpoint: b.setpoint, n, samples };
}

function toPredictionRow(p: LivePrediction): PredictionRow {
  return {
    tMs: Date.parse(p.computedAt),
    profileId: p.profileId,
    thetaDeg: p.thetaDeg,
    phiDeg: p.phiDeg,
    stable: p.stable,
    reason: p.reason,
    epsDd: p.epsDd,
    fermiSurfaceAspect: p.fermiSurfaceAspect,
    cloudAspect: p.cloudAspect,
    tofAspect: p.tofAspect,
    tofMajorAngleDeg: p.tofMajorAngleDeg,
    collapseRatio: p.collapseRatio,
    camera: p.camera,
  };
}
