import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, afterRenderEffect, inject, input, viewChild } from '@angular/core';
import uPlot from 'uplot';
import { chartFont, decimalsFor, plotSize, resolveColor } from '../charts/chart-style';
import { formatNumber } from '../readout/format-quantity';

/** One file line as a residual plot shows it. */
export interface ResidualPoint {
  /** File line, for the legend. */
  line: number;
  /** The quantity on the horizontal axis (a current in A, or |B| in G). */
  x: number;
  /** measured − fitted, G, one per component. */
  residualGauss: readonly number[];
  outlier: boolean;
}

const SERIES_COLORS = ['--tw-series-1', '--tw-series-2', '--tw-series-3'];
const MILLIGAUSS_PER_GAUSS = 1000;

/**
 * Residuals of a calibration fit against one quantity, as a uPlot scatter: one point series per
 * residual component, and outliers (more than 3σ off) drawn again as large open rings, so they
 * stand out by shape as well as colour. Rebuilt whenever the points change.
 */
@Component({
  selector: 'tw-residual-chart',
  template: `
    <figure>
      <figcaption>{{ caption() }}</figcaption>
      <div class="plot" #plot></div>
    </figure>
  `,
  styles: `
    :host { display: block; min-width: 0; --tw-chart-height: 160px; }
    figure { margin: 0; }
    figcaption { font: var(--mat-sys-title-small); margin-bottom: 4px; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResidualChart {
  readonly caption = input.required<string>();
  readonly xLabel = input.required<string>();
  /** Legend names of the residual components, e.g. ["|B|"] or ["Bx", "By", "Bz"]. */
  readonly components = input.required<readonly string[]>();
  readonly points = input.required<readonly ResidualPoint[]>();

  private readonly plotHost = viewChild.required<ElementRef<HTMLElement>>('plot');
  private plot: uPlot | null = null;

  constructor() {
    afterRenderEffect(() => this.build(this.plotHost().nativeElement, this.points(), this.components(), this.xLabel()));
    inject(DestroyRef).onDestroy(() => this.plot?.destroy());
  }

  private build(host: HTMLElement, points: readonly ResidualPoint[], components: readonly string[], xLabel: string): void {
    this.plot?.destroy();
    const sorted = [...points].sort((a, b) => a.x - b.x);
    const xs = sorted.map((p) => p.x);
    const columns = components.map((_, c) => sorted.map((p) => p.residualGauss[c] * MILLIGAUSS_PER_GAUSS));
    // The component with the largest |residual| carries the outlier ring.
    const rings = sorted.map((p) => (p.outlier ? worst(p.residualGauss) * MILLIGAUSS_PER_GAUSS : null));
    const color = (property: string) => resolveColor(host, property);
    const text = color('--tw-chart-text');
    const grid = color('--tw-chart-grid');
    const { font, rem } = chartFont();
    const none = () => null;
    const axis = (label: string, side?: number): uPlot.Axis => ({
      label,
      stroke: text,
      font,
      labelFont: font,
      ...(side === undefined ? {} : { side, size: Math.round(3.5 * rem) }),
      grid: { stroke: grid, width: 1 },
      ticks: { stroke: grid, width: 1 },
      values: (_u, splits) => splits.map((v) => formatNumber(v, decimalsFor(splits))),
    });
    this.plot = new uPlot(
      {
        ...plotSize(host),
        scales: {
          x: { time: false },
          // Symmetric about zero, so the sign of a residual reads at a glance.
          y: { range: (_u, min, max) => symmetricRange(min, max) },
        },
        cursor: { drag: { x: false, y: false, setScale: false } },
        legend: { live: false },
        axes: [axis(xLabel), { ...axis('Residual (mG)', 3), space: 20 }],
        series: [
          { label: xLabel },
          ...components.map<uPlot.Series>((name, c) => ({
            label: `${name} residual`,
            stroke: color(SERIES_COLORS[c]),
            paths: none,
            points: { show: true, size: 6, fill: color(SERIES_COLORS[c]) },
          })),
          {
            label: 'outlier (> 3σ)',
            stroke: color('--tw-alarm-text'),
            paths: none,
            points: { show: true, size: 14, width: 2, fill: 'transparent' },
          },
        ],
      },
      [xs, ...columns, rings],
      host,
    );
  }
}

function symmetricRange(min: number | null, max: number | null): uPlot.Range.MinMax {
  const m = Math.max(Math.abs(min ?? 0), Math.abs(max ?? 0), 0.01) * 1.15;
  return [-m, m];
}

function worst(values: readonly number[]): number {
  return values.reduce((a, b) => (Math.abs(b) > Math.abs(a) ? b : a), 0);
}
