import {
  ChangeDetectionStrategy, Component, DestroyRef, ElementRef, afterNextRender, afterRenderEffect, computed, inject, input, signal, viewChild,
} from '@angular/core';
import { formatQuantity } from '../readout/format-quantity';
import type { ColorScale } from './color-scale';
import type { ComputedMap } from './map-computation';
import { cellAtPixel, moveCell, nearestCell, paintMap, type MapCell } from './map-grid';
import { mapValueText } from './map-value-text';

/** The present field direction to mark, and which frame its angles are in. */
export interface PresentDirection {
  thetaDeg: number;
  phiDeg: number;
}

/** The magic angle arccos(1/√3), degrees (physics.md §7(d)), and its mirror below the equator. */
const MAGIC_DEG = (Math.acos(1 / Math.sqrt(3)) * 180) / Math.PI;
const MAGIC_LINES = [MAGIC_DEG, 180 - MAGIC_DEG];
const THETA_TICKS = [0, 45, 90, 135, 180];
const PHI_TICKS = [0, 90, 180, 270, 360];

/**
 * An orientation map drawn as an equirectangular image (θ 0…180° down, φ 0…360° across) on a
 * canvas, with the magic-angle circles, the present direction (and its equivalent −B), and a
 * cursor that follows the pointer or the arrow keys and reads out the value under it.
 */
