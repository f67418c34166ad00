import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { FieldUncertainty } from '../../../shared/field/field-uncertainty';
import type { FieldState } from '../../../shared/field/field-vector';
import type { LiveState } from '../../../shared/live/live-state';
import { formatSigma } from '../readout/uncertain-number';
import { DirectionGlyph } from './direction-glyph';
import { readField } from './field-readout';

/** |B|, θ, φ with their calibration uncertainty, the direction glyph and the calibration that produced them. */
@Component({
  selector: 'tw-field-panel',
  imports: [DirectionGlyph, MatIconModule],
  templateUrl: './field-panel.html',
  styleUrl: './field-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { role: 'region', 'aria-label': 'Field', '[class.stale]': 'staleNote() !== null' },
})
export class FieldPanel {
  readonly field = input<FieldState | null>(null);
  readonly calibration = input<LiveState['calibration']>(null);
  /** One standard deviation from the calibration's uncertainty; null when the calibration has none. */
  readonly uncertainty = input<FieldUncertainty | null>(null);
  /** Set while the data is not current, e.g. "Stale since 21:04:13". */
  readonly staleNote = input<string | null>(null);
  /** Set on the Replay page: history does not say which calibration produced each sample. */
  readonly replay = input(false);

  protected readonly readout = computed(() => readField(this.field()));
  /** Why the angles are not shown; in a replay a missing sample is explained by the stale note instead. */
  protected readonly angleNote = computed(() => (this.replay() && !this.field() ? null : this.readout().angleNote));
  /** "± 0.21°" beside each reading, or null when the calibration carries no uncertainty. */
  protected readonly sigmas = computed(() => {
    const u = this.uncertainty();
    const f = this.field();
    if (!u || !f) return null;
    return {
      magnitude: formatSigma(u.magnitudeGauss, 'G'),
      theta: f.thetaDeg === null ? null : formatSigma(u.thetaDeg, '°'),
      phi: f.phiDeg === null ? null : formatSigma(u.phiDeg, '°'),
    };
  });
  protected readonly calibrationText = computed(() => {
    const cal = this.calibration();
    if (cal) return `v${cal.version} · ${cal.label}`;
    return this.replay() ? 'in force then: not recorded' : 'not known';
  });
}
