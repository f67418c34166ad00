import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { SteeringStatus } from '../../../shared/steering/steering-api';
import { formatAzimuth, formatLocalTime, formatQuantity } from '../readout/format-quantity';

/**
 * One line on what steers the field now: idle, ramping (with progress), holding, or what a
 * restart of the server left (a target kept, or a ramp it interrupted), who and why.
 */
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
        @if (s.mode === 'restored') {
          <p class="restart" data-restart="restored">
            <mat-icon aria-hidden="true" inline>restart_alt</mat-icon> The server restarted after this target had been reached. It sends no setpoint
            until a new target is set or steering is released; the deviation alarm still measures against this target.
          </p>
        } @else if (s.mode === 'interrupted') {
          <p class="restart" data-restart="interrupted">
            <mat-icon aria-hidden="true" inline>warning</mat-icon> A server restart interrupted this ramp: where along its path the field stopped is
            not known, so the measured field is what counts now. Nothing is sent and no deviation from this target is alarmed until a new target is set.
          </p>
        }
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
    .restart {
      font: var(--mat-sys-body-medium);
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

  protected readonly icon = computed(() => ({ idle: 'pause_circle', ramping: 'moving', holding: 'my_location', restored: 'my_location', interrupted: 'report' })[this.status()?.mode ?? 'idle']);
  protected readonly headline = computed(() => ({ idle: 'Idle', ramping: 'Ramping to', holding: 'Holding', restored: 'Target kept from before the restart', interrupted: 'Ramp interrupted by a restart, towards' })[this.status()?.mode ?? 'idle']);
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
