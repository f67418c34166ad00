import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { MapQuantity } from '../../../shared/physics/orientation-map';
import { formatNumber } from '../readout/format-quantity';
import { SymbolText } from '../readout/symbol-text';
import { QUANTITY_TEXT, paletteGradient, type ColorScale } from './color-scale';

const GRADIENT = paletteGradient();

/** The colour bar of an orientation map with its ticks, title and unit. */
@Component({
  selector: 'tw-color-legend',
  imports: [SymbolText],
  template: `
    <p class="title">{{ text().name }}, <tw-symbol-text [text]="text().symbol" /> <span class="unit">({{ text().unit }})</span></p>
    <div class="bar" [style.background]="gradient" role="img" [attr.aria-label]="description()"></div>
    <div class="ticks" aria-hidden="true">
      @for (tick of ticks(); track tick.value) {
        <span class="tick" [style.left.%]="tick.left">{{ tick.text }}</span>
      }
    </div>
    <p class="range">{{ range() }}</p>
  `,
  styles: `
    :host {
      display: block;
      min-width: 240px;
    }
    .title {
      margin: 0 0 4px;
      font: var(--mat-sys-label-large);
    }
    .unit {
      color: var(--mat-sys-on-surface-variant);
      font-weight: normal;
    }
    .bar {
      height: 14px;
      border: 1px solid var(--mat-sys-outline-variant);
    }
    .ticks {
      position: relative;
      height: 1.6em;
    }
    .range {
      margin: 0;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
      font-variant-numeric: tabular-nums;
    }
    .tick {
      position: absolute;
      top: 2px;
      transform: translateX(-50%);
      font: var(--mat-sys-label-medium);
      font-variant-numeric: tabular-nums;
      color: var(--mat-sys-on-surface-variant);
      white-space: nowrap;
      &::before {
        content: '';
        position: absolute;
        left: 50%;
        top: -4px;
        height: 5px;
        border-left: 1px solid var(--mat-sys-on-surface-variant);
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ColorLegend {
  readonly scale = input.required<ColorScale>();
  readonly quantity = input.required<MapQuantity>();

  protected readonly gradient = GRADIENT;
  protected readonly text = computed(() => QUANTITY_TEXT[this.quantity()]);

  protected readonly ticks = computed(() => {
    const { min, max, ticks, digits } = this.scale();
    const span = max - min;
    return ticks.map((value) => ({ value, text: formatNumber(value, digits), left: span > 0 ? (100 * (value - min)) / span : 50 }));
  });

  /**
   * The stable values' full range in words: the colours always span the whole scale, so a map
   * whose values differ by 0.02 % looks as contrasted as one whose values differ by 50 %.
   */
  protected readonly range = computed(() => {
    const { min, max, digits } = this.scale();
    const d = Math.max(3, digits + 1);
    const spread = min !== 0 ? `: they differ by ${formatNumber((100 * (max - min)) / Math.abs(min), 2)}\u00a0%` : '';
    return `Stable values from ${formatNumber(min, d)} to ${formatNumber(max, d)}${spread}.`;
  });

  protected readonly description = computed(() => {
    const { min, max, digits } = this.scale();
    const d = Math.max(3, digits + 1);
    return `Colour scale of ${this.text().name} from ${formatNumber(min, d)} (dark) to ${formatNumber(max, d)} (light)`;
  });
}
