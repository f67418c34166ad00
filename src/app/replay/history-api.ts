import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { SeriesChunk, SlowChunk } from '../../../shared/live/live-state';

/** What a timeline mark stands for. */
export type HistoryEventKind = 'alarm' | 'trip' | 'reset' | 'note' | 'shot' | 'run' | 'calibration' | 'profile' | 'steer';

/** One recorded event of a window: its time and kind, and whatever text the server gives with it. */
export interface HistoryEvent {
  /** ISO 8601 time, or Unix epoch ms. */
  at: string | number;
  kind: HistoryEventKind;
  [detail: string]: unknown;
}

/** The recorded prediction: one entry per computed prediction, each standing until the next. */
export interface HistoryPrediction {
  t: number[];
  fermiSurfaceAspect: (number | null)[];
  cloudAspect: (number | null)[];
  tofAspect: (number | null)[];
}

/** Body of `GET /api/history`; `t` arrays in Unix epoch ms. */
export interface HistoryResponse {
  from: string;
  to: string;
  /** Spacing of the returned samples, ms (raw samples or roll-ups). */
  resolutionMs: number;
  series: SeriesChunk;
  slow: SlowChunk;
  prediction: HistoryPrediction;
  events: HistoryEvent[];
}

/** What to load: a window by its ends, or a run (its window with a margin). */
export type HistoryQuery = { fromMs: number; toMs: number } | { runId: number };

/** `GET /api/history`, fetched once per window; the replay keeps the answer in typed arrays. */
@Injectable({ providedIn: 'root' })
export class HistoryApi {
  private readonly http = inject(HttpClient);

  load(query: HistoryQuery): Promise<HistoryResponse> {
    const params: Record<string, string> =
      'runId' in query ? { run: String(query.runId) } : { from: new Date(query.fromMs).toISOString(), to: new Date(query.toMs).toISOString() };
    return firstValueFrom(this.http.get<HistoryResponse>('/api/history', { params }));
  }
}
