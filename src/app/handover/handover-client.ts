import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { Handover, HandoverItem, HandoverListItem, HandoverListResponse, HandoverNotes, HandoverResponse } from '../../../shared/handover/handover-api';

export interface HandoverEdit {
  summary: string;
  notes: HandoverNotes;
  openItems: { text: string }[];
}

/** Calls of the handover API. */
@Injectable({ providedIn: 'root' })
export class HandoverClient {
  private readonly http = inject(HttpClient);

  async list(): Promise<HandoverListItem[]> {
    return (await firstValueFrom(this.http.get<HandoverListResponse>('/api/handovers'))).handovers;
  }

  get(id: number): Promise<Handover> {
    return this.unwrap(this.http.get<HandoverResponse>(`/api/handovers/${id}`));
  }

  start(): Promise<Handover> {
    return this.unwrap(this.http.post<HandoverResponse>('/api/handovers', {}));
  }

  save(id: number, edit: HandoverEdit): Promise<Handover> {
    return this.unwrap(this.http.put<HandoverResponse>(`/api/handovers/${id}`, edit));
  }

  submit(id: number): Promise<Handover> {
    return this.unwrap(this.http.post<HandoverResponse>(`/api/handovers/${id}/submit`, {}));
  }

  accept(id: number, comment: string): Promise<Handover> {
    return this.unwrap(this.http.post<HandoverResponse>(`/api/handovers/${id}/accept`, comment.trim() ? { comment } : {}));
  }

  async closeItem(id: number, note: string): Promise<HandoverItem> {
    return (await firstValueFrom(this.http.post<{ item: HandoverItem }>(`/api/handover-items/${id}/close`, { note }))).item;
  }

  private async unwrap(request: ReturnType<HttpClient['get']>): Promise<Handover> {
    return ((await firstValueFrom(request)) as HandoverResponse).handover;
  }
}
