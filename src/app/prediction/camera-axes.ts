import type { ImagingInput } from '../../../shared/physics/tof';
import { imagingPlane } from '../../../shared/physics/tof';

/** The camera of a sample profile, described for the drawing. */
export interface CameraAxes {
  /** In-plane unit vectors in the trap frame: u horizontal (right), v vertical (up). */
  u: [number, number, number];
  v: [number, number, number];
  /** e.g. "u = x, v = z (imaging along y)". */
  label: string;
  /** Short names of the axes for the drawing, e.g. "x" and "z", or "u" and "v" for tilted cameras. */
  uName: string;
  vName: string;
}

const NAMED_TEXT = {
  x: { uName: 'y', vName: 'z' },
  y: { uName: 'x', vName: 'z' },
  z: { uName: 'x', vName: 'y' },
} as const;

/**
 * The camera axes of an imaging geometry (docs/physics.md §6.1): a named line of sight, or the
 * profile's own u and v vectors. Null when the geometry cannot be resolved, e.g. a custom
 * camera whose vectors the caller does not have.
 */
export function cameraAxes(imaging: ImagingInput | string | null | undefined): CameraAxes | null {
  if (imaging === null || imaging === undefined) return null;
  if (typeof imaging === 'string') {
    if (imaging !== 'x' && imaging !== 'y' && imaging !== 'z') return null;
    const { u, v } = imagingPlane(imaging);
    const names = NAMED_TEXT[imaging];
    return { u, v, ...names, label: `u = ${names.uName}, v = ${names.vName} (imaging along ${imaging})` };
  }
  const { u, v } = imagingPlane(imaging);
  return { u, v, uName: 'u', vName: 'v', label: `u = ${vectorText(u)}, v = ${vectorText(v)} (trap frame)` };
}

/**
 * The field axis seen by the camera: components of the unit field direction (θ, φ in the
 * trap frame, degrees) along u and v. Its length is the sine of the angle between the field and
 * the line of sight; 0 when the field points along the line of sight.
 */
export function projectedField(thetaDeg: number, phiDeg: number, axes: Pick<CameraAxes, 'u' | 'v'>): { u: number; v: number } {
  const t = (thetaDeg * Math.PI) / 180;
  const p = (phiDeg * Math.PI) / 180;
  const e = [Math.sin(t) * Math.cos(p), Math.sin(t) * Math.sin(p), Math.cos(t)];
  const dot = (w: readonly number[]) => e[0] * w[0] + e[1] * w[1] + e[2] * w[2];
  return { u: dot(axes.u), v: dot(axes.v) };
}

function vectorText(w: readonly number[]): string {
  return `(${w.map((c) => Number(c.toFixed(3)).toString().replace('-', '\u2212')).join(', ')})`;
}
