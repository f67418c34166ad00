import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import type { AlarmHistoryEvent } from '../../../shared/alarms/alarm-api';
import { errorText } from '../api/error-text';
import { formatLocalDateTime } from '../readout/format-quantity';
import { PRIORITY_LOOK, stateWords } from './alarm-look';
import { channelLabel, channelQuantity } from './channel-text';

const SPANS = [
  { hours: 1, label: '1 h' },
  { hours: 8, label: '8 h' },
  { hours: 24, label: '24 h' },
  { hours: 168, label: '7 days' },
];

const KIND_WORDS: Record<string, string> = {
  raise: 'Raised',
  clear: 'Condition cleared',
  acknowledge: 'Acknowledged',
  reset: 'Reset',
  shelve: 'Shelved',
  unshelve: 'Unshelved',
  'shelve-expired': 'Shelving ran out',
  suppress: 'Suppressed by design',
  unsuppress: 'Suppression ended',
  'out-of-service': 'Taken out of service',
  'return-to-service': 'Returned to service',
};

/** Alarm history: every raise, clear and operator action of the chosen span, newest first, local time. */
@Component({
  selector: 'tw-alarm-history',
  imports: [MatButtonModule, MatButtonToggleModule, MatIconModule],
  templateUrl: './alarm-history.html',
  styleUrl: './alarm-tables.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AlarmHistory {
  protected readonly spans = SPANS;
  protected readonly hours = signal(8);
  protected readonly history = httpResource<{ events: AlarmHistoryEvent[] }>(() => `/api/alarms/history?hours=${this.hours()}`);
  protected readonly error = computed(() => (this.history.error() ? errorText(this.history.error()) : null));
  /** Newest first, as the server sends them. */
  protected readonly events = computed(() => (this.history.hasValue() ? this.history.value().events : []));

  protected readonly priorityLook = PRIORITY_LOOK;
  protected readonly channelLabel = channelLabel;
  protected readonly channelQuantity = channelQuantity;
  protected readonly stateWords = stateWords;

  protected kindWords(kind: string): string {
    return KIND_WORDS[kind] ?? kind;
  }

  protected timeText(event: AlarmHistoryEvent): string {
    return formatLocalDateTime(Date.parse(event.at));
  }
}
