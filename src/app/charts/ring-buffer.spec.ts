import { describe, expect, it } from 'vitest';
import { RingBuffer, WindowCopy } from './ring-buffer';

function filled(capacity: number, times: number[]): RingBuffer {
  const buffer = new RingBuffer(capacity, 2);
  for (const t of times) buffer.push(t, [t * 10, -t]);
  return buffer;
}

function window(buffer: RingBuffer, fromMs: number) {
  const out = new WindowCopy();
  const n = buffer.copySince(fromMs, out);
  return { t: Array.from(out.t.subarray(0, n)), a: Array.from(out.columns[0].subarray(0, n)), b: Array.from(out.columns[1].subarray(0, n)) };
}

describe('RingBuffer', () => {
  it('returns all samples oldest first while not full', () => {
    expect(window(filled(8, [1, 2, 3]), 0)).toEqual({ t: [1, 2, 3], a: [10, 20, 30], b: [-1, -2, -3] });
  });

  it('overwrites the oldest samples once full and keeps the order across the wrap point', () => {
    const buffer = filled(4, [1, 2, 3, 4, 5, 6]);
    expect(buffer.length).toBe(4);
    expect(window(buffer, 0)).toEqual({ t: [3, 4, 5, 6], a: [30, 40, 50, 60], b: [-3, -4, -5, -6] });
  });

  it('extracts only the samples at or after the window start, also across the wrap point', () => {
    const buffer = filled(5, [10, 20, 30, 40, 50, 60, 70]);
    expect(window(buffer, 45).t).toEqual([50, 60, 70]);
    expect(window(buffer, 30).t).toEqual([30, 40, 50, 60, 70]);
    expect(window(buffer, 71).t).toEqual([]);
  });

  it('refuses a sample that is not newer than the newest one', () => {
    const buffer = filled(4, [1, 2, 3]);
    expect(buffer.push(3, [0, 0])).toBe(false);
    expect(buffer.push(2.5, [0, 0])).toBe(false);
    expect(window(buffer, 0).t).toEqual([1, 2, 3]);
  });

  it('stores a missing value as NaN', () => {
    const buffer = new RingBuffer(4, 2);
    buffer.push(1, [Number.NaN, 7]);
    expect(window(buffer, 0).a[0]).toBeNaN();
  });

  it('counts a revision for every accepted change so readers can skip unchanged frames', () => {
    const buffer = filled(4, [1]);
    const before = buffer.revision;
    buffer.push(1, [0, 0]);
    expect(buffer.revision).toBe(before);
    buffer.push(2, [0, 0]);
    expect(buffer.revision).toBe(before + 1);
  });

  it('empties and resizes on clear', () => {
    const buffer = filled(4, [1, 2, 3]);
    buffer.clear(16);
    expect(buffer.length).toBe(0);
    expect(buffer.capacity).toBe(16);
    expect(buffer.newestTime).toBeNull();
  });

  it('reuses the copy arrays for the next window', () => {
    const buffer = filled(8, [1, 2, 3, 4]);
    const out = new WindowCopy();
    buffer.copySince(0, out);
    const arrays = out.t;
    buffer.push(5, [0, 0]);
    buffer.copySince(0, out);
    expect(out.t).toBe(arrays);
    expect(out.length).toBe(5);
  });
});
