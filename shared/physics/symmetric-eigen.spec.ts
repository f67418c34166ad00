import { describe, expect, it } from 'vitest';
import { symmetricEigen, symmetricEigen3 } from './symmetric-eigen.js';

/** max |V Λ Vᵀ − A| and max |VᵀV − 1| for a decomposition. */
function residuals(a: number[], n: number, values: Float64Array, v: Float64Array): { rebuild: number; orth: number } {
  let rebuild = 0;
  let orth = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let r = 0;
      let o = 0;
      for (let k = 0; k < n; k++) {
        r += v[i * n + k] * values[k] * v[j * n + k];
        o += v[k * n + i] * v[k * n + j];
      }
      rebuild = Math.max(rebuild, Math.abs(r - a[i * n + j]));
      orth = Math.max(orth, Math.abs(o - (i === j ? 1 : 0)));
    }
  }
  return { rebuild, orth };
}

/** Deterministic symmetric test matrix (a linear congruential sequence, no randomness in tests). */
function symmetricMatrix(n: number, seed: number): number[] {
  let s = seed;
  const next = () => ((s = (s * 1103515245 + 12345) % 2147483648) / 2147483648) * 2 - 1;
  const a = new Array<number>(n * n);
  for (let i = 0; i < n; i++) for (let j = i; j < n; j++) a[i * n + j] = a[j * n + i] = next();
  return a;
}

describe('symmetricEigen', () => {
  it('decomposes 7×7 matrices to rounding with orthonormal eigenvectors', () => {
    for (let seed = 1; seed <= 5; seed++) {
      const a = symmetricMatrix(7, seed);
      const values = new Float64Array(7);
      const v = new Float64Array(49);
      symmetricEigen(Float64Array.from(a), 7, values, v);
      const { rebuild, orth } = residuals(a, 7, values, v);
      expect(rebuild).toBeLessThan(1e-14);
      expect(orth).toBeLessThan(1e-14);
    }
  });
});

describe('symmetricEigen3', () => {
  it('agrees with the general routine and leaves its input unchanged', () => {
    for (let seed = 1; seed <= 20; seed++) {
      const a = symmetricMatrix(3, seed);
      const values = new Float64Array(3);
      const v = new Float64Array(9);
      const input = Float64Array.from(a);
      symmetricEigen3(input, values, v);
      expect(Array.from(input)).toEqual(a);
      const { rebuild, orth } = residuals(a, 3, values, v);
      expect(rebuild).toBeLessThan(1e-15);
      expect(orth).toBeLessThan(1e-15);
    }
  });

  it('keeps orthonormal vectors for a doubly degenerate matrix', () => {
    // Spheroidal clouds give two equal radii; the vectors must still form a rotation.
    const c = Math.cos(0.3);
    const s = Math.sin(0.3);
    const q = [c, -s, 0, s, c, 0, 0, 0, 1];
    const d = [2, 2, 5];
    const a = [0, 1, 2].flatMap((i) => [0, 1, 2].map((j) => q[3 * i] * d[0] * q[3 * j] + q[3 * i + 1] * d[1] * q[3 * j + 1] + q[3 * i + 2] * d[2] * q[3 * j + 2]));
    const values = new Float64Array(3);
    const v = new Float64Array(9);
    symmetricEigen3(a, values, v);
    expect(Array.from(values).sort()).toEqual([2, 2, 5].map((x) => expect.closeTo(x, 14)));
    expect(residuals(a, 3, values, v).orth).toBeLessThan(1e-15);
  });

  it('returns a diagonal matrix unchanged with the identity as vectors', () => {
    const values = new Float64Array(3);
    const v = new Float64Array(9);
    symmetricEigen3([3, 0, 0, 0, -1, 0, 0, 0, 2], values, v);
    expect(Array.from(values)).toEqual([3, -1, 2]);
    expect(Array.from(v)).toEqual([1, 0, 0, 0, 1, 0, 0, 0, 1]);
  });
});
