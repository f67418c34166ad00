import { describe, expect, it } from 'vitest';
import { demagnetisationFactors, ellipsoidAnisotropy, spheroidAnisotropy } from './anisotropy.js';

const IDENTITY = [1, 0, 0, 0, 1, 0, 0, 0, 1];
const scratch = new Float64Array(3);
const MAGIC_ANGLE = Math.acos(1 / Math.sqrt(3));

/** Spheroid with aspect κ = a⊥/a∥ whose symmetry axis (third column) is tilted by `tilt` from z in the xz plane. */
function tiltedSpheroid(kappa: number, tilt: number): { a2: number[]; axes: number[] } {
  const c = Math.cos(tilt);
  const s = Math.sin(tilt);
  // Columns: (cos, 0, −sin), (0, 1, 0), (sin, 0, cos).
  return { a2: [kappa * kappa, kappa * kappa, 1], axes: [c, 0, s, 0, 1, 0, -s, 0, c] };
}

describe('spheroidAnisotropy', () => {
  it('has the limits f(0) = 1, f(1) = 0, f(∞) = −2', () => {
    // PRA 71, 033618 (2005); Rep. Prog. Phys. 72, 126401 (2009) (from memory): needle → 1,
    // sphere → 0, disc normal to e → −2.
    expect(spheroidAnisotropy(0)).toBe(1);
    expect(spheroidAnisotropy(1)).toBe(0);
    expect(spheroidAnisotropy(Infinity)).toBe(-2);
    expect(spheroidAnisotropy(1e-8)).toBeCloseTo(1, 12);
    expect(spheroidAnisotropy(1e8)).toBeCloseTo(-2, 7);
  });

  it('matches the reference values of the closed form', () => {
    // Independent implementation (docs/physics.md [I]), §7(b).
    const table: [number, number][] = [
      [0.2, 0.832537090593],
      [0.5, 0.479308007398],
      [0.9, 0.082932876371],
      [1.5, -0.337716682348],
      [3, -0.906166669568],
      [10, -1.582412829583],
    ];
    for (const [kappa, f] of table) expect(Math.abs(spheroidAnisotropy(kappa) - f)).toBeLessThan(1e-11);
  });

  it('stays accurate on both sides of the switch between the series and the closed form', () => {
    // The switch sits at |1 − κ²| = 0.05; the Carlson route (no switch) is the reference.
    for (const x of [0.05, -0.05]) {
      for (const kappa of [Math.sqrt(1 - x) * (1 - 1e-9), Math.sqrt(1 - x) * (1 + 1e-9)]) {
        const viaCarlson = ellipsoidAnisotropy([kappa * kappa, kappa * kappa, 1], IDENTITY, [0, 0, 1], scratch);
        expect(Math.abs(spheroidAnisotropy(kappa) - viaCarlson)).toBeLessThan(1e-14);
      }
    }
  });

  it('has slope −4/5 at the sphere, where the series is used', () => {
    // First series term 6x/15 with x = 1 − κ² ≈ −2(κ − 1): f ≈ −(4/5)(κ − 1) (docs/physics.md §2.2).
    const d = 1e-6;
    expect((spheroidAnisotropy(1 + d) - spheroidAnisotropy(1 - d)) / (2 * d)).toBeCloseTo(-0.8, 9);
  });

  it('returns NaN for a negative or NaN aspect', () => {
    expect(spheroidAnisotropy(-1)).toBeNaN();
    expect(spheroidAnisotropy(NaN)).toBeNaN();
  });
});

describe('demagnetisationFactors', () => {
  it('reproduces the reference factors of the (1, 2, 3) ellipsoid and sums to one', () => {
    // Independent implementation (docs/physics.md [I]), §7(b).
    const d = new Float64Array(3);
    demagnetisationFactors([1, 4, 9], d);
    expect(d[0]).toBeCloseTo(0.57654526, 8);
    expect(d[1]).toBeCloseTo(0.26715404, 8);
    expect(d[2]).toBeCloseTo(0.1563007, 8);
    expect(d[0] + d[1] + d[2]).toBeCloseTo(1, 14);
  });

  it('gives 1/3 each for a sphere of any size', () => {
    const d = new Float64Array(3);
    for (const r2 of [1e-12, 1, 1e12]) {
      demagnetisationFactors([r2, r2, r2], d);
      for (const v of d) expect(v).toBeCloseTo(1 / 3, 15);
    }
  });
});

describe('ellipsoidAnisotropy', () => {
  it('agrees with the spheroid closed form from κ = 1e-3 to 1e3', () => {
    // docs/physics.md §2.2: closed form + series and the Carlson route agree to 1e-11 [I].
    const e = [0, 0, 1];
    for (let k = -3; k <= 3; k += 0.25) {
      const kappa = 10 ** k;
      const f = ellipsoidAnisotropy([kappa * kappa, kappa * kappa, 1], IDENTITY, e, scratch);
      expect(Math.abs(f - spheroidAnisotropy(kappa))).toBeLessThan(1e-11);
    }
  });

  it('vanishes for any spheroid tilted by the magic angle from e', () => {
    // 3cos²θ_m − 1 = 0 at θ_m = arccos(1/√3) = 54.7356103172° (docs/physics.md §7(d)):
    // f = 1 − 3[D∥cos²θ + D⊥sin²θ] with D⊥ = (1 − D∥)/2 is then zero for every shape.
    expect((MAGIC_ANGLE * 180) / Math.PI).toBeCloseTo(54.7356103172, 9);
    for (const kappa of [0.1, 0.6, 2, 8]) {
      const { a2, axes } = tiltedSpheroid(kappa, MAGIC_ANGLE);
      expect(Math.abs(ellipsoidAnisotropy(a2, axes, [0, 0, 1], scratch))).toBeLessThan(1e-14);
    }
  });

  it('is positive for a cloud stretched along e and negative for one squeezed along it', () => {
    // Sign convention of docs/physics.md §2.2.
    expect(ellipsoidAnisotropy([1, 1, 4], IDENTITY, [0, 0, 1], scratch)).toBeGreaterThan(0);
    expect(ellipsoidAnisotropy([4, 4, 1], IDENTITY, [0, 0, 1], scratch)).toBeLessThan(0);
  });

  it('is unchanged under e → −e', () => {
    const { a2, axes } = tiltedSpheroid(0.4, 0.3);
    const e = [0.2, 0.5, Math.sqrt(1 - 0.29)];
    const f = ellipsoidAnisotropy(a2, axes, e, scratch);
    expect(ellipsoidAnisotropy(a2, axes, e.map((c) => -c), scratch)).toBe(f);
  });
});
