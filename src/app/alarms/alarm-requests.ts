import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { AlarmLimitChanges } from './alarm-records';

/**
 * Operator and lead requests on alarms and limits. Each resolves when the server accepted it
 * and rejects with the server's `HttpErrorResponse` otherwise (shown with `errorText`). The
 * server checks roles again; the page only decides what to offer.
 */
@Injectable({ providedIn: 'root' })
export class AlarmRequests {
  private readonly http = inject(HttpClient);

  acknowledge(id: string): Promise<unknown> {
    return this.post(id, 'acknowledge', {});
  }

  /** Shelves for `minutes` (the server's maximum applies) with the operator's reason. */
  shelve(id: string, minutes: number, reason: string): Promise<unknown> {
    return this.post(id, 'shelve', { minutes, reason });
  }

  unshelve(id: string, reason: string): Promise<unknown> {
    return this.post(id, 'unshelve', reason ? { reason } : {});
  }

  /** Resets a latched alarm whose condition has cleared. */
  reset(id: string, reason: string): Promise<unknown> {
    return this.post(id, 'reset', { reason });
  }

  /** Takes an alarm out of service (`on`) or returns it to service (lead). */
  setOutOfService(id: string, on: boolean, reason: string): Promise<unknown> {
    return this.post(id, 'out-of-service', { on, reason });
  }

  /** Replaces a limit (lead); the reason goes to the audit trail with old and new values. */
  updateLimit(id: string, changes: AlarmLimitChanges, reason: string): Promise<unknown> {
    return firstValueFrom(this.http.put(`/api/alarm-limits/${encodeURIComponent(id)}`, { ...changes, reason }));
  }

  private post(id: string, action: string, body: object): Promise<unknown> {
    return firstValueFrom(this.http.post(`/api/alarms/${encodeURIComponent(id)}/${action}`, body));
  }
}
