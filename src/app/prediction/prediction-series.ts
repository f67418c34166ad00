import { HttpClient } from '@angular/common/http';
import { DestroyRef, Injectable, effect, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { LivePrediction, PredictionStatus } from '../../../shared/live/live-state';
import type { PredictionHistory } from '../../../shared/profiles/profile-record';
import { RingBuffer } from '../charts/ring-buffer';
import { DEFAULT_WINDOW_SECONDS, POINTS_PER_WINDOW, sampleSpacingMs } from '../charts/time-window';
import { LiveFeed } from '../feed/live-feed';
import { formatNumber } from '../readout/format-quantity';

/** Columns of `PredictionSeries.buffer`: (β − 1) and (TOF aspect − 1), both in percent. */
export const PREDICTED = { betaDeviation: 0, tofDeviation: 1 } as const;

/** One point of the predicted-shape chart: time (Unix epoch ms) and the column values. */
export interface PredictedPoint {
  t: number;
  values: [number, number];
}

const CAPACITY = Math.ceil(POINTS_PER_WINDOW * 1.25);
/** Live points held while a backfill is on its way (a few per second for about a minute). */
const MAX_HELD = 400;

/**
 * Deformation in percent, (aspect − 1)·100: a 2 % effect reads as 2.05 rather than as the fifth
 * decimal of 1.0205. NaN (a gap) for a missing value.
 */
export function deviationPercent(aspect: number | null | undefined): number {
  return aspect === null || aspect === undefined ? Number.NaN : (aspect - 1) * 100;
}

/**
 * The chart values of a prediction: a gap (NaN), never a number, for a collapsed gas and while
 * the prediction does not apply (field too weak to orient the dipoles, stale or no telemetry).
 */
export function predictedValues(prediction: LivePrediction | null, status: PredictionStatus | null): [number, number] {
  if (!prediction?.stable || status?.state !== 'applies') return [Number.NaN, Number.NaN];
  return [deviationPercent(prediction.fermiSurfaceAspect), deviationPercent(prediction.tofAspect)];
}

/**
 * Why the predicted-shape chart shows a gap now, in a few words for its caption; null while
 * the prediction applies. The stale case says when, through the chart's stale note.
 */
export function predictionGapNote(status: PredictionStatus | null, staleNote: string | null): string | null {
  if (staleNote !== null) return `${staleNote}: no prediction plotted`;
  if (!status || status.state === 'applies') return null;
  if (status.state === 'weak-field' && status.fieldG !== null && status.minFieldG !== null) {
    return `No prediction plotted: |B| = ${formatNumber(status.fieldG, 2)} G is below ${formatNumber(status.minFieldG, 2)} G, too weak to orient the dipoles`;
  }
  return `No prediction plotted: ${status.reason ?? 'the prediction does not apply now'}`;
}

/**
 * The history as a held step function sampled every `spacingMs` from its first point up to
 * (not including) `untilMs`. The server records a prediction only when the direction moved, so
 * each value stands until the next one; sampling it keeps the chart's line unbroken where
 * the field simply stayed put.
 */
export function resampleHistory(history: Pick<PredictionHistory, 't' | 'fermiSurfaceAspect' | 'tofAspect'>, spacingMs: number, untilMs: number): PredictedPoint[] {
  const points: PredictedPoint[] = [];
  const n = history.t.length;
  if (n === 0 || !(spacingMs > 0)) return points;
  let k = 0;
  for (let t = history.t[0]; t < untilMs; t += spacingMs) {
    while (k + 1 < n && history.t[k + 1] <= t) k++;
    points.push({ t, values: [deviationPercent(history.fermiSurfaceAspect[k]), deviationPercent(history.tofAspect[k])] });
  }
  return points;
}

/**
 * The recent past of the predicted β and TOF aspect ratio for the Live page's chart: backfilled
 * from `GET /api/prediction/history`, then sampled from the live state each time it is
 * published (a few times per second), at the live state's own time so it lines up with the
 * telemetry charts.
 */
@Injectable()
export class PredictionSeries {
  private readonly http = inject(HttpClient);
  private readonly feed = inject(LiveFeed);
  readonly buffer = new RingBuffer(CAPACITY, 2);

  private spacingMs = sampleSpacingMs(DEFAULT_WINDOW_SECONDS);
  private held: PredictedPoint[] | null = null;
  private backfillRun = 0;

  constructor() {
    effect(() => {
      const live = this.feed.live();
      const t = live?.time ? Date.parse(live.time) : Number.NaN;
      if (!live || !Number.isFinite(t)) return;
      const point: PredictedPoint = { t, values: predictedValues(live.prediction, live.predictionStatus) };
      if (!this.held) this.append(point);
      else if (this.held.length < MAX_HELD) this.held.push(point);
    });
    inject(DestroyRef).onDestroy(() => this.backfillRun++);
  }

  /** Switches to a window of `seconds` and refills it from the server; resolves when done. */
  async showWindow(seconds: number): Promise<void> {
    const run = ++this.backfillRun;
    this.spacingMs = sampleSpacingMs(seconds);
    this.held = [];
    let history: PredictionHistory | null = null;
    try {
      history = await firstValueFrom(this.http.get<PredictionHistory>('/api/prediction/history', { params: { seconds } }));
    } catch {
      // Without history the chart starts from the live state; the connection indicator
      // already tells the user when the server is unreachable.
    }
    if (run !== this.backfillRun) return;
    const held = this.held ?? [];
    this.held = null;
    this.buffer.clear();
    if (history) {
      const liveTime = this.feed.live()?.time;
      const untilMs = held[0]?.t ?? (liveTime ? Date.parse(liveTime) : Number.NaN);
      const lastMs = history.t.at(-1) ?? Number.NaN;
      for (const point of resampleHistory(history, this.spacingMs, Number.isFinite(untilMs) ? untilMs : lastMs + 1)) this.append(point);
    }
    for (const point of held) this.append(point);
  }

  private append(point: PredictedPoint): void {
    const newest = this.buffer.newestTime;
    // Thinning to the window's spacing, with the same 5 % slack as the telemetry history.
    if (newest !== null && point.t - newest < this.spacingMs * 0.95) return;
    this.buffer.push(point.t, point.values);
  }
}
