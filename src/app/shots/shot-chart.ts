import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, afterRenderEffect, inject, input, viewChild } from '@angular/core';
import uPlot from 'uplot';
import { chartFont, decimalsFor, plotSize, resolveColor } from '../charts/chart-style';
import { formatNumber } from '../readout/format-quantity';
import type { ShotView } from './shot-comparison';

/** What the chart shows against θ: both aspect ratios, or measured − predicted. */
export type ShotChartKind = 'aspect' | 'residual';

/** The plotted columns, sorted by θ; shots without θ are left out. */
export interface ShotChartData {
  theta: number[];
  predicted: (number | null)[];
  measured: (number | null)[];
  sigma: (number | null)[];
  /** Vertical range that holds every point and error bar, with a margin. */
  range: [number, number];
}

/** Least span of the aspect-ratio axis, so differences of 10⁻⁴ between shots do not fill the chart. */
const MIN_ASPECT_SPAN = 0.01;

/** Columns of the chart: aspect ratios (or their difference) and σ per shot, by θ. */
export function shotChartData(views: readonly ShotView[], kind: ShotChartKind): ShotChartData {
  const rows = views.filter((v) => v.thetaDeg !== null).sort((a, b) => a.thetaDeg! - b.thetaDeg!);
  const predicted = rows.map((v) => (kind === 'aspect' ? v.predictedAspect : null));
  const measured = rows.map((v) => (kind === 'aspect' ? v.measuredAspect : v.residual));
  const sigma = rows.map((v, i) => (measured[i] === null ? null : v.sigma));
  const values: number[] = kind === 'residual' ? [0] : [];
  rows.forEach((_, i) => {
    for (const y of [predicted[i], measured[i]]) if (y !== null) values.push(y);
    const m = measured[i];
    const s = sigma[i];
    if (m !== null && s !== null) values.push(m - s, m + s);
  });
  let lo = values.length ? Math.min(...values) : kind === 'aspect' ? 1 : -0.01;
  let hi = values.length ? Math.max(...values) : kind === 'aspect' ? 1.05 : 0.01;
  if (kind === 'residual') hi = -(lo = -Math.max(Math.abs(lo), Math.abs(hi), 1e-3));
  else if (hi - lo < MIN_ASPECT_SPAN) [lo, hi] = [(lo + hi - MIN_ASPECT_SPAN) / 2, (lo + hi + MIN_ASPECT_SPAN) / 2];
  const pad = Math.max((hi - lo) * 0.08, 1e-4);
  return { theta: rows.map((v) => v.thetaDeg!), predicted, measured, sigma, range: [lo - pad, hi + pad] };
}

/**
 * Measured and predicted TOF aspect ratio (or their difference) against the field's polar
 * angle θ in the trap frame, as a uPlot scatter; the measured points carry ±σ error bars,
 * drawn by a draw hook. Rebuilt whenever the shots change.
 */
