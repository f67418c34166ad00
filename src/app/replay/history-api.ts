import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { HistoryResponse } from '../../../shared/history/history-api';

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
