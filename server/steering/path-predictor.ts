import type { Worker } from 'node:worker_threads';
import { sampleScales } from '../../shared/physics/sample.js';
import type { ProfileRecord } from '../../shared/profiles/profile-record.js';
import { sampleParamsOf } from '../../shared/profiles/sample-profile.js';
import { CriticalCache } from '../prediction/critical-cache.js';
import { directionBucket, fieldDirectionOf } from '../prediction/field-direction.js';
import type { PathPrediction, WorkerReply } from '../prediction/prediction-protocol.js';
import { startPredictionWorker } from '../prediction/prediction-worker-thread.js';

/** The prediction for one direction of a path, with ε_dd/ε_dd,crit. */
export interface PointPrediction extends Omit<PathPrediction, 'epsDdCritical'> {
  /** ε_dd/ε_dd,crit (1 = mean-field collapse threshold); null when it could not be computed. */
  collapseRatio: number | null;
}

export interface PathPredictorOptions {
  /** ε_dd,crit by trap shape and direction cell, shared with the live prediction engine. */
  cache: CriticalCache;
  /** Cell size of the cache, degrees (default 1, as the live engine). */
  cellDeg?: number;
  /** A job that takes longer than this fails, ms (default 60 000). */
  timeoutMs?: number;
}

/** Predictions kept per profile and cell (a few sequences' worth). */
const ASPECT_CAPACITY = 20_000;

/**
 * Predictions along planned paths, for the pre-flight (collapse ratio along the path) and for
 * shots (the prediction at the measured field). Runs the model in its own worker thread, so
 * the live prediction is never held up by a pre-flight. Path directions are evaluated at the
 * centres of the live engine's 1° cells and ε_dd,crit goes into the engine's cache, so a
 * direction is solved once whichever of the two asks first. Jobs run one at a time.
 */
export class PathPredictor {
  private worker: Worker | null = null;
  private queue: Promise<unknown> = Promise.resolve();
  private nextJobId = 1;
  private readonly pending = new Map<number, { resolve: (points: PathPrediction[]) => void; reject: (error: Error) => void }>();
  private readonly aspects = new Map<string, PathPrediction>();
  private readonly cellDeg: number;
  private closed = false;

  constructor(private readonly opts: PathPredictorOptions) {
    this.cellDeg = opts.cellDeg ?? 1;
  }

  /**
   * Predictions for directions (degrees, the profile's trap frame) with the profile's first TOF
   * time. `exact` solves each direction as given (a shot); otherwise the cell centre (a plan).
   */
  async evaluate(record: ProfileRecord, directions: readonly { thetaDeg: number; phiDeg: number }[], exact = false): Promise<PointPrediction[]> {
    const params = sampleParamsOf(record.profile);
    const scales = sampleScales(params);
    const shapeKey = CriticalCache.shapeKey(scales.lambda);
    const profileKey = `${record.id}`;
    const keyed = directions.map((d) => {
      if (exact) return { key: null, direction: d };
      const bucket = directionBucket(fieldDirectionOf(d.thetaDeg, d.phiDeg), this.cellDeg);
      return { key: bucket.key, direction: { thetaDeg: bucket.centre.thetaDeg, phiDeg: bucket.centre.phiDeg } };
    });
    const missing = new Map<string, { thetaDeg: number; phiDeg: number }>();
    keyed.forEach((k, i) => {
      const name = k.key ?? `exact-${i}`;
      if (k.key && this.aspects.has(`${profileKey}|${k.key}`)) return;
      missing.set(name, k.direction);
    });
    const solved = new Map<string, PathPrediction>();
    if (missing.size > 0) {
      const names = [...missing.keys()];
      const points = await this.run(params, [...missing.values()], record.profile.tofMs[0], record.profile.imaging);
      names.forEach((name, i) => {
        solved.set(name, points[i]);
        if (name.startsWith('exact-')) return;
        this.remember(`${profileKey}|${name}`, points[i]);
        if (points[i].epsDdCritical !== null) this.opts.cache.set(shapeKey, name, points[i].epsDdCritical as number);
      });
    }
    return keyed.map((k, i) => {
      const p = k.key ? (solved.get(k.key) ?? this.aspects.get(`${profileKey}|${k.key}`)) : solved.get(`exact-${i}`);
      if (!p) throw new Error('path prediction missing a direction');
      const critical = k.key ? (this.opts.cache.get(shapeKey, k.key) ?? p.epsDdCritical) : p.epsDdCritical;
      const { epsDdCritical: _unused, ...rest } = p;
      return { ...rest, collapseRatio: critical !== null && critical > 0 && Number.isFinite(critical) ? scales.epsDd / critical : null };
    });
  }

  async close(): Promise<void> {
    this.closed = true;
    for (const { reject } of this.pending.values()) reject(new Error('the path predictor stopped'));
    this.pending.clear();
    const worker = this.worker;
    this.worker = null;
    if (worker) await worker.terminate();
  }

  private remember(key: string, p: PathPrediction): void {
    this.aspects.set(key, p);
    if (this.aspects.size > ASPECT_CAPACITY) this.aspects.delete(this.aspects.keys().next().value as string);
  }

  private run(params: ReturnType<typeof sampleParamsOf>, directions: { thetaDeg: number; phiDeg: number }[], tofMs: number, imaging: ProfileRecord['profile']['imaging']): Promise<PathPrediction[]> {
    const job = this.queue.then(() => this.send(params, directions, tofMs, imaging));
    this.queue = job.catch(() => undefined);
    return job;
  }

  private send(params: ReturnType<typeof sampleParamsOf>, directions: { thetaDeg: number; phiDeg: number }[], tofMs: number, imaging: ProfileRecord['profile']['imaging']): Promise<PathPrediction[]> {
    if (this.closed) return Promise.reject(new Error('the path predictor stopped'));
    const worker = this.ensureWorker();
    const jobId = this.nextJobId++;
    return new Promise<PathPrediction[]>((resolve, reject) => {
      const timer = setTimeout(() => {
        this.pending.delete(jobId);
        reject(new Error('the path prediction took too long'));
        // A stuck solve would hold every later job: start afresh.
        void this.restart();
      }, this.opts.timeoutMs ?? 60_000);
      this.pending.set(jobId, {
        resolve: (points) => {
          clearTimeout(timer);
          resolve(points);
        },
        reject: (error) => {
          clearTimeout(timer);
          reject(error);
        },
      });
      worker.postMessage({ kind: 'path', jobId, params, directions, tofMs, imaging });
    });
  }

  private ensureWorker(): Worker {
    if (this.worker) return this.worker;
    const worker = startPredictionWorker();
    worker.on('message', (reply: WorkerReply) => {
      const waiting = this.pending.get(reply.jobId);
      if (!waiting) return;
      this.pending.delete(reply.jobId);
      if (reply.kind === 'path') waiting.resolve(reply.points);
      else waiting.reject(new Error(reply.kind === 'failed' ? `path prediction failed: ${reply.message}` : 'unexpected worker reply'));
    });
    worker.on('error', () => undefined);
    worker.on('exit', () => {
      if (this.worker !== worker) return;
      this.worker = null;
      for (const { reject } of this.pending.values()) reject(new Error('the path prediction worker stopped'));
      this.pending.clear();
    });
    this.worker = worker;
    return worker;
  }

  private async restart(): Promise<void> {
    const worker = this.worker;
    this.worker = null;
    for (const { reject } of this.pending.values()) reject(new Error('the path prediction worker was restarted'));
    this.pending.clear();
    if (worker) await worker.terminate();
  }
}
