import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { FieldState } from '../../../shared/field/field-vector';
import type { LiveState } from '../../../shared/live/live-state';
import { DirectionGlyph } from './direction-glyph';
import { readField } from './field-readout';

/** |B|, θ, φ, the direction glyph and the calibration that produced them. */
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
  /** Set while the data is not current, e.g. "Stale since 21:04:13". */
  readonly staleNote = input<string | null>(null);

  protected readonly readout = computed(() => readField(this.field()));
  protected readonly calibrationText = computed(() => {
    const cal = this.calibration();
    return cal ? `v${cal.version} · ${cal.label}` : 'not known';
  });
}
