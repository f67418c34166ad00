import { NO_VALUE } from './format-quantity';

/**
 * "value ± error" with the error rounded to two significant digits and the value to the same
 * decimal place (common practice for reporting a measurement with its standard uncertainty).
 * A zero error (a number fixed by the frame choice) prints the value alone with `fixedDigits`.
 */
export function formatUncertain(value: number | null | undefined, error: number | null | undefined, unit = '', fixedDigits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return NO_VALUE;
  const suffix = unit ? (unit === '°' ? unit : ` ${unit}`) : '';
  if (error === null || error === undefined || !Number.isFinite(error) || error <= 0) return `${value.toFixed(fixedDigits)}${suffix}`;
  const decimals = Math.min(12, Math.max(0, 1 - Math.floor(Math.log10(error))));
  return `${value.toFixed(decimals)}${suffix} ± ${error.toFixed(decimals)}${suffix}`;
}

/** Two significant digits of a standard deviation, e.g. "± 0.12°"; "—" when unknown. */
export function formatSigma(error: number | null | undefined, unit: string): string {
  if (error === null || error === undefined || !Number.isFinite(error)) return NO_VALUE;
  if (error === 0) return `± 0${unit === '°' ? unit : ` ${unit}`}`;
  const decimals = Math.min(12, Math.max(0, 1 - Math.floor(Math.log10(error))));
  return `± ${error.toFixed(decimals)}${unit === '°' ? unit : ` ${unit}`}`;
}
