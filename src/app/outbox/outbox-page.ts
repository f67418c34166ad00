import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatIconModule } from '@angular/material/icon';
import { errorText } from '../api/error-text';
import { formatLocalDateTime } from '../readout/format-quantity';

/** One message the local mailbox received (`GET /api/admin/outbox`). */
export interface OutboxMessage {
  from: string;
  to: string[];
  subject: string;
  text: string;
  /** ISO 8601 UTC. */
  receivedAt: string;
}

/**
 * The on-call notices Tiltwatch sent, as the local mailbox received them (development
 * and tests; with a real mail server configured there is no local outbox). Admin only.
 */
@Component({
  selector: 'tw-outbox-page',
  imports: [MatButtonModule, MatExpansionModule, MatIconModule],
  templateUrl: './outbox-page.html',
  styleUrl: './outbox-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutboxPage {
  protected readonly outbox = httpResource<{ messages: OutboxMessage[] }>(() => '/api/admin/outbox');
  protected readonly error = computed(() => (this.outbox.error() ? errorText(this.outbox.error()) : null));
  /** Newest first, whatever order they came in. */
  protected readonly messages = computed(() =>
    this.outbox.hasValue() ? [...this.outbox.value().messages].sort((a, b) => Date.parse(b.receivedAt) - Date.parse(a.receivedAt)) : [],
  );

  protected localTime(iso: string): string {
    return formatLocalDateTime(Date.parse(iso));
  }
}
