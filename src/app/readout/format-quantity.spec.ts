import { describe, expect, it } from 'vitest';
import { formatAzimuth } from './format-quantity';

describe('formatAzimuth', () => {
  it('rounds first, then brings the azimuth into [0°, 360°)', () => {
    expect(formatAzimuth(359.996, 2)).toBe('0.00°');
    expect(formatAzimuth(359.994, 2)).toBe('359.99°');
    expect(formatAzimuth(359.96, 1)).toBe('0.0°');
    expect(formatAzimuth(360, 1)).toBe('0.0°');
    expect(formatAzimuth(0, 1)).toBe('0.0°');
  });

  it('wraps negative azimuths and never shows a negative zero', () => {
    expect(formatAzimuth(-90, 1)).toBe('270.0°');
    expect(formatAzimuth(-0.001, 2)).toBe('0.00°');
    expect(formatAzimuth(725.5, 1)).toBe('5.5°');
  });

  it('shows the no-value mark for a missing azimuth', () => {
    expect(formatAzimuth(null, 1)).toBe('—');
    expect(formatAzimuth(Number.NaN, 1)).toBe('—');
  });
});
