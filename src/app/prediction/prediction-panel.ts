import { ChangeDetectionStrategy, Component, computed, input, signal } from '@angular/core';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import type { LivePrediction, PredictionStatus } from '../../../shared/live/live-state';
import type { ProfileRecord } from '../../../shared/profiles/profile-record';
import { formatNumber } from '../readout/format-quantity';
import { SymbolText } from '../readout/symbol-text';
import { cameraAxes } from './camera-axes';
import { CameraSketch } from './camera-sketch';
import { DEFAULT_EXAGGERATION, EXAGGERATION_FACTORS } from './ellipse-drawing';
import { readPrediction } from './prediction-readout';

/**
 * The live prediction for the present field direction: Fermi-surface and cloud shape, the TOF
 * image the camera should record, and the distance to collapse, with a sketch of the three
 * ellipses. A collapsed gas is reported with its collapse ratio and nothing is drawn. While the
 * prediction does not apply (field too weak to orient the dipoles, telemetry stale) the panel
 * says why instead of a stability verdict and greys its numbers.
 */
@Component({
  selector: 'tw-prediction-panel',
  imports: [CameraSketch, MatButtonToggleModule, MatIconModule, SymbolText],
  templateUrl: './prediction-panel.html',
  styleUrl: './prediction-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { role: 'region', 'aria-label': 'Prediction', '[class.stale]': 'staleNote() !== null || notApplying() !== null' },
})
export class PredictionPanel {
  readonly prediction = input<LivePrediction | null>(null);
  /** The active profile, to name it and to know its camera; may lag behind the prediction. */
  readonly profile = input<ProfileRecord | null>(null);
  /** Set while the data is not current, e.g. "Stale since 21:04:13". */
  readonly staleNote = input<string | null>(null);
  /** Whether the prediction describes the gas now (the server's judgement); null when unknown. */
  readonly status = input<PredictionStatus | null>(null);
  /** Set on the Replay page, so a missing prediction is explained as not recorded. */
  readonly replay = input(false);

  /** Why the prediction does not describe the gas now (field too weak, telemetry stale); null while it does. */
  protected readonly notApplying = computed(() => {
    const status = this.status();
    return status && status.state !== 'applies' ? status.reason ?? 'The prediction does not apply now.' : null;
  });

  protected readonly factors = EXAGGERATION_FACTORS;
  protected readonly factor = signal<number>(DEFAULT_EXAGGERATION);
  protected readonly readout = computed(() => readPrediction(this.prediction()));

  /** The profile record, only when it is the one the prediction was computed with. */
  private readonly matchingProfile = computed(() => {
    const profile = this.profile();
    const prediction = this.prediction();
    return profile && prediction && profile.id === prediction.profileId ? profile : null;
  });

  protected readonly profileText = computed(() => {
    const profile = this.matchingProfile();
    if (profile) return `${profile.name} · v${profile.version}`;
    const prediction = this.prediction();
    return prediction ? `profile #${prediction.profileId}` : null;
  });

  protected readonly tofCaption = computed(() => {
    const camera = this.prediction()?.camera;
    return camera ? `after ${formatNumber(camera.tofMs, 0)} ms, ${this.axes()?.label ?? `camera ${camera.imaging}`}` : null;
  });

  protected readonly axes = computed(() => {
    const camera = this.prediction()?.camera;
    if (!camera) return null;
    return cameraAxes(this.matchingProfile()?.profile.imaging ?? camera.imaging);
  });

  /** "from x towards z" for a named camera, "from u towards v" otherwise. */
  protected readonly angleSense = computed(() => {
    const axes = this.axes();
    return axes ? `from ${axes.uName} towards ${axes.vName}` : 'from u towards v';
  });

  /** The sketch, only for a stable gas with a camera view; a collapsed gas has no shape to draw. */
  protected readonly sketch = computed(() => {
    const prediction = this.prediction();
    return prediction?.stable && prediction.camera ? { camera: prediction.camera, theta: prediction.thetaDeg, phi: prediction.phiDeg } : null;
  });

  protected chooseFactor(factor: number): void {
    this.factor.set(factor);
  }
}
