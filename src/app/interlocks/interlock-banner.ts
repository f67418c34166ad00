import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { InterlockStatus } from '../../../shared/alarms/alarm-api';
import type { LiveState } from '../../../shared/live/live-state';
import { tripHeadline } from './interlock-text';

/**
 * The interlock on every screen: nothing while all is well; a banner with icon and words when
 * the software interlock has tripped, and a separate one when the controller's own hardware
 * trip chain has latched (reset only at the controller).
 */
@Component({
  selector: 'tw-interlock-banner',
  imports: [MatIconModule, RouterLink],
  template: `
    @if (headline(); as text) {
      <section class="banner trip" role="alert" aria-label="Software interlock">
        <mat-icon aria-hidden="true">report</mat-icon>
        <p>
          @if (replaying()) {<strong class="now">Now, not in the replay: </strong>}
          <strong>{{ text }}.</strong>
          Coil currents were ramped to zero. Reset once the cause has cleared:
          <a routerLink="/interlocks">open Interlocks</a>.
        </p>
      </section>
    }
    @if (hardwareTripped()) {
      <section class="banner trip" role="alert" aria-label="Hardware interlock">
        <mat-icon aria-hidden="true">bolt</mat-icon>
        <p>
          @if (replaying()) {<strong class="now">Now, not in the replay: </strong>}
          <strong>Hardware interlock tripped at the controller{{ hardwareCause() }}.</strong>
          It can only be reset at the controller itself, never from Tiltwatch.
        </p>
      </section>
    }
  `,
  styleUrl: './interlock-banner.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InterlockBanner {
  /** The server's interlock state; null until known (nothing is shown then). */
  readonly status = input<InterlockStatus | null>(null);
  readonly controller = input<LiveState['controller'] | null>(null);
  /** Set while the Replay page shows: the banner is about now, and says so. */
  readonly replaying = input(false);

  protected readonly headline = computed(() => tripHeadline(this.status()));
  protected readonly hardwareTripped = computed(() => !!this.controller()?.hardwareTripped || !!this.status()?.hardwareTripped);
  protected readonly hardwareCause = computed(() => {
    const cause = this.controller()?.hardwareTripCause ?? this.status()?.hardwareTripCause;
    return cause ? ` (cause: ${cause})` : '';
  });
}
