/**
 * Messages between the server's event loop and the storage worker thread. Samples travel as
 * transferred Float64Arrays (no copy, no text); everything else is plain data.
 */
import type { HistoryPrediction } from '../../shared/history/history-api.js';
import type { SlowChunk } from '../../shared/live/live-state.js';
import type { predictionSamples } from '../db/schema.js';
import type { SlowFrame } from '../../shared/telemetry/messages.js';
import type { RollupRow } from './rollup-accumulator.js';
import type { WriteQueueState } from './write-queue.js';

/** A contiguous run of fast frames, as the event loop hands it over. */
export interface BatchInput {
  t0Ms: number;
  rateHz: number;
  seqFirst: number;
  seqLast: number;
  calibrationId: number;
  setpoint: { x: number; y: number; z: number };
  /** Samples per channel. */
  n: number;
  /** Currents x, y, z then voltages x, y, z, `n` each, one after the other. */
  samples: Float64Array;
}

/** A live prediction as stored (`prediction_samples`). */
export type PredictionRow = typeof predictionSamples.$inferInsert;

/** What one flush of the event loop's writer hands over. */
export interface AppendInput {
  batches: BatchInput[];
  slow: SlowFrame[];
  rollups: RollupRow[];
  predictions: PredictionRow[];
  frames: number;
  samples: number;
}

/** The writer's state on `/api/health` (`storage`): written counts plus the queue's state. */
export interface StoreState extends WriteQueueState {
  /** `fast_batches` rows written. */
  batchesWritten: number;
  framesWritten: number;
  slowWritten: number;
  rollupsWritten: number;
}

/** 100 Hz (or coarser) block means of the stored currents, each with the calibration of its batch. */
export interface RawCurrents {
  t: Float64Array;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  /** `calibrations.id` per point; −1 where the batch had none. */
  calibrationId: Int32Array;
}

/**
 * What the history reads ask of the telemetry tables (the storage worker, or a store in
 * tests). Windows are half-open, [fromMs, toMs), so adjacent windows never share a point.
 */
export interface TelemetryReader {
  rawCurrents(fromMs: number, toMs: number, blockMs: number): Promise<RawCurrents>;
  /** Slow readings (temperatures °C, flows L/min); means per `blockMs` block when given. */
  slowRows(fromMs: number, toMs: number, blockMs?: number): Promise<SlowChunk>;
  rollupBlocks(fromMs: number, toMs: number, blockMs: number): Promise<RollupBlock[]>;
  /** The predictions made in the window after the one in force at `fromMs`; at most `maxPoints` (the last of each equal time block). */
  predictions(fromMs: number, toMs: number, maxPoints: number): Promise<HistoryPrediction>;
}

/** Roll-up means per block of a long window. */
export interface RollupBlock {
  t: number;
  ix: number | null;
  iy: number | null;
  iz: number | null;
  bx: number | null;
  by: number | null;
  bz: number | null;
  bMag: number | null;
  tx: number | null;
  ty: number | null;
  tz: number | null;
  fx: number | null;
  fy: number | null;
  fz: number | null;
  /** Mean σ|B| (G), σθ, σφ (degrees); null for seconds without a calibration covariance. */
  sigmaBMag: number | null;
  sigmaTheta: number | null;
  sigmaPhi: number | null;
}

export interface WorkerOpen {
  dataDir: string;
  databaseUrl: string | null;
  retention: { rawHours: number; rollupDays: number };
  maxPendingSamples: number;
  retryMinMs?: number;
  retryMaxMs?: number;
}

export type StorageRequest =
  | { id: number; kind: 'append'; input: AppendInput }
  | { id: number; kind: 'flush' }
  | { id: number; kind: 'raw'; fromMs: number; toMs: number; blockMs: number }
  | { id: number; kind: 'slow'; fromMs: number; toMs: number; blockMs?: number }
  | { id: number; kind: 'rollups'; fromMs: number; toMs: number; blockMs: number }
  | { id: number; kind: 'predictions'; fromMs: number; toMs: number; maxPoints: number }
  | { id: number; kind: 'close' };

export type StorageReply =
  | { id: number; kind: 'done'; state: StoreState; result?: RawCurrents | SlowChunk | RollupBlock[] | HistoryPrediction }
  | { id: number; kind: 'failed'; state: StoreState; message: string }
  /** Sent without a request: after every write attempt without one. */
  | { id: null; kind: 'state'; state: StoreState }
  /** Sent once, when the database is open. */
  | { id: null; kind: 'ready' }
  | { id: null; kind: 'log'; level: 'info' | 'warn' | 'error'; message: string; error?: string }
  | { id: null; kind: 'outage'; outage: boolean; error: string | null };
