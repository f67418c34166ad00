import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, untracked } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { MapQuantity } from '../../../shared/physics/orientation-map';
import type { ProfileRecord } from '../../../shared/profiles/profile-record';
import { sampleParamsOf } from '../../../shared/profiles/sample-profile';
import { isStale } from '../feed/connection-state';
import { LiveFeed } from '../feed/live-feed';
import { cameraAxes } from '../prediction/camera-axes';
import { ActiveProfile } from '../profiles/active-profile';
import { formatNumber } from '../readout/format-quantity';
import { ColorLegend } from './color-legend';
import { QUANTITY_TEXT, scaleFor } from './color-scale';
import { MapComputation } from './map-computation';
import type { MapSettings } from './map-protocol';
import { MapView, type PresentDirection } from './map-view';

const QUANTITIES: { value: MapQuantity; label: string }[] = [
  { value: 'fermiSurfaceAspect', label: 'β = K∥/K⊥' },
  { value: 'tofAspect', label: 'TOF aspect ratio' },
  { value: 'collapseRatio', label: 'Collapse ratio' },
];
const RESOLUTIONS = [10, 5, 2, 1];

/**
 * The Orientation map page: a chosen prediction over all field directions for the active
 * sample profile, computed in a worker (progress, cancel), with the present direction marked.
 * It recomputes by itself when the quantity, the resolution or the active profile changes.
 */
@Component({
  selector: 'tw-orientation-map-page',
  imports: [ColorLegend, MapView, MatButtonModule, MatButtonToggleModule, MatIconModule, MatProgressBarModule],
  providers: [MapComputation],
  templateUrl: './orientation-map-page.html',
  styleUrl: './orientation-map-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OrientationMapPage {
  private readonly feed = inject(LiveFeed);
  private readonly activeProfile = inject(ActiveProfile);
  protected readonly computation = inject(MapComputation);

  protected readonly quantities = QUANTITIES;
  protected readonly resolutions = RESOLUTIONS;
  protected readonly quantity = signal<MapQuantity>('fermiSurfaceAspect');
  protected readonly resolutionDeg = signal(5);

  protected readonly profile = this.activeProfile.record;
  protected readonly profileError = this.activeProfile.error;
  protected readonly status = this.computation.status;
  protected readonly map = this.computation.map;
  protected readonly running = computed(() => {
    const status = this.status();
    return status.kind === 'running' ? status : null;
  });
  protected readonly failure = computed(() => {
    const status = this.status();
    return status.kind === 'failed' ? status.message : null;
  });

  protected readonly scale = computed(() => {
    const map = this.map();
    return map ? scaleFor(map.values, map.settings.quantity) : null;
  });

  /** What the drawn map shows, e.g. "β = K∥/K⊥ at 5° for Lindqvist Hall 167Er · v1". */
  protected readonly mapCaption = computed(() => {
    const map = this.map();
    if (!map) return null;
    const { quantity, resolutionDeg } = map.settings;
    return `${QUANTITY_TEXT[quantity].name} (${QUANTITY_TEXT[quantity].symbol}) at ${resolutionDeg}° steps for ${map.profileLabel}`;
  });

  /** Camera and flight time of a TOF map, e.g. "after 20 ms, imaging u = x, v = z (imaging along y)". */
  protected readonly tofNote = computed(() => {
    const map = this.map();
    if (!map || map.settings.quantity !== 'tofAspect') return null;
    return `after ${formatNumber(map.settings.tofMs, 0)} ms of flight, camera ${cameraAxes(map.settings.imaging)?.label ?? ''}`;
  });

  /** True when the drawn map is for other settings or another profile than those chosen now. */
  protected readonly mapOutdated = computed(() => {
    const map = this.map();
    const profile = this.profile();
    return !!map && (map.settings.quantity !== this.quantity() || map.settings.resolutionDeg !== this.resolutionDeg() || (!!profile && profile.id !== map.profileId));
  });

  /**
   * The present direction: the live prediction's own angles (in the profile's trap frame, the
   * frame of the map) when there is one, else the displayed field angles (calibration frame).
   */
  protected readonly present = computed<(PresentDirection & { source: string; stale: boolean }) | null>(() => {
    const live = this.feed.live();
    const stale = isStale(this.feed.connection().state);
    const prediction = live?.prediction;
    if (prediction) {
      return { thetaDeg: prediction.thetaDeg, phiDeg: prediction.phiDeg, stale, source: 'from the live prediction, in the profile’s trap frame' };
    }
    const field = live?.field;
    if (field && field.thetaDeg !== null && field.phiDeg !== null) {
      return { thetaDeg: field.thetaDeg, phiDeg: field.phiDeg, stale, source: 'from the measured field angles (calibration’s trap frame; no live prediction)' };
    }
    return null;
  });

  protected readonly elapsedText = computed(() => {
    const map = this.map();
    return map ? `${formatNumber(map.elapsedMs / 1000, 1)} s` : '';
  });

  constructor() {
    // Recompute whenever the choice or the active profile changes (and on opening the page).
    const profileId = computed(() => this.profile()?.id ?? null);
    effect(() => {
      const id = profileId();
      const quantity = this.quantity();
      const resolutionDeg = this.resolutionDeg();
      if (id === null) return;
      untracked(() => this.compute(quantity, resolutionDeg));
    });
  }

  protected chooseQuantity(quantity: MapQuantity): void {
    this.quantity.set(quantity);
  }

  protected chooseResolution(resolutionDeg: number): void {
    this.resolutionDeg.set(resolutionDeg);
  }

  protected computeAgain(): void {
    this.compute(this.quantity(), this.resolutionDeg());
  }

  protected cancel(): void {
    this.computation.cancel();
  }

  protected quantityName(quantity: MapQuantity): string {
    return QUANTITY_TEXT[quantity].symbol;
  }

  private compute(quantity: MapQuantity, resolutionDeg: number): void {
    const record: ProfileRecord | null = this.profile();
    if (!record) return;
    const settings: MapSettings = { quantity, resolutionDeg, tofMs: record.profile.tofMs[0], imaging: record.profile.imaging };
    this.computation.start(settings, { profileId: record.id, profileLabel: `${record.name} · v${record.version}`, params: sampleParamsOf(record.profile) });
  }
}