@Component({
  selector: 'tw-shot-chart',
  template: `
    <figure>
      <figcaption>{{ caption() }}</figcaption>
      <div class="plot" #plot role="img" [attr.aria-label]="caption()"></div>
    </figure>
  `,
  styles: `
    :host { display: block; min-width: 0; }
    figure { margin: 0; }
    figcaption { font: var(--mat-sys-title-small); margin-bottom: 4px; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ShotChart {
  readonly views = input.required<readonly ShotView[]>();
  readonly kind = input.required<ShotChartKind>();
  readonly caption = input.required<string>();

  private readonly plotHost = viewChild.required<ElementRef<HTMLElement>>('plot');
  private plot: uPlot | null = null;
  private observer: ResizeObserver | null = null;

  constructor() {
    afterRenderEffect(() => this.build(this.plotHost().nativeElement, shotChartData(this.views(), this.kind()), this.kind()));
    inject(DestroyRef).onDestroy(() => {
      this.observer?.disconnect();
      this.plot?.destroy();
    });
  }

  private build(host: HTMLElement, data: ShotChartData, kind: ShotChartKind): void {
    this.plot?.destroy();
    this.observer?.disconnect();
    const color = (property: string) => resolveColor(host, property);
    const text = color('--tw-chart-text');
    const grid = color('--tw-chart-grid');
    const predictedColor = color('--tw-series-1');
    const measuredColor = color('--tw-series-2');
    const { font, rem } = chartFont();
    const none = () => null;
    const show = (v: number | null | undefined, digits: number) => (v === null || v === undefined ? '' : formatNumber(v, digits));
    const axis = (label: string, extra: Partial<uPlot.Axis> = {}): uPlot.Axis => ({
      label, stroke: text, font, labelFont: font, grid: { stroke: grid, width: 1 }, ticks: { stroke: grid, width: 1 }, ...extra,
    });
    const measured: uPlot.Series = {
      label: kind === 'aspect' ? 'measured (±σ)' : 'measured − predicted (±σ)',
      stroke: measuredColor,
      paths: none,
      points: { show: true, size: 8, fill: measuredColor },
      value: (_u, v) => show(v, 4),
    };
    this.plot = new uPlot(
      {
        ...plotSize(host),
        scales: { x: { time: false, range: (_u, min, max) => [Math.min(0, min ?? 0), Math.max(90, max ?? 90)] }, y: { range: () => data.range } },
        cursor: { drag: { x: false, y: false, setScale: false } },
        legend: { live: false },
        axes: [
          axis('θ, field polar angle in the trap frame (°)'),
          axis(kind === 'aspect' ? 'TOF aspect ratio' : 'Δ aspect ratio', {
            size: Math.round(3.8 * rem),
            values: (_u, splits) => splits.map((v) => formatNumber(v, Math.max(kind === 'aspect' ? 2 : 3, decimalsFor(splits)))),
          }),
        ],
        series:
          kind === 'aspect'
            ? [
                { label: 'θ', value: (_u, v) => (v === null ? '' : `${formatNumber(v, 1)}°`) },
                { label: 'predicted', stroke: predictedColor, width: 2, spanGaps: true, points: { show: true, size: 6, fill: predictedColor }, value: (_u, v) => show(v, 4) },
                measured,
              ]
            : [{ label: 'θ', value: (_u, v) => (v === null ? '' : `${formatNumber(v, 1)}°`) }, measured],
        hooks: { draw: [(u) => drawErrorBars(u, data, measuredColor, kind === 'residual')] },
      },
      kind === 'aspect' ? [data.theta, data.predicted, data.measured] : [data.theta, data.measured],
      host,
    );
    if (typeof ResizeObserver !== 'undefined') {
      this.observer = new ResizeObserver(() => {
        const size = plotSize(host);
        if (this.plot && this.plot.width !== size.width) this.plot.setSize(size);
      });
      this.observer.observe(host);
    }
  }
}

/** ±σ bars with caps around each measured point, and the zero line of a residual chart. */
function drawErrorBars(u: uPlot, data: ShotChartData, stroke: string, zeroLine: boolean): void {
  const ctx = u.ctx;
  const cap = 4 * devicePixelRatio;
  ctx.save();
  ctx.strokeStyle = stroke;
  ctx.lineWidth = 1.5 * devicePixelRatio;
  ctx.beginPath();
  data.theta.forEach((theta, i) => {
    const m = data.measured[i];
    const s = data.sigma[i];
    if (m === null || s === null) return;
    const x = u.valToPos(theta, 'x', true);
    const top = u.valToPos(m + s, 'y', true);
    const bottom = u.valToPos(m - s, 'y', true);
    ctx.moveTo(x, top);
    ctx.lineTo(x, bottom);
    ctx.moveTo(x - cap, top);
    ctx.lineTo(x + cap, top);
    ctx.moveTo(x - cap, bottom);
    ctx.lineTo(x + cap, bottom);
  });
  ctx.stroke();
  if (zeroLine) {
    const y = u.valToPos(0, 'y', true);
    ctx.strokeStyle = stroke;
    ctx.setLineDash([4 * devicePixelRatio, 4 * devicePixelRatio]);
    ctx.lineWidth = devicePixelRatio;
    ctx.beginPath();
    ctx.moveTo(u.bbox.left, y);
    ctx.lineTo(u.bbox.left + u.bbox.width, y);
    ctx.stroke();
  }
  ctx.restore();
}
