import { HttpClient } from '@angular/common/http';
import { DestroyRef, Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { SeriesChunk, SlowChunk } from '../../../shared/live/live-state';
import { LiveFeed } from '../feed/live-feed';
import { RingBuffer } from './ring-buffer';
import { DEFAULT_WINDOW_SECONDS, POINTS_PER_WINDOW, sampleSpacingMs } from './time-window';

/** Columns of `TelemetryHistory.fast`. */
export const FAST = { currentX: 0, currentY: 1, currentZ: 2, bMag: 3, theta: 4, phi: 5 } as const;
/** Columns of `TelemetryHistory.slow`. */
export const SLOW = { temperatureX: 0, temperatureY: 1, temperatureZ: 2, flowX: 3, flowY: 4, flowZ: 5 } as const;

/** Body of `GET /api/series?seconds=N`. */
export interface SeriesResponse {
  series: SeriesChunk;
  slow: SlowChunk;
}

/** Room for one window plus a margin, so a window is never short while the oldest samples roll out. */
const CAPACITY = Math.ceil(POINTS_PER_WINDOW * 1.25);
/** Live blocks held while a backfill is on its way; about 30 s of pushes at 30 per second. */
const MAX_HELD_BLOCKS = 900;

/**
 * The recent history the charts draw: ring buffers fed by the live feed outside change
 * detection and backfilled from `GET /api/series` when the page opens and when the window
 * changes. Samples closer together than the window needs are skipped (thinning, not averaging:
 * every drawn point is a real decimated sample, and averaging would smear the azimuth where it
 * wraps from 360° to 0°).
 */
@Injectable()
export class TelemetryHistory {
  private readonly http = inject(HttpClient);
  readonly fast = new RingBuffer(CAPACITY, 6);
  readonly slow = new RingBuffer(CAPACITY, 6);

  private spacingMs = sampleSpacingMs(DEFAULT_WINDOW_SECONDS);
  private held: SeriesResponse[] | null = null;
  private backfillRun = 0;

  constructor() {
    const stopListening = inject(LiveFeed).onSamples((series, slow) => {
      if (this.held) {
        if (this.held.length < MAX_HELD_BLOCKS) this.held.push({ series, slow });
      } else {
        this.append(series, slow);
      }
    });
    inject(DestroyRef).onDestroy(() => {
      stopListening();
      this.backfillRun++;
    });
  }

  /** Switches to a window of `seconds` and refills it from the server; resolves when done. */
  async showWindow(seconds: number): Promise<void> {
    const run = ++this.backfillRun;
    this.spacingMs = sampleSpacingMs(seconds);
    this.held = [];
    let history: SeriesResponse | null = null;
    try {
      history = await firstValueFrom(this.http.get<SeriesResponse>('/api/series', { params: { seconds } }));
    } catch {
      // Without history the charts start from the live stream; the connection indicator
      // already tells the user when the server is unreachable.
    }
    if (run !== this.backfillRun) return;
    const held = this.held ?? [];
    this.held = null;
    this.fast.clear();
    this.slow.clear();
    if (history) this.append(history.series, history.slow);
    for (const block of held) this.append(block.series, block.slow);
  }

  private append(series: SeriesChunk | undefined, slow: SlowChunk | undefined): void {
    appendChunks(this, series, slow, this.spacingMs);
  }
}

/** Room for the rows of `appendChunks`, reused: the function sits on the path of every sample block. */
const fastRow = new Float64Array(6);
const slowRow = new Float64Array(6);

/**
 * Appends sample blocks to the `fast` (FAST columns) and `slow` (SLOW columns) buffers, keeping
 * only samples at least `spacingMs` past the newest kept one (0 keeps every sample). A missing
 * angle (|B| ≈ 0) is stored as NaN.
 */
export function appendChunks(target: { fast: RingBuffer; slow: RingBuffer }, series: SeriesChunk | undefined, slow: SlowChunk | undefined, spacingMs: number): void {
  if (series) {
    for (let i = 0; i < series.t.length; i++) {
      const t = series.t[i];
      if (!due(target.fast, t, spacingMs)) continue;
      fastRow[FAST.currentX] = series.currentA.x[i];
      fastRow[FAST.currentY] = series.currentA.y[i];
      fastRow[FAST.currentZ] = series.currentA.z[i];
      fastRow[FAST.bMag] = series.bMagG[i];
      fastRow[FAST.theta] = series.thetaDeg[i] ?? Number.NaN;
      fastRow[FAST.phi] = series.phiDeg[i] ?? Number.NaN;
      target.fast.push(t, fastRow);
    }
  }
  if (slow) {
    for (let i = 0; i < slow.t.length; i++) {
      const t = slow.t[i];
      if (!due(target.slow, t, spacingMs)) continue;
      slowRow[SLOW.temperatureX] = slow.temperatureC.x[i];
      slowRow[SLOW.temperatureY] = slow.temperatureC.y[i];
      slowRow[SLOW.temperatureZ] = slow.temperatureC.z[i];
      slowRow[SLOW.flowX] = slow.flowLpm.x[i];
      slowRow[SLOW.flowY] = slow.flowLpm.y[i];
      slowRow[SLOW.flowZ] = slow.flowLpm.z[i];
      target.slow.push(t, slowRow);
    }
  }
}

/**
 * True when a sample at `t` is far enough past the newest kept one to be worth keeping. The 5 %
 * slack keeps every sample of a slightly jittered stream whose period equals the spacing.
 */
function due(buffer: RingBuffer, t: number, spacingMs: number): boolean {
  const newest = buffer.newestTime;
  return newest === null || t - newest >= spacingMs * 0.95;
}
