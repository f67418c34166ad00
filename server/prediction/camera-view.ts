import type { CameraEllipse, LivePrediction } from '../../shared/live/live-state.js';
import type { Prediction, TofPrediction } from '../../shared/physics/predict.js';
import { imagingPlane, projectEllipse, type ImagingInput } from '../../shared/physics/tof.js';

/**
 * The three ellipses the live panel draws for the profile's camera (docs/physics.md §6.1), from a
 * stable prediction whose `tof` holds the in-situ image (t = 0) first and the profile's first
 * TOF time second:
 * in situ P·M_R·Pᵀ (µm), momentum P·M_K·Pᵀ (µm⁻¹) and after flight P·M(t)·Pᵀ (µm).
 * `e` is the unit field direction in the trap frame (the Fermi surface's long axis).
 */
export function cameraView(prediction: Prediction, e: readonly number[], imaging: ImagingInput): NonNullable<LivePrediction['camera']> {
  const { fermiSurface, tof } = prediction;
  if (!fermiSurface || !tof || tof.length < 2) throw new Error('cameraView needs a stable prediction with the in-situ and one TOF image');
  // Spheroidal Fermi surface: semi-axis K∥ along e, K⊥ across (docs/physics.md §3.1).
  const kPar2 = fermiSurface.kParallelPerUm ** 2;
  const kPerp2 = fermiSurface.kPerpPerUm ** 2;
  const mk = new Float64Array(9);
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) mk[3 * i + j] = (i === j ? kPerp2 : 0) + (kPar2 - kPerp2) * e[i] * e[j];
  const momentum = projectEllipse(mk, imagingPlane(imaging));
  return {
    imaging: imagingLabel(imaging),
    tofMs: tof[1].tMs,
    inSituUm: fromTof(tof[0]),
    momentumPerUm: { major: momentum.semiAxes[0], minor: momentum.semiAxes[1], majorAngleDeg: momentum.majorAngleDeg },
    tofUm: fromTof(tof[1]),
  };
}

function fromTof(image: TofPrediction): CameraEllipse {
  return { major: image.semiAxesUm[0], minor: image.semiAxesUm[1], majorAngleDeg: image.majorAngleDeg };
}

/** "y" for a named line of sight, otherwise the camera vectors, e.g. "u=(1, 0, 0) v=(0, 0.6, 0.8)". */
export function imagingLabel(imaging: ImagingInput): string {
  if (typeof imaging === 'string') return imaging;
  const vec = (w: number[]) => `(${w.map((c) => Number(c.toPrecision(4))).join(', ')})`;
  return `u=${vec(imaging.u)} v=${vec(imaging.v)}`;
}
