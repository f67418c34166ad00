import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { LivePrediction } from '../../../shared/live/live-state';
import { formatNumber } from '../readout/format-quantity';
import { projectedField, type CameraAxes } from './camera-axes';
import { cameraToScreen, drawEllipse } from './ellipse-drawing';

type Camera = NonNullable<LivePrediction['camera']>;

/** Width of one of the three views in SVG units; the view box is three views wide. */
const VIEW = 160;
/** Major semi-axis of every drawn ellipse, SVG units: each view has its own unit (µm or µm⁻¹). */
const RADIUS = 46;
/** Centre height of the ellipses. */
const CY = 86;
/** Half length of the field-axis line through the centre, SVG units, for a field in the image plane. */
const FIELD_HALF = 52;

interface SketchView {
  key: string;
  title: string;
  x: number;
  rx: number;
  ry: number;
  transform: string;
  factorText: string;
  sizeText: string;
}

/**
 * The in-situ cloud, the momentum distribution and the cloud after flight as the profile's
 * camera sees them (u right, v up), with the field axis projected onto the image. Small
 * deformations are drawn with (aspect − 1) multiplied by `factor`, and each view says so;
 * large ones (a cloud shaped by the trap) are drawn to their true shape.
 */
@Component({
  selector: 'tw-camera-sketch',
  templateUrl: './camera-sketch.html',
  styleUrl: './camera-sketch.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CameraSketch {
  readonly camera = input.required<Camera>();
  /** Camera axes; without them the field axis is not drawn and the axes are called u and v. */
  readonly axes = input<CameraAxes | null>(null);
  /** Field direction of the prediction (trap frame), degrees. */
  readonly thetaDeg = input.required<number>();
  readonly phiDeg = input.required<number>();
  /** Chosen exaggeration of (aspect − 1). */
  readonly factor = input.required<number>();

  protected readonly width = 3 * VIEW;
  protected readonly cy = CY;
  protected readonly half = VIEW / 2;
  protected readonly uName = computed(() => this.axes()?.uName ?? 'u');
  protected readonly vName = computed(() => this.axes()?.vName ?? 'v');
  protected readonly cameraLabel = computed(() => this.axes()?.label ?? `camera ${this.camera().imaging}`);

  protected readonly views = computed<SketchView[]>(() => {
    const camera = this.camera();
    const items = [
      { key: 'in-situ', title: 'In situ', ellipse: camera.inSituUm, unit: 'µm' },
      { key: 'momentum', title: 'Momentum', ellipse: camera.momentumPerUm, unit: 'µm⁻¹' },
      { key: 'tof', title: `After ${formatNumber(camera.tofMs, 0)} ms flight`, ellipse: camera.tofUm, unit: 'µm' },
    ];
    return items.map((item, i) => {
      const drawn = drawEllipse(item.ellipse, this.factor(), RADIUS);
      const x = i * VIEW + VIEW / 2;
      return {
        key: item.key,
        title: item.title,
        x,
        rx: drawn.rx,
        ry: drawn.ry,
        transform: `translate(${x} ${CY}) rotate(${drawn.rotateDeg.toFixed(2)})`,
        factorText: drawn.factor === 1 ? 'true shape' : `deformation ×${drawn.factor}`,
        sizeText: `${sizeNumber(item.ellipse.major)} × ${sizeNumber(item.ellipse.minor)} ${item.unit}`,
      };
    });
  });

  /** The field axis (±B) through each view's centre, or null when the camera is not known. */
  protected readonly fieldLine = computed(() => {
    const axes = this.axes();
    if (!axes) return null;
    const p = projectedField(this.thetaDeg(), this.phiDeg(), axes);
    const inPlane = Math.hypot(p.u, p.v);
    // Field (nearly) along the line of sight: no axis to draw, say so instead.
    if (inPlane < 0.05) return { along: true, x2: 0, y2: 0, label: { x: 0, y: 0 }, inPlane };
    // B and −B are equivalent: label the upper end (the right one when level), where it
    // stays clear of the texts under the ellipse.
    const sign = p.v < 0 || (p.v === 0 && p.u < 0) ? -1 : 1;
    const end = cameraToScreen(p.u, p.v, FIELD_HALF);
    // The label sits just beyond the drawn end, so a short (foreshortened) axis keeps its name.
    const beyond = 1 + 9 / (FIELD_HALF * inPlane);
    const label = cameraToScreen(sign * p.u * beyond, sign * p.v * beyond, FIELD_HALF);
    return { along: false, x2: end.x, y2: end.y, label, inPlane };
  });

  protected readonly description = computed(() => {
    const parts = this.views().map((v) => `${v.title}: ${v.sizeText} semi-axes, drawn with ${v.factorText}`);
    return `Camera view, ${this.cameraLabel()}. ${parts.join('; ')}.`;
  });
}

/** Three significant digits: radii range from fractions of a µm⁻¹ to hundreds of µm. */
function sizeNumber(value: number): string {
  if (!Number.isFinite(value)) return '—';
  const digits = Math.max(0, 2 - Math.floor(Math.log10(Math.abs(value) || 1)));
  return formatNumber(value, Math.min(digits, 3));
}
