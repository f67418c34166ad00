/**
 * The controller's analogue-to-digital converters for the fast channels: what one sample can
 * say. Every coil current and supply voltage is digitised by a 20-bit converter, currents over
 * ±25 A and voltages over ±25 V, so one step (least significant bit) is 50/2²⁰ ≈ 47.7 µA or
 * 47.7 µV. These are the demo apparatus's converters (invented, demo only; a real controller
 * states its own).
 *
 * The same numbers bound what the server admits (a sample outside the converter's range cannot
 * come from the converter) and how it stores samples: as whole converter codes, so storage is
 * lossless at the instrument's resolution (every value comes back within half a step).
 */

export interface AdcRange {
  /** Converter resolution, bits. */
  bits: number;
  /** The range is ±fullScale (channel unit). */
  fullScale: number;
}

/** Coil-current converters: 20 bits over ±25 A. */
export const CURRENT_ADC: AdcRange = { bits: 20, fullScale: 25 };
/** Supply-voltage converters: 20 bits over ±25 V. */
export const VOLTAGE_ADC: AdcRange = { bits: 20, fullScale: 25 };

/** One converter step in the channel's unit. */
export function adcStep(adc: AdcRange): number {
  return (2 * adc.fullScale) / 2 ** adc.bits;
}

/** Lowest and highest code: signed, −2^(bits−1) … 2^(bits−1) − 1. */
export function adcCodeRange(adc: AdcRange): { min: number; max: number } {
  const half = 2 ** (adc.bits - 1);
  return { min: -half, max: half - 1 };
}

/** The converter code nearest to `value` (not clamped: check with `adcRangeCheck` first). */
export function adcCode(adc: AdcRange, value: number): number {
  return Math.round(value / adcStep(adc));
}

/** The value a converter code stands for. */
export function adcValue(adc: AdcRange, code: number): number {
  return code * adcStep(adc);
}

/**
 * A check whether a value is finite and within what the converter can report, with the
 * converter's constants worked out once (the ingest edge runs it on every sample).
 */
export function adcRangeCheck(adc: AdcRange): (value: number) => boolean {
  const step = adcStep(adc);
  const { min, max } = adcCodeRange(adc);
  return (value) => {
    if (!Number.isFinite(value)) return false;
    const code = Math.round(value / step);
    return code >= min && code <= max;
  };
}

/** `value` as the converter reports it: rounded to a whole step and clipped at its range. */
export function adcReading(adc: AdcRange, value: number): number {
  const { min, max } = adcCodeRange(adc);
  return adcValue(adc, Math.min(max, Math.max(min, adcCode(adc, value))));
}
