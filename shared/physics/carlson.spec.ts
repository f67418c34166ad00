import ellipe from '@stdlib/math-base-special-ellipe';
import ellipk from '@stdlib/math-base-special-ellipk';
import { describe, expect, it } from 'vitest';
import { carlsonRD } from './carlson.js';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('carlsonRD', () => {
  it('reproduces the published test values', () => {
    // Carlson, Numer. Algorithms 10, 13 (1995), arXiv:math/9409227, table of R_D test values.
    expect(rel(carlsonRD(0, 2, 1), 1.7972103521034)).toBeLessThan(1e-13);
    expect(rel(carlsonRD(2, 3, 4), 0.16510527294261)).toBeLessThan(1e-13);
  });

  it('equals x^(-3/2) when all three arguments are equal', () => {
    // DLMF 19.20.18: R_D(x, x, x) = x^(-3/2).
    for (const x of [1e-6, 0.3, 1, 7.5, 1e8]) expect(rel(carlsonRD(x, x, x), x ** -1.5)).toBeLessThan(1e-15);
  });

  it('satisfies the cyclic sum rule R_D(x,y,z) + R_D(y,z,x) + R_D(z,x,y) = 3/√(xyz)', () => {
    // DLMF 19.21.13; arguments spread over six decades, as met by strongly deformed clouds.
    for (const [x, y, z] of [[0.2, 1.5, 3.1], [1e-3, 1, 1e3], [4, 4, 0.01], [1e-2, 7, 2]]) {
      const sum = carlsonRD(x, y, z) + carlsonRD(y, z, x) + carlsonRD(z, x, y);
      expect(rel(sum, 3 / Math.sqrt(x * y * z))).toBeLessThan(1e-14);
    }
  });

  it('agrees with K(k) − E(k) = (k²/3) R_D(0, 1 − k², 1) using stdlib elliptic integrals', () => {
    // DLMF 19.25.1; K and E from @stdlib/math-base-special-ellipk / -ellipe, which take the
    // parameter m = k² (Fukushima 2015 minimax approximations, double precision).
    for (const m of [1e-4, 0.05, 0.3, 0.5, 0.75, 0.9, 0.99, 0.9999]) {
      const lhs = ellipk(m) - ellipe(m);
      const rhs = (m / 3) * carlsonRD(0, 1 - m, 1);
      // Tolerance: the subtraction K − E loses log10(K/(K−E)) digits near m = 0.
      expect(rel(rhs, lhs)).toBeLessThan(m < 0.01 ? 1e-11 : 1e-14);
    }
  });

  it('returns NaN outside its domain instead of a wrong number', () => {
    expect(carlsonRD(0, 0, 1)).toBeNaN();
    expect(carlsonRD(-1, 2, 3)).toBeNaN();
    expect(carlsonRD(1, 2, 0)).toBeNaN();
    expect(carlsonRD(NaN, 2, 3)).toBeNaN();
    expect(carlsonRD(1, Infinity, 3)).toBeNaN();
  });
});
