import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { formatQuantity } from '../readout/format-quantity';

interface Point {
  x: number;
  y: number;
}

/** Glyph radius in SVG units (the view box is 220 × 220 around the origin). */
const R = 80;
const DEG = Math.PI / 180;

/**
 * Oblique drawing of the trap frame: x comes towards the viewer down-left, y runs right, z up.
 * Chosen so that no two axes overlap for any field direction worth looking at.
 */
function project(x: number, y: number, z: number): Point {
  return { x: R * (-0.5 * x + 0.92 * y), y: R * (0.34 * x + 0.16 * y - 0.93 * z) };
}

function unit(thetaDeg: number, phiDeg: number): [number, number, number] {
  const t = thetaDeg * DEG;
  const p = phiDeg * DEG;
  return [Math.sin(t) * Math.cos(p), Math.sin(t) * Math.sin(p), Math.cos(t)];
}

function path(points: Point[]): string {
  return points.map((p, i) => `${i ? 'L' : 'M'}${p.x.toFixed(1)} ${p.y.toFixed(1)}`).join(' ');
}

/** Points of a 3-D curve, projected; `at(s)` for s in [0, 1]. */
function curve(at: (s: number) => [number, number, number], steps = 32): Point[] {
  return Array.from({ length: steps + 1 }, (_, i) => project(...at(i / steps)));
}

/**
 * The field direction in the trap frame as an SVG drawing: the three axes, the xy plane, the
 * unit vector along B with its projection onto the xy plane, and arcs for θ (from z) and φ
 * (from x towards y). Without a direction (|B| ≈ 0, or no data) only the frame is drawn.
 */
@Component({
  selector: 'tw-direction-glyph',
  templateUrl: './direction-glyph.html',
  styleUrl: './direction-glyph.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '[class.stale]': 'stale()' },
})
export class DirectionGlyph {
  /** Polar angle from trap z, degrees; null when undefined. */
  readonly thetaDeg = input<number | null>(null);
  /** Azimuth from trap x towards y, degrees; null when undefined. */
  readonly phiDeg = input<number | null>(null);
  readonly stale = input(false);

  protected readonly axes = (['x', 'y', 'z'] as const).map((name, i) => {
    const along = (k: number) => project(...([0, 1, 2].map((j) => (j === i ? k : 0)) as [number, number, number]));
    return { name, plus: along(1.2), minus: along(-1), label: along(1.4) };
  });

  protected readonly equator = path(curve((s) => [Math.cos(2 * Math.PI * s), Math.sin(2 * Math.PI * s), 0], 72)) + ' Z';

  protected readonly drawing = computed(() => {
    const theta = this.thetaDeg();
    const phi = this.phiDeg();
    if (theta === null || phi === null) return null;
    const [ux, uy, uz] = unit(theta, phi);
    const tip = project(ux, uy, uz);
    const foot = project(ux, uy, 0);
    const thetaArc = curve((s) => [0.42 * Math.sin(s * theta * DEG) * Math.cos(phi * DEG), 0.42 * Math.sin(s * theta * DEG) * Math.sin(phi * DEG), 0.42 * Math.cos(s * theta * DEG)]);
    const phiArc = curve((s) => [0.32 * Math.cos(s * phi * DEG), 0.32 * Math.sin(s * phi * DEG), 0]);
    const thetaLabel = project(...(unitScaled(unit(theta / 2, phi), 0.58)));
    const phiLabel = project(0.5 * Math.cos((phi / 2) * DEG), 0.5 * Math.sin((phi / 2) * DEG), 0);
    const angle = Math.atan2(tip.y, tip.x);
    const head = [
      tip,
      { x: tip.x - 11 * Math.cos(angle - 0.4), y: tip.y - 11 * Math.sin(angle - 0.4) },
      { x: tip.x - 11 * Math.cos(angle + 0.4), y: tip.y - 11 * Math.sin(angle + 0.4) },
    ];
    return {
      vector: path([{ x: 0, y: 0 }, tip]),
      head: path(head) + ' Z',
      shadow: path([{ x: 0, y: 0 }, foot]),
      drop: path([tip, foot]),
      thetaArc: path(thetaArc),
      phiArc: path(phiArc),
      thetaLabel,
      phiLabel,
      // Tiny transverse component: the projection and the φ arc would only be clutter.
      showAzimuth: Math.hypot(ux, uy) > 0.05,
    };
  });

  protected readonly description = computed(() => {
    const theta = this.thetaDeg();
    const phi = this.phiDeg();
    const base =
      theta === null || phi === null
        ? 'Field direction undefined'
        : `Field direction in the trap frame: θ ${formatQuantity(theta, '°', 1)}, φ ${formatQuantity(phi, '°', 1)}`;
    return this.stale() ? `${base} (stale)` : base;
  });
}

function unitScaled(v: [number, number, number], k: number): [number, number, number] {
  return [v[0] * k, v[1] * k, v[2] * k];
}
