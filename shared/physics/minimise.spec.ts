import { describe, expect, it } from 'vitest';
import { BfgsMinimiser, centralGradient } from './minimise.js';

/** Rosenbrock's function, minimum 0 at (1, 1): a standard quasi-Newton test (Nocedal & Wright §2.1). */
const rosenbrock = (x: Float64Array) => 100 * (x[1] - x[0] * x[0]) ** 2 + (1 - x[0]) ** 2;

describe('BfgsMinimiser', () => {
  it('finds the minimum of Rosenbrock’s function from the textbook start (−1.2, 1)', () => {
    const bfgs = new BfgsMinimiser(2, { bound: [10, 10] });
    const run = bfgs.minimise(rosenbrock, [-1.2, 1]);
    expect(run.converged).toBe(true);
    expect(run.onBound).toBe(false);
    expect(bfgs.x[0]).toBeCloseTo(1, 6);
    expect(bfgs.x[1]).toBeCloseTo(1, 6);
  });

  it('converges in one step on a quadratic when given its exact inverse Hessian', () => {
    // f = x² + 10y², Hessian diag(2, 20).
    const f = (x: Float64Array) => x[0] * x[0] + 10 * x[1] * x[1];
    const bfgs = new BfgsMinimiser(2, { bound: [10, 10], maxStep: 10 });
    const run = bfgs.minimise(f, [0.3, -0.2], [0.5, 0, 0, 0.05]);
    expect(run.iterations).toBe(1);
    expect(Math.abs(bfgs.x[0]) + Math.abs(bfgs.x[1])).toBeLessThan(1e-9);
  });

  it('stops on the box and says so when the function falls away beyond it', () => {
    const bfgs = new BfgsMinimiser(1, { bound: [2] });
    const run = bfgs.minimise((x) => -x[0], [0]);
    expect(run.onBound).toBe(true);
    expect(bfgs.x[0]).toBe(2);
  });

  it('gives up when the caller’s test says the run is hopeless', () => {
    const bfgs = new BfgsMinimiser(1, { bound: [100] });
    let last = 0;
    const downhill = (x: Float64Array) => {
      last = x[0];
      return -x[0];
    };
    const run = bfgs.minimise(downhill, [0], null, () => last > 1);
    expect(run.abandoned).toBe(true);
    expect(run.converged).toBe(false);
    expect(bfgs.x[0]).toBeGreaterThan(1);
    expect(bfgs.x[0]).toBeLessThan(100);
  });
});

describe('centralGradient', () => {
  it('is exact to O(h²) and restores the point', () => {
    const x = new Float64Array([0.7, -0.4]);
    const g = new Float64Array(2);
    centralGradient((p) => Math.sin(p[0]) * Math.exp(p[1]), x, 1e-5, g);
    expect(g[0]).toBeCloseTo(Math.cos(0.7) * Math.exp(-0.4), 9);
    expect(g[1]).toBeCloseTo(Math.sin(0.7) * Math.exp(-0.4), 9);
    expect(Array.from(x)).toEqual([0.7, -0.4]);
  });
});
