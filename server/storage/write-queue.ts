/**
 * The bounded, counted queue between the telemetry that arrives and the database that stores
 * it. Nothing good is dropped silently: a failed write keeps its data queued and is retried
 * with a growing pause (a database restart or outage is ridden out), memory stays bounded by
 * refusing new data once `maxPendingSamples` are waiting, and every refusal is counted.
 *
 * A failed write is told apart from bad data by a probe (`SELECT 1`): when the database
 * answers, the queued units are written one by one and a unit that still fails on its own is
 * dropped and counted, so one bad unit cannot block the queue for ever.
 */

/** One unit of queued work, written in one transaction with the others queued with it. */
export interface WriteUnit {
  /** Fast frames in the unit (what `framesDropped` counts). */
  readonly frames: number;
  /** Samples per channel in the unit (what `pendingSamples` counts). */
  readonly samples: number;
}

/** The queue's state, as `/api/health` shows it under `storage`. */
export interface WriteQueueState {
  /** Frames refused (queue full, or failed alone while the database answered), or left unwritten at close. */
  framesDropped: number;
  /** Write attempts that failed. */
  flushErrors: number;
  /** Samples per channel waiting to be written. */
  pendingSamples: number;
  /** Fast frames waiting to be written. */
  pendingFrames: number;
  /** True while the database does not take writes (from the first failed write until one succeeds). */
  outage: boolean;
  /** Start of the outage, ISO 8601 UTC; null while writes succeed. */
  failingSince: string | null;
  /** Message of the newest write error; null once a write succeeds again. */
  lastError: string | null;
}

export interface WriteQueueOptions<U extends WriteUnit> {
  /** Writes the units in one transaction; rejects when nothing was committed. */
  write(units: readonly U[]): Promise<void>;
  /** Resolves when the database answers (e.g. `SELECT 1`), rejects otherwise. */
  probe(): Promise<void>;
  /** Pending samples per channel beyond which new units are refused. */
  maxPendingSamples: number;
  /** First pause after a failed write, ms (doubles up to `retryMaxMs`). */
  retryMinMs?: number;
  retryMaxMs?: number;
  onError?: (error: Error) => void;
  /** Called when an outage starts (with its error) and when it ends (null). */
  onOutageChange?: (outage: boolean, error: Error | null) => void;
  /** Server clock, ms (default `Date.now`). */
  now?: () => number;
}

export class WriteQueue<U extends WriteUnit> {
  private units: U[] = [];
  private pendingSamples = 0;
  private pendingFrames = 0;
  private framesDropped = 0;
  private flushErrors = 0;
  private failingSinceMs: number | null = null;
  private lastError: string | null = null;
  private retryMs: number;
  private nextAttemptMs = -Infinity;
  private running: Promise<void> = Promise.resolve();
  private readonly now: () => number;

  constructor(private readonly opts: WriteQueueOptions<U>) {
    this.now = opts.now ?? Date.now;
    this.retryMs = opts.retryMinMs ?? 500;
  }

  /** Room for `samples` more samples per channel? */
  hasRoom(samples: number): boolean {
    return this.pendingSamples + samples <= this.opts.maxPendingSamples;
  }

  /** Queues a unit, or refuses it (counted) when the queue is full. */
  offer(unit: U): boolean {
    if (!this.hasRoom(unit.samples)) {
      this.drop(unit.frames);
      return false;
    }
    this.units.push(unit);
    this.pendingSamples += unit.samples;
    this.pendingFrames += unit.frames;
    return true;
  }

  /** Counts frames that were refused before they became a unit. */
  drop(frames: number): void {
    this.framesDropped += frames;
  }

  state(): WriteQueueState {
    return {
      framesDropped: this.framesDropped,
      flushErrors: this.flushErrors,
      pendingSamples: this.pendingSamples,
      pendingFrames: this.pendingFrames,
      outage: this.failingSinceMs !== null,
      failingSince: this.failingSinceMs === null ? null : new Date(this.failingSinceMs).toISOString(),
      lastError: this.lastError,
    };
  }

  /**
   * Writes what is queued, unless a retry pause is running (`force` ignores it). Resolves once
   * the attempt is over, whether it committed or failed (failures are counted, not thrown).
   */
  flush(force = false): Promise<void> {
    this.running = this.running.then(() => this.attempt(force));
    return this.running;
  }

  /** A last attempt; whatever still cannot be written is counted as dropped. */
  async close(): Promise<void> {
    await this.flush(true);
    this.drop(this.pendingFrames);
    this.take(this.units.length);
  }

  private async attempt(force: boolean): Promise<void> {
    if (this.units.length === 0) return;
    if (!force && this.now() < this.nextAttemptMs) return;
    const units = this.units.slice();
    try {
      await this.opts.write(units);
      this.take(units.length);
      this.succeeded();
      return;
    } catch (error) {
      this.failed(error as Error);
    }
    if (!(await this.answers())) return;
    // The database answers, so the data is at fault: isolate the unit that cannot be stored.
    for (const unit of units) {
      try {
        await this.opts.write([unit]);
        this.succeeded();
      } catch (error) {
        this.flushErrors++;
        this.opts.onError?.(error as Error);
        if (!(await this.answers())) return;
        this.framesDropped += unit.frames;
      }
      this.forget(this.units.indexOf(unit));
    }
  }

  private async answers(): Promise<boolean> {
    try {
      await this.opts.probe();
      return true;
    } catch (error) {
      this.startOutage(error as Error);
      return false;
    }
  }

  private failed(error: Error): void {
    this.flushErrors++;
    this.lastError = error.message;
    this.nextAttemptMs = this.now() + this.retryMs;
    this.retryMs = Math.min(this.retryMs * 2, this.opts.retryMaxMs ?? 5000);
    this.opts.onError?.(error);
  }

  private startOutage(error: Error): void {
    if (this.failingSinceMs !== null) return;
    this.failingSinceMs = this.now();
    this.opts.onOutageChange?.(true, error);
  }

  private succeeded(): void {
    this.retryMs = this.opts.retryMinMs ?? 500;
    this.nextAttemptMs = -Infinity;
    this.lastError = null;
    if (this.failingSinceMs === null) return;
    this.failingSinceMs = null;
    this.opts.onOutageChange?.(false, null);
  }

  /** Removes the first `count` units (written or given up). */
  private take(count: number): void {
    for (let i = 0; i < count; i++) this.forget(0);
  }

  /** Removes the unit at index `i` (written or given up). */
  private forget(i: number): void {
    if (i < 0) return;
    const [unit] = this.units.splice(i, 1);
    this.pendingSamples -= unit.samples;
    this.pendingFrames -= unit.frames;
  }
}
