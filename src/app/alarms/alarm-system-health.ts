import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { formatLocalDateTime, formatLocalTime } from '../readout/format-quantity';
import type { AlarmHealthReport } from '../../../shared/alarms/alarm-api';

/** Rate intervals drawn, newest last (two hours of 10-minute intervals). */
const INTERVALS_SHOWN = 12;

/**
 * The alarm system's own health: alarms per 10 minutes against the flood threshold, floods,
 * chattering alarms (their deadband or delay needs work) and stale alarms (active for a day).
 */
@Component({
  selector: 'tw-alarm-system-health',
  imports: [MatButtonModule, MatIconModule],
  templateUrl: './alarm-system-health.html',
  styleUrls: ['./alarm-tables.scss', './alarm-system-health.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AlarmSystemHealth {
  readonly health = input<AlarmHealthReport | null>(null);
  /** Why the figures could not be loaded. */
  readonly error = input<string | null>(null);
  readonly refresh = output<void>();

  /** The newest intervals, each bar scaled so that the flood threshold stays in view. */
  protected readonly rate = computed(() => {
    const h = this.health();
    if (!h) return { bars: [], floodMarkPct: 0 };
    const shown = h.intervals.slice(-INTERVALS_SHOWN);
    const top = Math.max(h.rules.floodAbove + 1, ...shown.map((i) => i.count));
    return {
      bars: shown.map((i) => ({ ...i, label: formatLocalTime(Date.parse(i.start)), widthPct: (100 * i.count) / top })),
      floodMarkPct: (100 * h.rules.floodAbove) / top,
    };
  });

  protected dateTime(time: string): string {
    return formatLocalDateTime(Date.parse(time));
  }

  protected hours(ms: number): string {
    return `${(ms / 3_600_000).toFixed(1)}\u00a0h`;
  }
}
