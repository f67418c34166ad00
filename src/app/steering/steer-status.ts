import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { SteeringStatus } from '../../../shared/steering/steering-api';
import { formatAzimuth, formatLocalTime, formatQuantity } from '../readout/format-quantity';

/** One line on what steers the field now: idle, ramping (with progress) or holding, who and why. */
@Component({
  selector: 'tw-steer-status',
  imports: [MatIconModule],
  template: `
    @if (status(); as s) {
      <p class="mode" [attr.data-mode]="s.mode">
        <mat-icon aria-hidden="true" inline>{{ icon() }}</mat-icon>
        <strong>{{ headline() }}</strong>
        @if (s.target; as t) {
          <span class="target">|B| {{ q(t.magnitudeG, 'G', 2) }}, θ {{ q(t.thetaDeg, '°', 1) }}, φ {{ azimuth(t.phiDeg, 1) }}</span>
        }
      </p>
      @if (s.mode !== 'idle') {
        <p class="who">
          Set by {{ s.actor }} at {{ time(s.startedAt) }}{{ s.runId !== null ? ' for run ' + s.runId : '' }}: “{{ s.reason }}”
          @if (progress(); as p) {
            — {{ p }}
          }
        </p>
      } @else {
        <p class="who">Nothing steers: the controller follows its own program (or keeps its last setpoint).</p>
      }
      @if (s.lastStop; as stop) {
        <p class="stop"><mat-icon aria-hidden="true" inline>info</mat-icon> Steering last stopped at {{ time(stop.at) }}: {{ stop.why }}.</p>
      }
    } @else {
      <p class="who">Reading the steering state…</p>
    }
  `,
  styles: `
    :host {
      display: block;
    }
    p {
      margin: 2px 0;
    }
    .mode {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 4px 10px;
      font: var(--mat-sys-title-medium);
    }
    .target {
      font-variant-numeric: tabular-nums;
    }
    .who,
    .stop {
      font: var(--mat-sys-body-medium);
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SteerStatus {
  readonly status = input.required<SteeringStatus | null>();
  /** Browser clock, ms, for the ramp's progress. */
  readonly now = input<number>(Date.now());

  protected readonly icon = computed(() => ({ idle: 'pause_circle', ramping: 'moving', holding: 'my_location' })[this.status()?.mode ?? 'idle']);
  protected readonly headline = computed(() => ({ idle: 'Idle', ramping: 'Ramping to', holding: 'Holding' })[this.status()?.mode ?? 'idle']);
  protected readonly progress = computed(() => {
    const s = this.status();
    if (!s || s.mode !== 'ramping' || !s.target || !s.startedAt || s.target.rampMs <= 0) return null;
    const f = Math.min(1, Math.max(0, (this.now() - Date.parse(s.startedAt)) / s.target.rampMs));
    return `${Math.round(f * 100)} % of ${formatQuantity(s.target.rampMs / 1000, 's', 1)}`;
  });

  protected readonly azimuth = formatAzimuth;

  protected q(v: number, unit: string, digits: number): string {
    return formatQuantity(v, unit, digits);
  }

  protected time(iso: string | null): string {
    return iso ? formatLocalTime(Date.parse(iso)) : '—';
  }
}
