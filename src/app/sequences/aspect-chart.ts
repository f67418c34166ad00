import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, afterNextRender, effect, inject, input, viewChild } from '@angular/core';
import uPlot from 'uplot';
import type { PlannedPoint } from '../../../shared/steering/steering-api';
import { decimalsFor, resolveColor } from '../charts/chart-style';
import { formatNumber } from '../readout/format-quantity';

/** Height of the chart's plot area, px. */
const HEIGHT = 180;

/**
 * The predicted Fermi-surface aspect ratio β = K∥/K⊥ along a planned sequence, against time
 * from its start, drawn by uPlot. Holds appear as flat stretches; points where the model found
 * no stable gas are gaps.
 */
@Component({
  selector: 'tw-aspect-chart',
  template: `<div #plot class="plot" role="img" [attr.aria-label]="label()"></div>`,
  styles: `
    :host {
      display: block;
    }
    .plot {
      min-height: ${HEIGHT}px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AspectChart {
  readonly points = input.required<readonly PlannedPoint[]>();
  private readonly host = viewChild.required<ElementRef<HTMLElement>>('plot');
  private plot: uPlot | null = null;
  private observer: ResizeObserver | null = null;

  constructor() {
    afterNextRender(() => this.create());
    effect(() => {
      const data = this.data();
      this.plot?.setData(data);
    });
    inject(DestroyRef).onDestroy(() => {
      this.observer?.disconnect();
      this.plot?.destroy();
    });
  }

  protected label(): string {
    const values = this.points().map((p) => p.fermiSurfaceAspect).filter((v): v is number => v !== null);
    if (values.length === 0) return 'Predicted β along the sequence: no prediction';
    return `Predicted β along the sequence, from ${formatNumber(Math.min(...values), 4)} to ${formatNumber(Math.max(...values), 4)}`;
  }

  private data(): uPlot.AlignedData {
    const pts = this.points();
    return [pts.map((p) => p.tMs / 1000), pts.map((p) => p.fermiSurfaceAspect)];
  }

  private create(): void {
    const host = this.host().nativeElement;
    const text = resolveColor(host, '--tw-chart-text');
    const grid = resolveColor(host, '--tw-chart-grid');
    const rem = parseFloat(getComputedStyle(document.documentElement).fontSize) || 16;
    const font = `${Math.round(0.75 * rem)}px Roboto, sans-serif`;
    this.plot = new uPlot(
      {
        width: Math.max(host.clientWidth, 200),
        height: HEIGHT,
        scales: { x: { time: false }, beta: { auto: true } },
        cursor: { drag: { x: false, y: false, setScale: false } },
        legend: { live: true },
        axes: [
          { stroke: text, font, labelFont: font, label: 'time from the start of the sequence (s)', grid: { stroke: grid, width: 1 }, ticks: { stroke: grid, width: 1 } },
          {
            scale: 'beta', label: 'β = K∥/K⊥', stroke: text, font, labelFont: font, size: Math.round(3.8 * rem),
            grid: { stroke: grid, width: 1 }, ticks: { stroke: grid, width: 1 },
            values: (_u, splits) => splits.map((v) => formatNumber(v, Math.max(2, decimalsFor(splits)))),
          },
        ],
        series: [
          { label: 'Time', value: (_u, v) => (v === null ? '' : `${formatNumber(v, 1)} s`) },
          { label: 'β', scale: 'beta', stroke: resolveColor(host, '--tw-series-1'), width: 2, points: { show: false }, value: (_u, v) => (v === null || v === undefined ? '' : formatNumber(v, 4)) },
        ],
      },
      this.data(),
      host,
    );
    if (typeof ResizeObserver !== 'undefined') {
      this.observer = new ResizeObserver(() => {
        const width = Math.max(host.clientWidth, 200);
        if (this.plot && this.plot.width !== width) this.plot.setSize({ width, height: HEIGHT });
      });
      this.observer.observe(host);
    }
  }
}
