import { describe, expect, it } from 'vitest';
import { CriticalCache } from './critical-cache.js';

describe('CriticalCache', () => {
  it('keys entries by trap shape and cell, and forgets the oldest beyond its capacity', () => {
    const cache = new CriticalCache(2);
    const shape = CriticalCache.shapeKey([1.2, 0.5, 1 / 0.6]);
    cache.set(shape, '1/0', 2.1);
    cache.set(shape, '2/0', 2.2);
    cache.set('other', '1/0', 3);
    expect(cache.size).toBe(2);
    expect(cache.get(shape, '1/0')).toBeUndefined();
    expect(cache.get(shape, '2/0')).toBe(2.2);
    expect(cache.get('other', '1/0')).toBe(3);
  });
});
