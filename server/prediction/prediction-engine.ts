import type { Worker } from 'node:worker_threads';
import type { Logger } from 'pino';
import type { LivePrediction } from '../../shared/live/live-state.js';
import { sampleScales, type SampleParams } from '../../shared/physics/sample.js';
import { parseSampleProfile, sampleParamsOf, type SampleProfile } from '../../shared/profiles/sample-profile.js';
import { CriticalCache } from './critical-cache.js';
import { axialAngleDeg, directionBucket, fieldDirectionOf, type FieldDirection } from './field-direction.js';
import type { WorkerReply, WorkerRequest, WorkerSummary } from './prediction-protocol.js';
import { startPredictionWorker } from './prediction-worker-thread.js';

export interface PredictionEngineOptions {
  log?: Pick<Logger, 'info' | 'warn' | 'error'>;
  /** Smallest direction change that triggers a new prediction, degrees (default 0.2). */
  thresholdDeg?: number;
  /**
   * Shortest time between the starts of two predictions, ms (default 100), measured on the
   * caller's clock (the `nowMs` of updateDirection); a direction left waiting is started by a
   * timer once the interval is over, even when no newer update arrives.
   */
  minIntervalMs?: number;
  /** Cell size of the ε_dd,crit cache, degrees (default 1). */
  criticalCellDeg?: number;
  /** ε_dd,crit cache, shared with the path predictions of steering (default a private one). */
  criticalCache?: CriticalCache;
}

/** What the engine has done so far; read by tests, health and benchmarks. */
export interface PredictionCounters {
  /** updateDirection calls. */
  directionUpdates: number;
  /** Updates ignored because the direction moved by no more than the threshold. */
  belowThreshold: number;
  /** Waiting directions replaced by a newer one before they were computed. */
  coalesced: number;
  /** Predictions sent to the worker. */
  predictions: number;
  /** Critical-ε_dd computations sent to the worker. */
  criticalComputations: number;
  /** Results dropped because the profile changed while they were computed. */
  staleResults: number;
  /** Requests the worker answered with an error. */
  failures: number;
  workerRestarts: number;
}

interface ActiveProfile {
  id: number;
  profile: SampleProfile;
  params: SampleParams;
  epsDd: number;
  shapeKey: string;
  /** Increases with every setProfile, so late results for an earlier profile are recognised. */
  version: number;
}

interface Pending {
  direction: FieldDirection;
  /** Compute even when within the threshold of the last one (profile change, worker restart). */
  forced: boolean;
  /** Worker crashes while this direction was being computed. */
  crashes: number;
}

type InFlight =
  | { kind: 'predict'; jobId: number; version: number; pending: Pending }
  | { kind: 'critical'; jobId: number; shapeKey: string; bucketKey: string };

/** A worker that crashed twice on the same direction is not given it a third time. */
const MAX_CRASHES_PER_DIRECTION = 2;
const RESTART_DELAY_MS = [50, 200, 1000, 5000];

/**
 * Live Hartree–Fock prediction for the measured field direction and the active sample
 * profile (issue 3). The model runs only in a worker thread; this class decides when to run
 * it and keeps the latest result:
 * * a new direction is computed only when it moved by more than `thresholdDeg` from the last
 *   one asked for (e ≡ −e), or when the profile changed;
 * * at most one request is in the worker; directions arriving meanwhile are coalesced so only
 *   the newest waits, and predictions start at most every `minIntervalMs`;
 * * each prediction starts from the previous solution (the worker keeps it);
 * * ε_dd,crit is slower, so it is computed after the prediction is published, once per trap
 *   shape and direction cell, and the prediction is then republished with its collapse ratio;
 * * a crashed worker is logged and restarted; `close()` terminates it.
 */
