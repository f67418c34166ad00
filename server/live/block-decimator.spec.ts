import { describe, expect, it } from 'vitest';
import { BlockDecimator } from './block-decimator.js';

type Point = [number, number, number, number];

function run(decimator: BlockDecimator, t0Ms: number, rateHz: number, x: number[]): Point[] {
  const out: Point[] = [];
  decimator.push(t0Ms, rateHz, x, x.map((v) => 2 * v), x.map((v) => -v), (t, a, b, c) => out.push([t, a, b, c]));
  return out;
}

describe('BlockDecimator', () => {
  it('emits the mean of each complete 10 ms block of 1 kHz samples as soon as the block is full', () => {
    const x = Array.from({ length: 20 }, (_, i) => i);
    const points = run(new BlockDecimator(10), 1000, 1000, x);
    expect(points).toEqual([
      [1004.5, 4.5, 9, -4.5],
      [1014.5, 14.5, 29, -14.5],
    ]);
  });

  it('carries a block that spans two frames over to the next frame', () => {
    const decimator = new BlockDecimator(10);
    expect(run(decimator, 1005, 1000, [1, 1, 1, 1, 1, 2, 2])).toEqual([[1007, 1, 2, -1]]);
    expect(run(decimator, 1012, 1000, [2, 2, 2, 2, 2, 2, 2, 2])).toEqual([[1014.5, 2, 4, -2]]);
  });

  it('emits a partial block when the data jumps past it', () => {
    const decimator = new BlockDecimator(10);
    run(decimator, 1000, 1000, [3, 3, 3]);
    expect(run(decimator, 1050, 1000, new Array(10).fill(5))).toEqual([
      [1001, 3, 6, -3],
      [1054.5, 5, 10, -5],
    ]);
  });

  it('handles rates that do not divide the block evenly', () => {
    // 300 Hz: 3.33 ms per sample, so blocks hold 3 or 4 samples.
    const points = run(new BlockDecimator(10), 0, 300, new Array(30).fill(1));
    expect(points.length).toBe(10);
    expect(points.every(([, v]) => v === 1)).toBe(true);
  });

  it('flush emits what is left and nothing twice', () => {
    const decimator = new BlockDecimator(10);
    run(decimator, 0, 1000, [4, 4]);
    const out: number[] = [];
    decimator.flush((t) => out.push(t));
    decimator.flush((t) => out.push(t));
    expect(out).toEqual([0.5]);
  });
});
