/** Shown in place of a number that is missing or undefined. */
export const NO_VALUE = '—';

/**
 * A number with its unit for display: fixed decimals, a true minus sign, and the unit after a
 * no-break space (SI brochure §5.4.3), except for the plane-angle degree, which is written
 * without a space.
 */
export function formatQuantity(value: number | null | undefined, unit: string, digits: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return NO_VALUE;
  const number = formatNumber(value, digits);
  return unit === '°' ? `${number}°` : `${number}\u00a0${unit}`;
}

/**
 * An azimuth φ in degrees for display, rounded to `digits` decimals and then brought into
 * [0°, 360°): 359.996° at two decimals reads "0.00°", its equal on the circle, never "360.00°".
 */
export function formatAzimuth(phiDeg: number | null | undefined, digits: number): string {
  if (phiDeg === null || phiDeg === undefined || !Number.isFinite(phiDeg)) return NO_VALUE;
  const rounded = Number(phiDeg.toFixed(digits));
  const wrapped = ((rounded % 360) + 360) % 360;
  return formatQuantity(Number(wrapped.toFixed(digits)), '°', digits);
}

/** A number with fixed decimals and a true minus sign (U+2212); "−0.00" is shown as "0.00". */
export function formatNumber(value: number, digits: number): string {
  const text = value.toFixed(digits);
  return /^-0\.?0*$/.test(text) ? text.slice(1) : text.replace('-', '\u2212');
}

/** Local wall-clock time hh:mm:ss of a Unix epoch ms value (times are stored in UTC, shown local). */
export function formatLocalTime(epochMs: number): string {
  return new Date(epochMs).toLocaleTimeString(undefined, { hour: '2-digit', minute: '2-digit', second: '2-digit', hour12: false });
}

/** Local date and wall-clock time of a Unix epoch ms value, for lists that span several days. */
export function formatLocalDateTime(epochMs: number): string {
  return new Date(epochMs).toLocaleString(undefined, {
    day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit', second: '2-digit', hour12: false,
  });
}
