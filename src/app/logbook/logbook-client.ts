import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { LogbookCreated, LogbookEntriesResponse, LogbookEntry } from '../../../shared/logbook/logbook-api';

export interface LogbookFilter {
  q: string;
  tag: string;
  /** ISO 8601 or ''. */
  from: string;
  to: string;
}

export interface NewEntry {
  text: string;
  tags: string;
  /** ISO 8601 or ''. */
  at: string;
  link: string;
  amends: number | null;
  files: File[];
}

/** Calls of the logbook API. */
@Injectable({ providedIn: 'root' })
export class LogbookClient {
  private readonly http = inject(HttpClient);

  async list(filter: LogbookFilter): Promise<LogbookEntry[]> {
    const params: Record<string, string> = {};
    for (const key of ['q', 'tag', 'from', 'to'] as const) if (filter[key].trim() !== '') params[key] = filter[key].trim();
    return (await firstValueFrom(this.http.get<LogbookEntriesResponse>('/api/logbook/entries', { params }))).entries;
  }

  /** Sends the entry as a multipart form (files under `file`); resolves with the new id. */
  async write(entry: NewEntry): Promise<number> {
    const form = new FormData();
    form.append('text', entry.text);
    if (entry.tags.trim()) form.append('tags', entry.tags);
    if (entry.at) form.append('at', entry.at);
    if (entry.link.trim()) form.append('link', entry.link.trim());
    if (entry.amends !== null) form.append('amends', String(entry.amends));
    for (const file of entry.files) form.append('file', file, file.name);
    return (await firstValueFrom(this.http.post<LogbookCreated>('/api/logbook/entries', form))).id;
  }

  /** An attachment's bytes (signed-in request), for an object URL. */
  file(url: string): Promise<Blob> {
    return firstValueFrom(this.http.get(url, { responseType: 'blob' }));
  }
}
