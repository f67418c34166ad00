import { monitorEventLoopDelay, type IntervalHistogram } from 'node:perf_hooks';

/** How the event loop kept up over the last completed window (`/api/health` `eventLoop`). */
export interface EventLoopReport {
  /** Length of a window, s. */
  windowS: number;
  /** Longest delay in the last completed window, ms (null before the first window ends). */
  maxMs: number | null;
  /** 99th percentile of the delay in the last completed window, ms. */
  p99Ms: number | null;
  /** Longest delay in any window since start, ms. */
  worstMs: number;
}

/**
 * Measures how late the event loop runs (Node's `monitorEventLoopDelay`, 10 ms resolution),
 * in windows of `windowMs`, so a reader sees recent figures without resetting anything.
 */
export class EventLoopWatch {
  private readonly histogram: IntervalHistogram = monitorEventLoopDelay({ resolution: 10 });
  private readonly timer: NodeJS.Timeout;
  private last: { maxMs: number; p99Ms: number } | null = null;
  private worstMs = 0;

  constructor(private readonly windowMs = 10_000) {
    this.histogram.enable();
    this.timer = setInterval(() => this.rotate(), windowMs);
    this.timer.unref();
  }

  report(): EventLoopReport {
    return { windowS: this.windowMs / 1000, maxMs: this.last?.maxMs ?? null, p99Ms: this.last?.p99Ms ?? null, worstMs: this.worstMs };
  }

  close(): void {
    clearInterval(this.timer);
    this.histogram.disable();
  }

  private rotate(): void {
    // The histogram counts in nanoseconds.
    const maxMs = this.histogram.max / 1e6;
    this.last = { maxMs, p99Ms: this.histogram.percentile(99) / 1e6 };
    this.worstMs = Math.max(this.worstMs, maxMs);
    this.histogram.reset();
  }
}
