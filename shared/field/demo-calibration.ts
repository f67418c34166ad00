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
