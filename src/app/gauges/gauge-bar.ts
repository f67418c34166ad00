import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { ChannelBand } from '../../../shared/live/channels';
import { formatNumber, formatQuantity } from '../readout/format-quantity';
import { classifyReading, fillOrigin, levelMarks, levelZones, offScale, scalePercent, type ReadingStatus } from './gauge-scale';

const STATUS_TEXT: Record<ReadingStatus['level'], Record<'high' | 'low', string> | string | null> = {
  normal: null,
  'off-band': { high: 'Above normal band', low: 'Below normal band' },
  alarm: { high: 'High alarm', low: 'Low alarm' },
  trip: { high: 'Beyond trip level', low: 'Below trip level' },
  'no-data': 'No data',
};

const STATUS_ICON: Record<ReadingStatus['level'], string | null> = {
  normal: null,
  'off-band': 'info',
  alarm: 'warning',
  trip: 'report',
  'no-data': 'help',
};

/**
 * One channel as a horizontal bar against its scale: the normal band shaded, the stretches
 * beyond the alarm and trip levels hatched and their edges marked, an optional setpoint marker, and the value with its unit as text. An abnormal
 * reading gets colour and, always, an icon and words.
 */
@Component({
  selector: 'tw-gauge-bar',
  imports: [MatIconModule],
  templateUrl: './gauge-bar.html',
  styleUrl: './gauge-bar.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    role: 'meter',
    '[attr.aria-label]': 'label()',
    '[attr.aria-valuemin]': 'band().scale[0]',
    '[attr.aria-valuemax]': 'band().scale[1]',
    '[attr.aria-valuenow]': 'value()',
    '[attr.aria-valuetext]': 'spokenValue()',
    '[attr.data-level]': 'status().level',
    '[class.stale]': 'stale()',
  },
})
export class GaugeBar {
  readonly label = input.required<string>();
  readonly band = input.required<ChannelBand>();
  /** The reading in the band's unit; null when missing. */
  readonly value = input<number | null>(null);
  /** Optional target drawn as a marker (the current setpoint), in the band's unit. */
  readonly setpoint = input<number | null>(null);
  readonly digits = input(1);
  /** Marks the reading as no longer current. */
  readonly stale = input(false);

  protected readonly status = computed(() => classifyReading(this.value(), this.band()));
  protected readonly valueText = computed(() => formatQuantity(this.value(), this.band().unit, this.digits()));
  protected readonly statusText = computed(() => {
    const { level, side } = this.status();
    const text = STATUS_TEXT[level];
    return typeof text === 'string' || text === null ? text : text[side ?? 'high'];
  });
  protected readonly statusIcon = computed(() => STATUS_ICON[this.status().level]);
  protected readonly normal = computed(() => {
    const band = this.band();
    const from = scalePercent(band.normal[0], band);
    return { from, to: scalePercent(band.normal[1], band) };
  });
  protected readonly marks = computed(() => levelMarks(this.band()));
  protected readonly zones = computed(() => levelZones(this.band()));
  protected readonly fill = computed(() => {
    const value = this.value();
    const band = this.band();
    if (value === null || !Number.isFinite(value)) return null;
    const at = scalePercent(value, band);
    const origin = scalePercent(fillOrigin(band), band);
    return { at, left: Math.min(at, origin), width: Math.abs(at - origin), pinned: offScale(value, band) };
  });
  protected readonly setpointPercent = computed(() => {
    const setpoint = this.setpoint();
    return setpoint === null || !Number.isFinite(setpoint) ? null : scalePercent(setpoint, this.band());
  });
  protected readonly setpointText = computed(() => formatQuantity(this.setpoint(), this.band().unit, this.digits()));
  protected readonly scaleText = computed(() => {
    const [min, max] = this.band().scale;
    return { min: formatNumber(min, 0), max: formatQuantity(max, this.band().unit, 0) };
  });
  protected readonly spokenValue = computed(() => {
    const parts = [this.valueText()];
    const status = this.statusText();
    if (status) parts.push(status);
    if (this.setpoint() !== null) parts.push(`setpoint ${this.setpointText()}`);
    if (this.stale()) parts.push('stale');
    return parts.join(', ');
  });
}
