import type { SequenceStep } from '../../shared/steering/steering-api.js';

/** Magic angle arccos(1/√3) ≈ 54.74°, where P₂(cos θ) = (3 cos²θ − 1)/2 and with it the dipolar coupling along the field vanishes (textbook). */
const MAGIC_DEG = (Math.acos(1 / Math.sqrt(3)) * 180) / Math.PI;

/**
 * Two sequences of the fictional Lindqvist Hall lab (invented, demo only): a scan of the tilt
 * angle in the trap's x–z plane with a shot at each angle, and a check at the magic angle
 * with reference shots on either side.
 */
export const DEMO_SEQUENCES: { name: string; steps: SequenceStep[]; reason: string }[] = [
  {
    name: 'Tilt scan, x–z plane, 8 G',
    reason: 'Demo sequence of the Lindqvist Hall lab',
    steps: [0, 15, 30, 45, 60, 75, 90].flatMap((theta): SequenceStep[] => [
      { kind: 'ramp', magnitudeG: 8, thetaDeg: theta, phiDeg: 0, durationMs: 3000 },
      { kind: 'hold', durationMs: 2000 },
      { kind: 'shot', label: `θ = ${theta}°` },
    ]),
  },
  {
    name: 'Magic-angle check, 6 G',
    reason: 'Demo sequence of the Lindqvist Hall lab',
    steps: [
      { kind: 'ramp', magnitudeG: 6, thetaDeg: 0, phiDeg: 0, durationMs: 4000 },
      { kind: 'hold', durationMs: 2000 },
      { kind: 'shot', label: 'reference, field along z' },
      { kind: 'ramp', magnitudeG: 6, thetaDeg: Number(MAGIC_DEG.toFixed(2)), phiDeg: 0, durationMs: 4000 },
      { kind: 'hold', durationMs: 3000 },
      { kind: 'shot', label: 'magic angle' },
      { kind: 'ramp', magnitudeG: 6, thetaDeg: 90, phiDeg: 0, durationMs: 4000 },
      { kind: 'hold', durationMs: 2000 },
      { kind: 'shot', label: 'reference, field along x' },
    ],
  },
];
