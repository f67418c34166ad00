import * as z from 'zod/mini';

const row = () => z.tuple([z.number(), z.number(), z.number()]);
const matrix = () => z.tuple([row(), row(), row()]);

/**
 * A coil calibration: B_coil = K·I + B0 in the coil frame, then B_trap = R·B_coil.
 * K in G/A (row i = field component i, column j = coil pair j), B0 in G (background field,
 * coil frame), R the fixed rotation from the coil frame to the trap frame (orthonormal,
 * det +1). Versions are immutable once approved; exactly one is active.
 */
export const CalibrationBody = z.strictObject({
  gaussPerAmp: matrix(),
  offsetGauss: row(),
  coilToTrap: matrix(),
});
export type CalibrationBody = z.infer<typeof CalibrationBody>;

export interface Calibration extends CalibrationBody {
  id: number;
  version: number;
  label: string;
  /**
   * 12×12 covariance of the fitted numbers (K row-major, then B0; G²/A², G²/A, G²), coil
   * frame; null when unknown. The live field's σ|B|, σθ, σφ come from it (field-uncertainty.ts).
   */
  covariance?: number[][] | null;
}

/** Largest |RᵀR − 1| element tolerated before a rotation is called non-orthonormal. */
const ROTATION_TOLERANCE = 1e-6;

/** Throws an Error naming the problem when `r` is not a proper rotation matrix. */
export function assertRotation(r: CalibrationBody['coilToTrap']): void {
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      let dot = 0;
      for (let k = 0; k < 3; k++) dot += r[k][i] * r[k][j];
      if (Math.abs(dot - (i === j ? 1 : 0)) > ROTATION_TOLERANCE) {
        throw new Error(`coilToTrap is not orthonormal: column ${i}·column ${j} = ${dot}`);
      }
    }
  }
  const det =
    r[0][0] * (r[1][1] * r[2][2] - r[1][2] * r[2][1]) -
    r[0][1] * (r[1][0] * r[2][2] - r[1][2] * r[2][0]) +
    r[0][2] * (r[1][0] * r[2][1] - r[1][1] * r[2][0]);
  if (det < 0) throw new Error('coilToTrap is a reflection (determinant −1), not a rotation');
}
