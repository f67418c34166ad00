import type { FieldState } from '../../../shared/field/field-vector';
import { NO_VALUE, formatAzimuth, formatQuantity } from '../readout/format-quantity';

/** The field as the field panel shows it: text with units, ready for the template. */
export interface FieldReadout {
  /** |B| in gauss, e.g. "12.345 G". */
  magnitudeGauss: string;
  /** |B| in millitesla, e.g. "1.2345 mT". */
  magnitudeMilliTesla: string;
  theta: string;
  phi: string;
  /** Why the angles are not shown; null when they are. */
  angleNote: string | null;
}

/** Millitesla per gauss: 1 G = 10⁻⁴ T (SI Brochure 8th ed., Table 9, CGS units). */
export const MILLITESLA_PER_GAUSS = 0.1;

/** Formats a field state for display; angles read "—" with a note when the direction is undefined. */
export function readField(field: FieldState | null): FieldReadout {
  if (!field) {
    return { magnitudeGauss: NO_VALUE, magnitudeMilliTesla: NO_VALUE, theta: NO_VALUE, phi: NO_VALUE, angleNote: 'No field data yet.' };
  }
  const undefinedDirection = field.thetaDeg === null || field.phiDeg === null;
  return {
    magnitudeGauss: formatQuantity(field.magnitude, 'G', 3),
    magnitudeMilliTesla: formatQuantity(field.magnitude * MILLITESLA_PER_GAUSS, 'mT', 4),
    theta: formatQuantity(field.thetaDeg, '°', 1),
    phi: formatAzimuth(field.phiDeg, 1),
    angleNote: undefinedDirection ? 'θ and φ are undefined while |B| ≈ 0: the field has no direction.' : null,
  };
}
