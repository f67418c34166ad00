/** Arrays that receive a copy of a time window from a `RingBuffer`; grown on demand, then reused. */
export class WindowCopy {
  t = new Float64Array(0);
  columns: Float64Array[] = [];
  /** Number of valid samples at the start of each array. */
  length = 0;
}

/**
 * A fixed-capacity store of time-ordered samples: one `Float64Array` of times (Unix epoch ms)
 * and one per value column, overwriting the oldest sample when full. No allocation per sample:
 * it sits on the path of every decimated sample. Missing values are stored as NaN.
 */
export class RingBuffer {
  private times: Float64Array;
  private values: Float64Array[];
  private head = 0;
  private count = 0;
  /** Increases with every change, so a reader can tell whether there is anything new to draw. */
  revision = 0;

  constructor(
    capacity: number,
    readonly columnCount: number,
  ) {
    this.times = new Float64Array(capacity);
    this.values = Array.from({ length: columnCount }, () => new Float64Array(capacity));
  }

  get capacity(): number {
    return this.times.length;
  }

  get length(): number {
    return this.count;
  }

  /** Time of the newest sample, ms; null when empty. */
  get newestTime(): number | null {
    return this.count === 0 ? null : this.times[this.physical(this.count - 1)];
  }

  /**
   * Appends a sample. A sample not newer than the newest one is refused (returns false), so an
   * overlap between a backfill and the live stream cannot fold time back on itself.
   * `values` supplies one number per column (missing ones as NaN).
   */
  push(timeMs: number, values: ArrayLike<number>): boolean {
    if (!Number.isFinite(timeMs)) return false;
    const newest = this.newestTime;
    if (newest !== null && timeMs <= newest) return false;
    const at = this.head;
    this.times[at] = timeMs;
    for (let c = 0; c < this.columnCount; c++) this.values[c][at] = c < values.length ? values[c] : NaN;
    this.head = (at + 1) % this.capacity;
    if (this.count < this.capacity) this.count++;
    this.revision++;
    return true;
  }

  /** Empties the buffer; with `capacity`, also changes its size. */
  clear(capacity?: number): void {
    if (capacity !== undefined && capacity !== this.capacity) {
      this.times = new Float64Array(capacity);
      this.values = Array.from({ length: this.columnCount }, () => new Float64Array(capacity));
    }
    this.head = 0;
    this.count = 0;
    this.revision++;
  }

  /**
   * Copies the samples with time ≥ `fromMs`, oldest first, into `out` and returns how many.
   * A binary search finds the start, so a short window of a long buffer costs only its length.
   */
  copySince(fromMs: number, out: WindowCopy): number {
    const lo = this.countBefore(fromMs, false);
    const n = this.count - lo;
    if (out.t.length < n || out.columns.length !== this.columnCount) {
      const size = Math.max(n, this.capacity);
      out.t = new Float64Array(size);
      out.columns = Array.from({ length: this.columnCount }, () => new Float64Array(size));
    }
    // Copy in at most two contiguous runs (before and after the wrap point).
    const start = this.physical(lo);
    const firstRun = Math.min(n, this.capacity - start);
    out.t.set(this.times.subarray(start, start + firstRun), 0);
    out.t.set(this.times.subarray(0, n - firstRun), firstRun);
    for (let c = 0; c < this.columnCount; c++) {
      out.columns[c].set(this.values[c].subarray(start, start + firstRun), 0);
      out.columns[c].set(this.values[c].subarray(0, n - firstRun), firstRun);
    }
    out.length = n;
    return n;
  }

  /** Logical index (0 = oldest) of the newest sample at or before `timeMs`; −1 when there is none. */
  indexAtOrBefore(timeMs: number): number {
    return this.countBefore(timeMs, true) - 1;
  }

  /** Time of the `logical`-th oldest sample, ms. */
  timeAt(logical: number): number {
    return this.times[this.physical(logical)];
  }

  /** Value in `column` of the `logical`-th oldest sample (NaN when missing). */
  valueAt(logical: number, column: number): number {
    return this.values[column][this.physical(logical)];
  }

  /** Number of samples older than `timeMs` (also those at `timeMs` when `inclusive`), by binary search. */
  private countBefore(timeMs: number, inclusive: boolean): number {
    let lo = 0;
    let hi = this.count;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      const t = this.times[this.physical(mid)];
      if (t < timeMs || (inclusive && t === timeMs)) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  }

  /** Physical index of the `logical`-th oldest sample. */
  private physical(logical: number): number {
    return (this.head - this.count + logical + this.capacity) % this.capacity;
  }
}
