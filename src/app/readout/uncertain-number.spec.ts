import { describe, expect, it } from 'vitest';
import { formatSigma, formatUncertain } from './uncertain-number';

describe('numbers with their standard error', () => {
  it('rounds the error to two significant digits and the value to match', () => {
    expect(formatUncertain(1.214157585, 0.00023468)).toBe('1.21416 ± 0.00023');
    expect(formatUncertain(40.123, 0.21, '°')).toBe('40.12° ± 0.21°');
    expect(formatUncertain(0.2057, 0.0011, 'G')).toBe('0.2057 G ± 0.0011 G');
    expect(formatUncertain(123.4, 12, 'G')).toBe('123 G ± 12 G');
  });

  it('prints a number fixed by the frame choice without an error, and a dash for no value', () => {
    expect(formatUncertain(0, 0)).toBe('0.0000');
    expect(formatUncertain(null, 0.1)).toBe('—');
    expect(formatSigma(null, '°')).toBe('—');
    expect(formatSigma(0.0123, 'G')).toBe('± 0.012 G');
    expect(formatSigma(0.26, '°')).toBe('± 0.26°');
  });
});