@Component({
  selector: 'tw-map-view',
  templateUrl: './map-view.html',
  styleUrl: './map-view.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MapView {
  readonly map = input.required<ComputedMap>();
  readonly scale = input.required<ColorScale>();
  readonly present = input<PresentDirection | null>(null);
  /** A planned path to draw over the map (directions in the map's frame), start to end. */
  readonly path = input<readonly PresentDirection[]>([]);

  private readonly canvas = viewChild.required<ElementRef<HTMLCanvasElement>>('canvas');
  private readonly pixelSize = signal({ width: 0, height: 0 });

  protected readonly thetaTicks = THETA_TICKS.map((deg) => ({ deg, top: (100 * deg) / 180 }));
  protected readonly phiTicks = PHI_TICKS.map((deg) => ({ deg, left: (100 * deg) / 360 }));
  protected readonly magicLines = MAGIC_LINES.map((deg) => ({ deg, top: (100 * deg) / 180 }));

  /** Node under the pointer or chosen with the keys; null when neither. */
  protected readonly cursor = signal<MapCell | null>(null);
  /** Pointer position in CSS px inside the plot, for the tooltip; null for the keyboard cursor. */
  protected readonly pointer = signal<{ x: number; y: number; flip: boolean } | null>(null);

  protected readonly stepDeg = computed(() => 180 / (this.map().thetaDeg.length - 1));

  protected readonly presentMarks = computed(() => {
    const p = this.present();
    if (!p) return null;
    const at = (theta: number, phi: number) => ({ left: (100 * (((phi % 360) + 360) % 360)) / 360, top: (100 * theta) / 180 });
    return { main: at(p.thetaDeg, p.phiDeg), mirror: at(180 - p.thetaDeg, p.phiDeg + 180) };
  });

  /** The path as polylines in percent of the plot, split where it crosses φ = 0°/360°. */
  protected readonly pathLines = computed(() => {
    const lines: string[] = [];
    let current: string[] = [];
    let lastPhi: number | null = null;
    for (const p of this.path()) {
      const phi = ((p.phiDeg % 360) + 360) % 360;
      if (lastPhi !== null && Math.abs(phi - lastPhi) > 180) {
        if (current.length > 1) lines.push(current.join(' '));
        current = [];
      }
      current.push(`${((100 * phi) / 360).toFixed(3)},${((100 * p.thetaDeg) / 180).toFixed(3)}`);
      lastPhi = phi;
    }
    if (current.length > 1) lines.push(current.join(' '));
    const all = this.path();
    const end = all.at(-1);
    return { lines, end: end ? { left: (100 * (((end.phiDeg % 360) + 360) % 360)) / 360, top: (100 * end.thetaDeg) / 180 } : null };
  });

  protected readonly cursorBox = computed(() => {
    const c = this.cursor();
    if (!c) return null;
    const step = this.stepDeg();
    return { left: (100 * (c.phiDeg - step / 2)) / 360, top: (100 * (c.thetaDeg - step / 2)) / 180, width: (100 * step) / 360, height: (100 * step) / 180 };
  });

  protected readonly cursorText = computed(() => {
    const c = this.cursor();
    return c ? this.describe(c) : null;
  });

  /** The present direction itself, then the value of the grid point nearest to it. */
  protected readonly presentText = computed(() => {
    const p = this.present();
    if (!p) return null;
    const phi = ((p.phiDeg % 360) + 360) % 360;
    return `θ ${formatQuantity(p.thetaDeg, '°', 1)}, φ ${formatQuantity(phi, '°', 1)}; nearest grid point ${this.describe(nearestCell(this.map(), p.thetaDeg, p.phiDeg))}`;
  });

  constructor() {
    let observer: ResizeObserver | null = null;
    afterNextRender(() => {
      const canvas = this.canvas().nativeElement;
      const measure = () => {
        const ratio = window.devicePixelRatio || 1;
        this.pixelSize.set({ width: Math.round(canvas.clientWidth * ratio), height: Math.round(canvas.clientHeight * ratio) });
      };
      measure();
      if (typeof ResizeObserver !== 'undefined') {
        observer = new ResizeObserver(() => measure());
        observer.observe(canvas);
      }
    });
    inject(DestroyRef).onDestroy(() => observer?.disconnect());
    afterRenderEffect(() => this.paint());
  }

  protected followPointer(event: PointerEvent): void {
    const target = event.currentTarget as HTMLElement;
    const rect = target.getBoundingClientRect();
    const x = event.clientX - rect.left;
    const y = event.clientY - rect.top;
    if (rect.width <= 0 || rect.height <= 0) return;
    this.cursor.set(cellAtPixel(this.map(), x, y, rect.width, rect.height));
    this.pointer.set({ x, y, flip: x > rect.width / 2 });
  }

  protected leavePointer(): void {
    this.pointer.set(null);
    this.cursor.set(null);
  }

  /** Arrow keys move by one grid step (Shift: five), Home jumps to the present direction. */
  protected moveCursorWithKeys(event: KeyboardEvent): void {
    const map = this.map();
    const n = event.shiftKey ? 5 : 1;
    const moves: Record<string, [number, number]> = { ArrowUp: [-n, 0], ArrowDown: [n, 0], ArrowLeft: [0, -n], ArrowRight: [0, n] };
    const from = this.cursor() ?? this.startCell();
    let next: MapCell | null = null;
    if (event.key in moves) next = this.cursor() ? moveCell(map, from, ...moves[event.key]) : from;
    else if (event.key === 'Home') next = this.startCell();
    else if (event.key === 'Escape') this.cursor.set(null);
    if (next === null) return;
    event.preventDefault();
    this.pointer.set(null);
    this.cursor.set(next);
  }

  private startCell(): MapCell {
    const p = this.present();
    return nearestCell(this.map(), p?.thetaDeg ?? 90, p?.phiDeg ?? 0);
  }

  private describe(cell: MapCell): string {
    const { settings } = this.map();
    return `θ ${formatQuantity(cell.thetaDeg, '°', 1)}, φ ${formatQuantity(cell.phiDeg, '°', 1)}: ${mapValueText(cell.value, settings.quantity, this.scale())}`;
  }

  private paint(): void {
    const { width, height } = this.pixelSize();
    const map = this.map();
    const scale = this.scale();
    const canvas = this.canvas().nativeElement;
    if (width <= 0 || height <= 0) return;
    canvas.width = width;
    canvas.height = height;
    const context = canvas.getContext('2d');
    if (!context || typeof context.createImageData !== 'function') return;
    const image = context.createImageData(width, height);
    paintMap(map, map.settings.quantity, scale, image);
    context.putImageData(image, 0, 0);
  }
}