export class PredictionEngine {
  private readonly thresholdDeg: number;
  private readonly minIntervalMs: number;
  private readonly cellDeg: number;
  private readonly log: PredictionEngineOptions['log'];
  private readonly cache: CriticalCache;
  private readonly listeners = new Set<(p: LivePrediction) => void>();
  private readonly count: PredictionCounters = {
    directionUpdates: 0, belowThreshold: 0, coalesced: 0, predictions: 0, criticalComputations: 0, staleResults: 0, failures: 0, workerRestarts: 0,
  };

  private worker: Worker | null = null;
  private workerError: unknown = null;
  private active: ActiveProfile | null = null;
  private profileVersion = 0;
  private coldNext = true;
  /** Newest measured direction, kept for a profile change. */
  private measured: FieldDirection | null = null;
  /** Direction of the newest prediction started for the active profile. */
  private lastStarted: FieldDirection | null = null;
  private pending: Pending | null = null;
  private inFlight: InFlight | null = null;
  private nextJobId = 1;
  private nowMs = -Infinity;
  private lastStartMs = -Infinity;
  private intervalTimer: NodeJS.Timeout | null = null;
  private restartTimer: NodeJS.Timeout | null = null;
  private consecutiveCrashes = 0;
  private current: LivePrediction | null = null;
  private closed = false;

  constructor(options: PredictionEngineOptions = {}) {
    this.thresholdDeg = options.thresholdDeg ?? 0.2;
    this.minIntervalMs = options.minIntervalMs ?? 100;
    this.cellDeg = options.criticalCellDeg ?? 1;
    this.cache = options.criticalCache ?? new CriticalCache();
    this.log = options.log;
    this.spawnWorker();
  }

  /**
   * Makes `profile` the active sample (validated again here; throws SampleProfileError naming
   * the key to fix). The latest prediction is dropped, and the newest measured direction, if
   * any, is computed for the new profile from a cold start. Pass `measured` (degrees, the new
   * profile's trap frame) when the new profile turns the trap: the direction measured before
   * is in the old profile's frame.
   */
  setProfile(profileId: number, profile: SampleProfile, measured?: { thetaDeg: number; phiDeg: number }): void {
    if (this.closed) return;
    const checked = parseSampleProfile(profile);
    if (measured) this.measured = fieldDirectionOf(measured.thetaDeg, measured.phiDeg);
    const params = sampleParamsOf(checked);
    const scales = sampleScales(params);
    this.active = {
      id: profileId, profile: checked, params, epsDd: scales.epsDd, shapeKey: CriticalCache.shapeKey(scales.lambda), version: ++this.profileVersion,
    };
    this.coldNext = true;
    this.lastStarted = null;
    this.current = null;
    this.pending = this.measured ? { direction: this.measured, forced: true, crashes: 0 } : null;
    this.pump();
  }

  /**
   * The measured field direction in the active profile's trap frame (degrees), with the
   * caller's clock in ms (monotonic, e.g. the sample time). Cheap: at most a few comparisons.
   */
  updateDirection(field: { thetaDeg: number; phiDeg: number }, nowMs: number): void {
    if (this.closed) return;
    const direction = fieldDirectionOf(field.thetaDeg, field.phiDeg);
    this.count.directionUpdates++;
    this.measured = direction;
    this.nowMs = Math.max(this.nowMs, nowMs);
    if (!this.active) return;
    const reference = this.pending?.direction ?? this.lastStarted;
    if (reference && axialAngleDeg(direction, reference) <= this.thresholdDeg) {
      this.count.belowThreshold++;
      return;
    }
    if (this.pending) this.count.coalesced++;
    this.pending = { direction, forced: this.pending?.forced ?? false, crashes: 0 };
    this.pump();
  }

  /** The newest prediction for the active profile, or null before the first one. */
  latest(): LivePrediction | null {
    return this.current;
  }

  /** Calls `cb` with every new or updated prediction; returns the function that unsubscribes. */
  onPrediction(cb: (p: LivePrediction) => void): () => void {
    this.listeners.add(cb);
    return () => this.listeners.delete(cb);
  }

