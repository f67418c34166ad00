import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, afterNextRender, inject, input, viewChild } from '@angular/core';
import uPlot from 'uplot';
import { formatLocalTime, formatNumber } from '../readout/format-quantity';
import { chartFont, decimalsFor, plotSize, resolveColor } from './chart-style';
import { RingBuffer, WindowCopy } from './ring-buffer';
import { sampleSpacingMs } from './time-window';

/** One line of a chart: a column of the ring buffer drawn against a y scale. */
export interface ChartLine {
  /** Legend text. */
  label: string;
  column: number;
  /** Key of the `ChartAxis` it is drawn against. */
  scale: string;
  /** CSS custom property holding the stroke colour, e.g. `--tw-series-1`. */
  color: string;
  /** Canvas dash pattern, px; lines differ by dash as well as colour. */
  dash?: number[];
  /** Decimals of the value shown in the legend. */
  digits: number;
  /** A step larger than this between neighbours is a wrap, drawn as a break (azimuth 360° → 0°). */
  breakAbove?: number;
}

/** A y axis. */
export interface ChartAxis {
  scale: string;
  /** Axis title with unit, e.g. "Current (A)". */
  label: string;
  side: 'left' | 'right';
  /** Fixed range; auto-ranged from the visible data when absent. */
  range?: [number, number];
  /**
   * Auto-range from zero to a little above the largest value, so that noise on a steady
   * quantity (|B|) stays small instead of filling the chart.
   */
  fromZero?: boolean;
  /** Tick spacing for a fixed range, e.g. 90 for angles. */
  step?: number;
}

/**
 * A moment marked on the chart by a vertical line (the replay clock). Written outside change
 * detection, as often as wanted; the chart looks at it once per animation frame.
 */
export class TimeMarker {
  /** Unix epoch ms; NaN draws no line. */
  timeMs = Number.NaN;
}

/** Gaps in the data longer than this (or five sample spacings) are drawn as gaps, ms. */
const MIN_GAP_MS = 2000;

/**
 * A time-series chart over a sliding window, drawn by uPlot. It reads a `RingBuffer` once per
 * animation frame and redraws only when the buffer or the window changed; samples never pass
 * through Angular's change detection. Times on the axis are local.
 */
@Component({
  selector: 'tw-chart-panel',
  templateUrl: './chart-panel.html',
  styleUrl: './chart-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '[class.stale]': 'staleNote() !== null' },
})
export class ChartPanel {
  readonly caption = input.required<string>();
  readonly buffer = input.required<RingBuffer>();
  readonly lines = input.required<readonly ChartLine[]>();
  readonly axes = input.required<readonly ChartAxis[]>();
  readonly windowSeconds = input.required<number>();
  /** Set while the data is not current, e.g. "stale since 21:04:13". */
  readonly staleNote = input<string | null>(null);
  /** End of the window, Unix epoch ms; null follows the newest sample (live). */
  readonly endMs = input<number | null>(null);
  /** A moment to mark with a vertical line, e.g. the replay clock. */
  readonly marker = input<TimeMarker | null>(null);

  private readonly plotHost = viewChild.required<ElementRef<HTMLElement>>('plot');
  private plot: uPlot | null = null;
  private resizeObserver: ResizeObserver | null = null;
  private frameRequest = 0;
  private resizeRequest = 0;
  private drawnRevision = -1;
  private drawnWindowMs = 0;
  private drawnEndMs: number | null = null;
  private drawnMarkerMs = Number.NaN;
  private windowEndMs = Date.now();
  private readonly copy = new WindowCopy();
  private readonly lineValues: (number | null)[][] = [];

  constructor() {
    afterNextRender(() => this.create());
    inject(DestroyRef).onDestroy(() => this.destroy());
  }

  private create(): void {
    const host = this.plotHost().nativeElement;
    const color = (property: string) => resolveColor(host, property);
    const text = color('--tw-chart-text');
    const grid = color('--tw-chart-grid');
    const { font, rem } = chartFont();
    const lines = this.lines();
    const axes = this.axes();
    const scales: uPlot.Scales = {
      x: { time: true, range: () => [this.windowEndMs - this.windowSeconds() * 1000, this.windowEndMs] },
    };
    for (const axis of axes) {
      if (axis.range) scales[axis.scale] = { auto: false, range: axis.range };
      else if (axis.fromZero) scales[axis.scale] = { auto: true, range: (_u, min, max) => zeroBasedRange(min, max) };
      else scales[axis.scale] = { auto: true };
    }

    this.plot = new uPlot(
      {
        ...plotSize(host),
        ms: 1,
        scales,
        // Without an axis on the right, room for the half of the last time label that overhangs the plot.
        padding: [null, axes.some((axis) => axis.side !== 'left') ? null : Math.round(2.5 * rem), null, null],
        cursor: { drag: { x: false, y: false, setScale: false } },
        legend: { live: true },
        hooks: { draw: [(u) => this.drawMarker(u, color('--tw-chart-marker'))] },
        axes: [
          {
            stroke: text,
            font,
            grid: { stroke: grid, width: 1 },
            ticks: { stroke: grid, width: 1 },
            // Room for a whole "hh:mm:ss" and a gap between neighbours, also on narrow charts.
            space: Math.round(6 * rem),
            values: (_u, splits, _axis, _space, increment) =>
              splits.map((t) => (increment >= 60_000 ? formatLocalTime(t).slice(0, 5) : formatLocalTime(t))),
          },
          ...axes.map<uPlot.Axis>((axis, index) => ({
            scale: axis.scale,
            label: axis.label,
            side: axis.side === 'left' ? 3 : 1,
            stroke: text,
            font,
            labelFont: font,
            size: Math.round(3.5 * rem),
            grid: { show: index === 0, stroke: grid, width: 1 },
            ticks: { stroke: grid, width: 1 },
            ...(axis.step ? { incrs: [axis.step] } : {}),
            values: (_u, splits) => splits.map((v) => formatNumber(v, decimalsFor(splits))),
          })),
        ],
        series: [
          // Legend values appear while the pointer is over the chart and stay blank otherwise.
          { label: 'Time', value: (_u, t) => (t === null ? '' : formatLocalTime(t)) },
          ...lines.map<uPlot.Series>((line) => ({
            label: line.label,
            scale: line.scale,
            stroke: color(line.color),
            width: 1.5,
            dash: line.dash,
            points: { show: false },
            value: (_u, v) => (v === null || v === undefined ? '' : formatNumber(v, line.digits)),
          })),
        ],
      },
      [[], ...lines.map(() => [])],
      host,
    );
    drawLegendLines(this.plot.root, lines.map((line) => ({ color: color(line.color), dash: line.dash })));

    if (typeof ResizeObserver !== 'undefined') {
      // Resize in the next frame: resizing inside the observer callback changes the layout it
      // observes and the browser reports a loop.
      this.resizeObserver = new ResizeObserver(() => {
        cancelAnimationFrame(this.resizeRequest);
        this.resizeRequest = requestAnimationFrame(() => {
          const plot = this.plot;
          const size = plotSize(host);
          if (plot && (size.width !== plot.width || size.height !== plot.height)) plot.setSize(size);
        });
      });
      this.resizeObserver.observe(host);
    }
    const frame = () => {
      this.frameRequest = requestAnimationFrame(frame);
      this.draw();
    };
    this.frameRequest = requestAnimationFrame(frame);
  }

