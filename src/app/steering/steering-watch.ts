import { DestroyRef, Injectable, inject, signal } from '@angular/core';
import type { SteeringStatus } from '../../../shared/steering/steering-api';
import { errorText } from '../api/error-text';
import { SteeringRequests } from './steering-requests';

/** How often the steering state is read while a page shows it, ms. */
const POLL_MS = 1000;

/**
 * The steering state for one page: read at once and then every second while the page lives
 * (provide it in the component). `refresh()` reads it at once, e.g. after a command.
 */
@Injectable()
export class SteeringWatch {
  private readonly requests = inject(SteeringRequests);
  readonly status = signal<SteeringStatus | null>(null);
  readonly error = signal<string | null>(null);
  /** Browser time of the last successful read, ms. */
  readonly readAt = signal<number | null>(null);

  constructor() {
    void this.refresh();
    const timer = setInterval(() => void this.refresh(), POLL_MS);
    inject(DestroyRef).onDestroy(() => clearInterval(timer));
  }

  async refresh(): Promise<void> {
    try {
      this.status.set(await this.requests.status());
      this.error.set(null);
      this.readAt.set(Date.now());
    } catch (err) {
      this.error.set(errorText(err));
    }
  }
}