  counters(): Readonly<PredictionCounters> {
    return { ...this.count };
  }

  /** Stops the timers and terminates the worker; later calls do nothing. */
  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    this.listeners.clear();
    for (const timer of [this.intervalTimer, this.restartTimer]) if (timer) clearTimeout(timer);
    this.intervalTimer = this.restartTimer = null;
    const worker = this.worker;
    this.worker = null;
    if (worker) await worker.terminate();
  }

  /** Starts the next job when the worker is idle: a waiting direction first, then a missing ε_dd,crit. */
  private pump(): void {
    if (this.closed || !this.worker || this.inFlight || !this.active) return;
    if (this.pending) {
      const { direction, forced } = this.pending;
      if (!forced && this.lastStarted && axialAngleDeg(direction, this.lastStarted) <= this.thresholdDeg) {
        this.pending = null;
        this.count.belowThreshold++;
      } else {
        const wait = this.lastStartMs + this.minIntervalMs - this.nowMs;
        if (wait > 0) {
          // The delay is capped by the interval so a caller's clock that jumps cannot stall the engine.
          this.intervalTimer ??= setTimeout(() => {
            this.intervalTimer = null;
            this.nowMs = Math.max(this.nowMs, this.lastStartMs + this.minIntervalMs);
            this.pump();
          }, Math.min(wait, this.minIntervalMs));
          return;
        }
        this.startPrediction(this.pending);
        return;
      }
    }
    this.startCriticalIfMissing();
  }

  private startPrediction(pending: Pending): void {
    const { profile, params, version } = this.active as ActiveProfile;
    const jobId = this.nextJobId++;
    this.pending = null;
    this.lastStarted = pending.direction;
    this.lastStartMs = this.nowMs;
    this.inFlight = { kind: 'predict', jobId, version, pending };
    this.count.predictions++;
    this.send({
      kind: 'predict', jobId, params, thetaDeg: pending.direction.thetaDeg, phiDeg: pending.direction.phiDeg,
      tofMs: profile.tofMs[0], imaging: profile.imaging, cold: this.coldNext,
    });
    this.coldNext = false;
  }

  private startCriticalIfMissing(): void {
    const p = this.current;
    const active = this.active as ActiveProfile;
    if (!p || !p.stable || p.collapseRatio !== null) return;
    const bucket = directionBucket(fieldDirectionOf(p.thetaDeg, p.phiDeg), this.cellDeg);
    if (this.cache.get(active.shapeKey, bucket.key) !== undefined) return;
    const jobId = this.nextJobId++;
    this.inFlight = { kind: 'critical', jobId, shapeKey: active.shapeKey, bucketKey: bucket.key };
    this.count.criticalComputations++;
    this.send({ kind: 'critical', jobId, params: active.params, thetaDeg: bucket.centre.thetaDeg, phiDeg: bucket.centre.phiDeg });
  }

  private send(request: WorkerRequest): void {
    (this.worker as Worker).postMessage(request);
  }

  private onReply(reply: WorkerReply): void {
    const job = this.inFlight;
    if (!job || job.jobId !== reply.jobId) return;
    this.inFlight = null;
    this.consecutiveCrashes = 0;
    if (reply.kind === 'failed') this.onFailure(job, reply.message);
    else if (reply.kind === 'predict' && job.kind === 'predict') this.onPredicted(job.version, reply.summary);
    else if (reply.kind === 'critical' && job.kind === 'critical') this.onCritical(job, reply.epsDdCritical);
    this.pump();
  }

  private onPredicted(version: number, summary: WorkerSummary): void {
    const active = this.active;
    if (!active || version !== active.version) {
      this.count.staleResults++;
      return;
    }
    const prediction: LivePrediction = { ...summary, profileId: active.id, computedAt: new Date().toISOString() };
    if (prediction.stable) prediction.collapseRatio = this.cachedRatio(prediction);
    this.publish(prediction);
  }

  private onCritical(job: Extract<InFlight, { kind: 'critical' }>, epsDdCritical: number): void {
    // Valid for the trap shape whatever the profile is now: keep it.
    this.cache.set(job.shapeKey, job.bucketKey, epsDdCritical);
    const p = this.current;
    if (!p || !p.stable || p.collapseRatio !== null) return;
    const ratio = this.cachedRatio(p);
    if (ratio !== null) this.publish({ ...p, collapseRatio: ratio });
  }

  private onFailure(job: InFlight, message: string): void {
    this.count.failures++;
    this.log?.error({ job: job.kind, err: message }, 'prediction failed');
    if (job.kind === 'critical') {
      // Remember the cell as unknown (ratio stays null) instead of retrying it forever.
      this.cache.set(job.shapeKey, job.bucketKey, Number.NaN);
      return;
    }
    if (this.active && job.version === this.active.version) this.publishFailure(job.pending.direction, `prediction failed: ${message}`);
  }

  /** ε_dd/ε_dd,crit for the prediction's direction cell, or null while not known. */
  private cachedRatio(p: LivePrediction): number | null {
    const active = this.active as ActiveProfile;
    const bucket = directionBucket(fieldDirectionOf(p.thetaDeg, p.phiDeg), this.cellDeg);
    const epsC = this.cache.get(active.shapeKey, bucket.key);
    return epsC !== undefined && !Number.isNaN(epsC) ? p.epsDd / epsC : null;
  }

  private publishFailure(direction: FieldDirection, reason: string): void {
    const active = this.active as ActiveProfile;
    this.publish({
      stable: false, reason, fermiSurfaceAspect: null, cloudAspect: null, tofAspect: null, tofMajorAngleDeg: null, collapseRatio: null,
      epsDd: active.epsDd, profileId: active.id, thetaDeg: direction.thetaDeg, phiDeg: direction.phiDeg, computedAt: new Date().toISOString(), camera: null,
    });
  }

  private publish(prediction: LivePrediction): void {
    this.current = prediction;
    for (const cb of this.listeners) {
      try {
        cb(prediction);
      } catch (err) {
        this.log?.error({ err }, 'prediction listener failed');
      }
    }
  }

  private spawnWorker(): void {
    const worker = startPredictionWorker();
    this.worker = worker;
    this.workerError = null;
    worker.on('message', (reply: WorkerReply) => this.onReply(reply));
    worker.on('error', (err) => {
      this.workerError = err;
    });
    worker.on('exit', (code) => this.onWorkerExit(worker, code));
  }

  /** The worker stopped without close(): log it, give its job back (once), restart after a pause. */
  private onWorkerExit(worker: Worker, code: number): void {
    if (this.closed || worker !== this.worker) return;
    this.worker = null;
    this.log?.error({ code, err: this.workerError }, 'prediction worker stopped; restarting it');
    const job = this.inFlight;
    this.inFlight = null;
    // A cell whose ε_dd,crit stopped the worker is not tried again; its ratio stays unknown.
    if (job?.kind === 'critical') this.cache.set(job.shapeKey, job.bucketKey, Number.NaN);
    if (job?.kind === 'predict' && this.active && job.version === this.active.version && !this.pending) {
      const crashes = job.pending.crashes + 1;
      if (crashes < MAX_CRASHES_PER_DIRECTION) this.pending = { ...job.pending, forced: true, crashes };
      else this.publishFailure(job.pending.direction, `prediction failed: the prediction worker stopped twice on this direction (exit code ${code})`);
    }
    // The new worker starts without the previous solution.
    this.coldNext = true;
    const delay = RESTART_DELAY_MS[Math.min(this.consecutiveCrashes, RESTART_DELAY_MS.length - 1)];
    this.consecutiveCrashes++;
    this.restartTimer = setTimeout(() => {
      this.restartTimer = null;
      if (this.closed) return;
      this.count.workerRestarts++;
      this.spawnWorker();
      this.pump();
    }, delay);
  }
}
