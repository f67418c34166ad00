import { describe, expect, it } from 'vitest';
import { adcCodeRange, adcReading, adcStep, adcValue, CURRENT_ADC, VOLTAGE_ADC } from '../../shared/telemetry/adc.js';
import { CHANNEL_ADCS, decodeSamples, encodeSamples } from './sample-codec.js';

/** Seeded uniform numbers in [0, 1) (Park–Miller minimal standard generator). */
function uniform(seed: number): () => number {
  let state = seed;
  return () => {
    state = (state * 16807) % 2147483647;
    return (state - 1) / 2147483646;
  };
}

/** Largest |decoded − original| per channel, in converter steps. */
function worstError(channels: number[][]): number[] {
  const decoded = decodeSamples(encodeSamples(channels), channels[0].length);
  return channels.map((values, c) => Math.max(...values.map((v, i) => Math.abs(decoded[c][i] - v))) / adcStep(CHANNEL_ADCS[c]));
}

describe('sample codec (converter codes, zigzag deltas, byte planes, zlib)', () => {
  it('states the converters: 20 bits over ±25 A and ±25 V, one step ≈ 47.7 µA / µV', () => {
    expect(CURRENT_ADC).toEqual({ bits: 20, fullScale: 25 });
    expect(VOLTAGE_ADC).toEqual({ bits: 20, fullScale: 25 });
    expect(adcStep(CURRENT_ADC)).toBeCloseTo(50 / 1048576, 15); // 2^20 = 1,048,576
  });

  it('returns every sample of random data across the whole range within half a step', () => {
    const next = uniform(20261202);
    const channels = CHANNEL_ADCS.map((adc) => Array.from({ length: 5000 }, () => (2 * next() - 1) * (adc.fullScale - adcStep(adc))));
    for (const worst of worstError(channels)) expect(worst).toBeLessThanOrEqual(0.5 + 1e-9);
  });

  it('returns converter readings exactly, including both ends of the range and full-range jumps', () => {
    const { min, max } = adcCodeRange(CURRENT_ADC);
    const ends = [adcValue(CURRENT_ADC, min), adcValue(CURRENT_ADC, max), adcValue(CURRENT_ADC, min), 0, adcValue(CURRENT_ADC, max)];
    const readings = CHANNEL_ADCS.map((adc, c) => ends.map((v, i) => adcReading(adc, i === 3 ? c * 1.234567 : v)));
    const decoded = decodeSamples(encodeSamples(readings), ends.length);
    readings.forEach((values, c) => expect(Array.from(decoded[c])).toEqual(values));
  });

  it('refuses a sample outside its converter range instead of storing something else', () => {
    const channels = CHANNEL_ADCS.map(() => [0, 1, 2]);
    channels[4][1] = 26;
    expect(() => encodeSamples(channels)).toThrow(/outside its converter's range/);
  });

  it('refuses channels of unequal length and a blob read with the wrong sample count', () => {
    expect(() => encodeSamples([[1, 2], [1], [1], [1], [1], [1]])).toThrow(/samples/);
    const blob = encodeSamples(CHANNEL_ADCS.map(() => [1, 2, 3]));
    expect(() => decodeSamples(blob, 4)).toThrow(/expected/);
  });

  it('stores demo-like data (2 mA and 5 mV noise on slow drifts) in under 1.5 bytes per sample, against 4 for float32', () => {
    const next = uniform(7);
    const gauss = () => Math.sqrt(-2 * Math.log(1 - next())) * Math.cos(2 * Math.PI * next());
    const n = 500; // one 0.5 s batch at 1 kHz
    const channels = CHANNEL_ADCS.map((adc, c) =>
      Array.from({ length: n }, (_, i) => adcReading(adc, c < 3 ? 5 + Math.sin(i / 300) + 0.002 * gauss() : 2 + 0.1 * Math.sin(i / 300) + 0.005 * gauss())),
    );
    const blob = encodeSamples(channels);
    expect(blob.byteLength / (6 * n)).toBeLessThan(1.5);
    for (const worst of worstError(channels)) expect(worst).toBe(0);
  });
});
