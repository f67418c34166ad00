import { ChangeDetectionStrategy, Component, computed, effect, inject, input, untracked } from '@angular/core';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { sampleParamsOf } from '../../../shared/profiles/sample-profile';
import { LiveFeed } from '../feed/live-feed';
import { ColorLegend } from '../orientation-map/color-legend';
import { scaleFor } from '../orientation-map/color-scale';
import { MapComputation } from '../orientation-map/map-computation';
import { MapView, type PresentDirection } from '../orientation-map/map-view';
import { ActiveProfile } from '../profiles/active-profile';

/** Grid step of the map under a path, degrees: coarse enough to be ready in seconds. */
const STEP_DEG = 5;

/**
 * A planned path drawn on the orientation map of β = K∥/K⊥ for the active sample profile
 * (computed in the browser's worker), with the present direction from the live prediction.
 * Both are in the profile's trap frame, the frame of the map.
 */
@Component({
  selector: 'tw-path-map',
  imports: [ColorLegend, MapView, MatProgressBarModule],
  providers: [MapComputation],
  template: `
    @if (map(); as m) {
      @if (scale(); as s) {
        <div class="layout">
          <tw-map-view [map]="m" [scale]="s" [present]="present()" [path]="path()" />
          <aside class="legend" aria-label="Legend">
            <tw-color-legend [scale]="s" [quantity]="m.settings.quantity" />
            <ul class="keys">
              <li><i class="swatch ring"></i> present direction (live prediction)</li>
              <li><i class="swatch line"></i> planned path, <i class="swatch dot"></i> its end</li>
              <li><i class="swatch dash"></i> magic angle</li>
            </ul>
          </aside>
        </div>
      }
    } @else if (running(); as fraction) {
      <mat-progress-bar mode="determinate" [value]="fraction * 100" aria-label="Computing the orientation map" />
      <p class="note">Computing the map of β for the active sample profile… {{ (fraction * 100).toFixed(0) }} %</p>
    } @else if (failure(); as message) {
      <p class="note" role="alert">The map could not be computed: {{ message }}</p>
    } @else {
      <p class="note">Waiting for the active sample profile…</p>
    }
  `,
  styles: `
    :host {
      display: block;
    }
    .layout {
      display: grid;
      grid-template-columns: minmax(0, 1fr) minmax(160px, 220px);
      gap: 16px;
      align-items: start;
    }
    .keys {
      list-style: none;
      padding: 0;
      margin: 12px 0 0;
      font: var(--mat-sys-body-small);
    }
    .keys li {
      margin: 4px 0;
    }
    .swatch {
      display: inline-block;
      vertical-align: middle;
      margin-right: 4px;
    }
    .ring {
      width: 12px;
      height: 12px;
      border-radius: 50%;
      border: 2px solid #fff;
      box-shadow: 0 0 0 2px #000;
    }
    .line {
      width: 18px;
      height: 3px;
      background: #fff;
      box-shadow: 0 0 0 1.5px #000;
    }
    .dot {
      width: 9px;
      height: 9px;
      border-radius: 50%;
      background: #fff;
      border: 2px solid #000;
    }
    .dash {
      width: 18px;
      border-top: 2px dashed var(--mat-sys-on-surface-variant);
    }
    .note {
      font: var(--mat-sys-body-medium);
      color: var(--mat-sys-on-surface-variant);
    }
    @media (max-width: 800px) {
      .layout {
        grid-template-columns: 1fr;
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PathMap {
  /** Directions of the planned path in the profile's trap frame, start to end. */
  readonly path = input<readonly PresentDirection[]>([]);

  private readonly feed = inject(LiveFeed);
  private readonly profile = inject(ActiveProfile).record;
  private readonly computation = inject(MapComputation);

  protected readonly map = this.computation.map;
  protected readonly scale = computed(() => {
    const m = this.map();
    return m ? scaleFor(m.values, m.settings.quantity) : null;
  });
  protected readonly running = computed(() => {
    const s = this.computation.status();
    return s.kind === 'running' ? Math.max(s.fraction, 0.001) : null;
  });
  protected readonly failure = computed(() => {
    const s = this.computation.status();
    return s.kind === 'failed' ? s.message : null;
  });
  protected readonly present = computed<PresentDirection | null>(() => {
    const p = this.feed.live()?.prediction;
    return p ? { thetaDeg: p.thetaDeg, phiDeg: p.phiDeg } : null;
  });

  constructor() {
    const profileId = computed(() => this.profile()?.id ?? null);
    effect(() => {
      if (profileId() === null) return;
      untracked(() => {
        const record = this.profile();
        if (!record) return;
        this.computation.start(
          { quantity: 'fermiSurfaceAspect', resolutionDeg: STEP_DEG, tofMs: record.profile.tofMs[0], imaging: record.profile.imaging },
          { profileId: record.id, profileLabel: `${record.name} · v${record.version}`, params: sampleParamsOf(record.profile) },
        );
      });
    });
  }
}
