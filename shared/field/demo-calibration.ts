import type { CalibrationBody } from './calibration.js';

/**
 * Demo calibration of the fictional Lindqvist Hall apparatus (invented data, demo only):
 * roughly 1.2 G/A per pair with a few per cent cross-talk, a small background field, and a
 * trap frame rotated by 15° about the coil z axis.
 */
const c = Math.cos((15 * Math.PI) / 180);
const s = Math.sin((15 * Math.PI) / 180);

export const DEMO_CALIBRATION: CalibrationBody = {
  gaussPerAmp: [
    [1.21, 0.03, -0.02],
    [0.02, 1.18, 0.04],
    [-0.01, 0.02, 1.25],
  ],
  offsetGauss: [0.012, -0.035, 0.21],
  coilToTrap: [
    [c, s, 0],
    [-s, c, 0],
    [0, 0, 1],
  ],
};

/**
 * Invented covariance of the demo calibration (demo only), 12×12 over K row-major (G/A) and B0
 * (G): standard errors of 2 mG/A on every K element and 4 mG on every B0 component, the
 * diagonal K elements 30 % correlated with the B0 component of their row, as a |B| fit with a
 * few tens of points at ±8 A would give.
 */
export const DEMO_COVARIANCE: number[][] = (() => {
  const out = Array.from({ length: 12 }, (_, i) => Array.from({ length: 12 }, (_, j) => (i !== j ? 0 : i < 9 ? 0.002 ** 2 : 0.004 ** 2)));
  for (let row = 0; row < 3; row++) {
    const k = row * 3 + row;
    const b = 9 + row;
    out[k][b] = out[b][k] = 0.3 * 0.002 * 0.004;
  }
  return out;
})();
