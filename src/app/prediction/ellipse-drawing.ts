import type { CameraEllipse } from '../../../shared/live/live-state';

/** Exaggeration factors the panel offers; 10 makes a 2 % deformation a clearly visible 20 %. */
export const EXAGGERATION_FACTORS = [1, 5, 10, 20] as const;
export const DEFAULT_EXAGGERATION = 10;

/**
 * A deformation larger than this (aspect − 1) is shown with its true shape: it is set mostly by
 * the trap (an in-situ cloud in an anisotropic trap), and enlarging it would only mislead.
 */
export const TRUE_SHAPE_ABOVE = 0.1;

/** An ellipse ready for SVG: semi-axes in drawing units and the rotation SVG applies. */
export interface DrawnEllipse {
  /** Semi-axis along the rotated drawing x, i.e. the major axis. */
  rx: number;
  ry: number;
  /** SVG `rotate()` angle, degrees (clockwise on screen, because SVG y points down). */
  rotateDeg: number;
  /** Aspect ratio as drawn (≥ 1). */
  drawnAspect: number;
  /** Factor applied to (aspect − 1); 1 when drawn to its true shape. */
  factor: number;
}

/**
 * Aspect ratio after multiplying the deformation (aspect − 1) by `factor`:
 * 1.02 at ×10 becomes 1.2. The angle is never changed.
 */
export function exaggerateAspect(aspect: number, factor: number): number {
  return 1 + factor * (aspect - 1);
}

/** The factor a panel uses: the chosen one for small deformations, 1 (true shape) for large ones. */
export function factorFor(aspect: number, chosen: number): number {
  return aspect - 1 > TRUE_SHAPE_ABOVE ? 1 : chosen;
}

/**
 * Drawing of a camera ellipse with its major semi-axis `radius` drawing units long. The camera's
 * u axis points right and v up; the major-axis angle is measured from u towards v
 * (docs/physics.md §6.1), so on screen, where SVG y points down, it is a rotation by −angle.
 * A round ellipse (no angle) is drawn as a circle.
 */
export function drawEllipse(ellipse: CameraEllipse, chosenFactor: number, radius: number): DrawnEllipse {
  const aspect = ellipse.minor > 0 ? ellipse.major / ellipse.minor : 1;
  const factor = factorFor(aspect, chosenFactor);
  const drawnAspect = Math.max(1, exaggerateAspect(aspect, factor));
  const angle = ellipse.majorAngleDeg ?? 0;
  return { rx: radius, ry: radius / drawnAspect, rotateDeg: angle === 0 ? 0 : -angle, drawnAspect, factor };
}

/** Screen point (SVG units, y down) of a camera-plane vector (u, v) scaled by `length`. */
export function cameraToScreen(u: number, v: number, length: number): { x: number; y: number } {
  return { x: u * length, y: v === 0 ? 0 : -v * length };
}
