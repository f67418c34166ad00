import type { MagnitudePoint, Triple, VectorPoint } from '../calibration/fit/calibration-csv.js';

/** Synthetic calibration measurements with a known K (G/A) and B0 (G), for tests only. */
export interface TrueCoils {
  k: number[][];
  b0: Triple;
}

/** Deterministic pseudo-random numbers (mulberry32) so every run sees the same data. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviates by the Box–Muller transform. */
export function gaussian(random: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
}

/** Currents spread over ±`amps` on every pair, the pairs running together. */
export function spreadCurrents(count: number, amps: number, random: () => number): Triple[] {
  return Array.from({ length: count }, () => [0, 1, 2].map(() => (2 * random() - 1) * amps) as Triple);
}

export function trueField(coils: TrueCoils, current: Triple): Triple {
  return [0, 1, 2].map((i) => coils.b0[i] + coils.k[i][0] * current[0] + coils.k[i][1] * current[1] + coils.k[i][2] * current[2]) as Triple;
}

/** |B| at each current with Gaussian noise of `noiseGauss` (0 for exact data); line numbers from 2. */
export function magnitudePoints(coils: TrueCoils, currents: Triple[], noiseGauss: number | number[], normal: () => number, weighted = false): MagnitudePoint[] {
  return currents.map((currentA, n) => {
    const sigma = Array.isArray(noiseGauss) ? noiseGauss[n] : noiseGauss;
    return {
      line: n + 2,
      currentA,
      fieldGauss: Math.hypot(...trueField(coils, currentA)) + sigma * normal(),
      sigmaGauss: weighted ? sigma : null,
    };
  });
}

export function vectorPoints(coils: TrueCoils, currents: Triple[], noiseGauss: number, normal: () => number): VectorPoint[] {
  return currents.map((currentA, n) => ({
    line: n + 2,
    currentA,
    fieldGauss: trueField(coils, currentA).map((b) => b + noiseGauss * normal()) as Triple,
  }));
}
