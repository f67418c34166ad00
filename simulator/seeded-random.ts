/**
 * Reproducible pseudo-random numbers for the measurement noise: mulberry32 (a public-domain
 * 32-bit generator, common practice for non-cryptographic simulation noise) with Gaussian
 * deviates by the Box–Muller transform. The same seed gives the same noise, so tests repeat.
 */
export class SeededRandom {
  private state: number;
  private spare: number | null = null;

  constructor(seed: number) {
    this.state = seed >>> 0;
  }

  /** Uniform deviate in [0, 1). */
  uniform(): number {
    this.state = (this.state + 0x6d2b79f5) >>> 0;
    let t = this.state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  /** Normal deviate with mean 0 and standard deviation `sigma`. */
  gaussian(sigma: number): number {
    if (this.spare !== null) {
      const value = this.spare;
      this.spare = null;
      return value * sigma;
    }
    const u = 1 - this.uniform(); // (0, 1]: keeps log finite
    const v = this.uniform();
    const radius = Math.sqrt(-2 * Math.log(u));
    this.spare = radius * Math.sin(2 * Math.PI * v);
    return radius * Math.cos(2 * Math.PI * v) * sigma;
  }
}