  /** Copies the window out of the ring buffer and hands it to uPlot, if anything changed. */
  private draw(): void {
    const plot = this.plot;
    const buffer = this.buffer();
    const windowMs = this.windowSeconds() * 1000;
    const endMs = this.endMs();
    if (!plot) return;
    if (buffer.revision === this.drawnRevision && windowMs === this.drawnWindowMs && endMs === this.drawnEndMs) {
      const markerMs = this.marker()?.timeMs ?? Number.NaN;
      if (!Object.is(markerMs, this.drawnMarkerMs)) plot.redraw(false, false);
      return;
    }
    this.drawnRevision = buffer.revision;
    this.drawnWindowMs = windowMs;
    this.drawnEndMs = endMs;
    this.windowEndMs = endMs ?? buffer.newestTime ?? Date.now();
    const n = buffer.copySince(this.windowEndMs - windowMs, this.copy);
    const times = this.copy.t;
    const gapMs = Math.max(MIN_GAP_MS, 5 * sampleSpacingMs(this.windowSeconds()));
    const columns: (number | null)[][] = this.lines().map((line, index) => {
      const source = this.copy.columns[line.column];
      const out = (this.lineValues[index] ??= []);
      out.length = n;
      for (let i = 0; i < n; i++) {
        const v = source[i];
        const broken =
          i > 0 && (times[i] - times[i - 1] > gapMs || (line.breakAbove !== undefined && Math.abs(v - source[i - 1]) > line.breakAbove));
        out[i] = Number.isNaN(v) || broken ? null : v;
      }
      return out;
    });
    plot.setData([times.subarray(0, n), ...columns]);
  }

  /** The marker's vertical line over the plotting area, after uPlot drew the series. */
  private drawMarker(u: uPlot, stroke: string): void {
    const markerMs = this.marker()?.timeMs ?? Number.NaN;
    this.drawnMarkerMs = markerMs;
    if (!Number.isFinite(markerMs)) return;
    const x = Math.round(u.valToPos(markerMs, 'x', true));
    const { left, top, width, height } = u.bbox;
    if (x < left || x > left + width) return;
    const ctx = u.ctx;
    ctx.save();
    ctx.strokeStyle = stroke;
    ctx.lineWidth = 2 * devicePixelRatio;
    ctx.setLineDash([]); // solid, unlike the dashed and dotted series drawn before it
    ctx.beginPath();
    ctx.moveTo(x, top);
    ctx.lineTo(x, top + height);
    ctx.stroke();
    ctx.restore();
  }

  private destroy(): void {
    cancelAnimationFrame(this.frameRequest);
    cancelAnimationFrame(this.resizeRequest);
    this.resizeObserver?.disconnect();
    this.plot?.destroy();
    this.plot = null;
  }
}

/** From zero (or the most negative value) to 25 % above the largest magnitude. */
function zeroBasedRange(min: number | null, max: number | null): uPlot.Range.MinMax {
  const low = Math.min(0, min ?? 0);
  const high = Math.max(0, max ?? 0) * 1.25;
  return high > low ? [low, high] : [0, 1];
}

/**
 * Turns uPlot's square legend markers into short line samples drawn like their series
 * (solid, dashed or dotted), so a reader who cannot tell the colours apart still matches
 * legend and line.
 */
function drawLegendLines(root: HTMLElement, lines: readonly { color: string; dash?: number[] }[]): void {
  const rows = root.querySelectorAll<HTMLElement>('.u-legend .u-series');
  lines.forEach((line, i) => {
    const marker = rows[i + 1]?.querySelector<HTMLElement>('.u-marker');
    if (!marker) return;
    const style = !line.dash ? 'solid' : line.dash[0] <= 2 ? 'dotted' : 'dashed';
    marker.style.cssText = `display:inline-block;width:28px;height:0;border:none;border-top:3px ${style} ${line.color};background:none;vertical-align:middle;margin-right:6px`;
    marker.dataset['line'] = style;
  });
}
