import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { ConnectionReading, LinkState } from '../feed/connection-state';
import { formatLocalTime } from '../readout/format-quantity';

const LOOK: Record<LinkState, { icon: string; label: string }> = {
  live: { icon: 'sensors', label: 'Live' },
  delayed: { icon: 'hourglass_top', label: 'Delayed' },
  stale: { icon: 'history', label: 'Stale' },
  offline: { icon: 'cloud_off', label: 'Offline' },
};

/** A healthy link while the page shows recorded data: nothing on screen is live. */
const REPLAYING_LOOK = { icon: 'link', label: 'Link up' };

/** The feed's health in the toolbar: icon and word always, colour only when not live. */
@Component({
  selector: 'tw-connection-indicator',
  imports: [MatIconModule],
  template: `
    <mat-icon aria-hidden="true">{{ look().icon }}</mat-icon>
    <span class="label">{{ look().label }}</span>
    <span class="detail">{{ detail() }}</span>
  `,
  styleUrl: './connection-indicator.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    role: 'status',
    'aria-label': 'Connection',
    '[attr.data-state]': 'reading().state',
    '[attr.title]': 'detail()',
  },
})
export class ConnectionIndicator {
  readonly reading = input.required<ConnectionReading>();
  /** Browser-clock ms of the next reconnect attempt while offline. */
  readonly reconnectAt = input<number | null>(null);
  /** Current browser time, ms (advances a few times per second). */
  readonly now = input.required<number>();

  /** Set while the Replay page shows: the indicator then names the link, not the data on the page. */
  readonly replaying = input(false);

  protected readonly look = computed(() => {
    const state = this.reading().state;
    return this.replaying() && state === 'live' ? REPLAYING_LOOK : LOOK[state];
  });
  protected readonly detail = computed(() => {
    const { state, reason, dataAgeMs, newestDataAtMs } = this.reading();
    const since = newestDataAtMs === null ? '' : ` since ${formatLocalTime(newestDataAtMs)}`;
    switch (state) {
      case 'live':
        return this.replaying() ? 'the page shows a replay, not live data' : '';
      case 'delayed':
        return dataAgeMs === null ? '' : `data ${(dataAgeMs / 1000).toFixed(1)} s old`;
      case 'stale':
        if (reason === 'controller-offline') return `controller offline${since}`;
        if (reason === 'no-data') return 'no telemetry yet';
        return `no new data${since}`;
      case 'offline': {
        const retry = this.reconnectAt();
        const wait = retry === null ? null : Math.max(0, Math.ceil((retry - this.now()) / 1000));
        return wait === null ? `no link to server${since}` : `no link to server, retrying in ${wait} s`;
      }
    }
  });
}
