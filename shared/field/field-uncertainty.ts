import type { CalibrationBody } from './calibration.js';
import { ZERO_FIELD_GAUSS, fieldVector, type Vec3 } from './field-vector.js';

/** One standard deviation of the live field's magnitude and angles from the calibration's uncertainty. */
export interface FieldUncertainty {
  /** σ|B|, G. */
  magnitudeGauss: number;
  /** σθ, degrees; null when the direction is undefined (|B| ≈ 0). */
  thetaDeg: number | null;
  /** σφ, degrees; null when φ is undefined (field along the trap z axis). */
  phiDeg: number | null;
}

const DEG = 180 / Math.PI;

/**
 * First-order propagation of the calibration's parameter covariance Σ (12×12 over K row-major
 * and B0, coil frame) to the field at the given currents: Σ_B = G·Σ·Gᵀ with G = ∂B_trap/∂p,
 * ∂B/∂K_ij = R·e_i·I_j and ∂B/∂B0_i = R·e_i; then σ² = gᵀ·Σ_B·g with g the gradient of |B|,
 * θ = acos(B_z/|B|) or φ = atan2(B_y, B_x) with respect to B. Current noise is not included.
 */
export function fieldUncertainty(cal: CalibrationBody, covariance: readonly (readonly number[])[], currentA: Vec3): FieldUncertainty {
  const b = fieldVector(cal, currentA);
  const i = [currentA.x, currentA.y, currentA.z];
  const r = cal.coilToTrap;
  // G: 3×12, row-major. Plain loops: history computes this for thousands of points per request.
  const g = new Float64Array(36);
  for (let row = 0; row < 3; row++) {
    for (let c = 0; c < 3; c++) {
      for (let j = 0; j < 3; j++) g[row * 12 + c * 3 + j] = r[row][c] * i[j];
      g[row * 12 + 9 + c] = r[row][c];
    }
  }
  // Σ_B = G·Σ·Gᵀ (3×3).
  const sigmaB = [new Float64Array(3), new Float64Array(3), new Float64Array(3)];
  for (let p = 0; p < 3; p++) {
    for (let k = 0; k < 12; k++) {
      const gpk = g[p * 12 + k];
      if (gpk === 0) continue;
      const covRow = covariance[k];
      for (let l = 0; l < 12; l++) {
        const w = gpk * covRow[l];
        if (w === 0) continue;
        for (let q = 0; q < 3; q++) sigmaB[p][q] += w * g[q * 12 + l];
      }
    }
  }
  const quad = (v: number[]) => {
    let sum = 0;
    for (let p = 0; p < 3; p++) for (let q = 0; q < 3; q++) sum += v[p] * sigmaB[p][q] * v[q];
    return Math.sqrt(Math.max(0, sum));
  };

  const m = Math.hypot(b.x, b.y, b.z);
  if (!(m > ZERO_FIELD_GAUSS)) {
    // At zero field every direction is equally possible: report the size of the field scatter only.
    return { magnitudeGauss: Math.sqrt(Math.max(0, sigmaB[0][0] + sigmaB[1][1] + sigmaB[2][2])), thetaDeg: null, phiDeg: null };
  }
  const rho2 = b.x * b.x + b.y * b.y;
  const rho = Math.sqrt(rho2);
  const magnitudeGauss = quad([b.x / m, b.y / m, b.z / m]);
  // ∂θ/∂B = (B_x·B_z, B_y·B_z, −ρ²)/(|B|²·ρ); ∂φ/∂B = (−B_y, B_x, 0)/ρ².
  if (!(rho > ZERO_FIELD_GAUSS * 1e-3)) return { magnitudeGauss, thetaDeg: (Math.sqrt(sigmaB[0][0] + sigmaB[1][1]) / m) * DEG, phiDeg: null };
  const thetaDeg = quad([(b.x * b.z) / (m * m * rho), (b.y * b.z) / (m * m * rho), -rho / (m * m)]) * DEG;
  const phiDeg = quad([-b.y / rho2, b.x / rho2, 0]) * DEG;
  return { magnitudeGauss, thetaDeg, phiDeg };
}
