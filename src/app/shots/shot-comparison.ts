import type { ShotRow } from '../../../shared/shots/shots-api';

/** One shot as the Shots page shows it: flat numbers, null where a value is missing. */
export interface ShotView {
  id: string;
  label: string;
  atMs: number;
  runId: number;
  magnitudeG: number;
  /** Field polar angle θ and azimuth φ in the trap frame, degrees. */
  thetaDeg: number | null;
  phiDeg: number | null;
  predictedAspect: number | null;
  predictedAngleDeg: number | null;
  measuredAspect: number | null;
  measuredAngleDeg: number | null;
  sigma: number | null;
  /** measured − predicted TOF aspect ratio. */
  residual: number | null;
  /** Measured over predicted deformation, (measured − 1)/(predicted − 1). */
  deformationRatio: number | null;
}

/**
 * Below this predicted deformation (aspect ratio − 1) the ratio of deformations is not formed:
 * near a round image it divides by almost nothing and says nothing.
 */
export const MIN_PREDICTED_DEFORMATION = 1e-3;

export function shotView(row: ShotRow): ShotView {
  const predictedAspect = row.prediction?.tofAspect ?? null;
  const measuredAspect = row.measured?.tofAspect ?? null;
  const both = predictedAspect !== null && measuredAspect !== null;
  return {
    id: row.id,
    label: row.label,
    atMs: Date.parse(row.at),
    runId: row.runId,
    magnitudeG: row.field.magnitude,
    thetaDeg: row.field.thetaDeg,
    phiDeg: row.field.phiDeg === null ? null : shownAzimuth(row.field.phiDeg),
    predictedAspect,
    predictedAngleDeg: row.prediction?.tofMajorAngleDeg ?? null,
    measuredAspect,
    measuredAngleDeg: row.measured?.tofAngleDeg ?? null,
    sigma: row.measured?.sigma ?? null,
    residual: both ? measuredAspect - predictedAspect : null,
    deformationRatio: both && predictedAspect - 1 >= MIN_PREDICTED_DEFORMATION ? (measuredAspect - 1) / (predictedAspect - 1) : null,
  };
}

/** φ in [0°, 360°) as the table shows it to 0.1°: just below 360° it reads as the 0° it rounds to, not "360.0°". */
function shownAzimuth(phiDeg: number): number {
  return phiDeg >= 359.95 ? phiDeg - 360 : phiDeg;
}

/** How far measured and predicted deformations are apart over the shots that have both. */
export interface Agreement {
  /** Shots with a measurement and a usable prediction. */
  count: number;
  /** Mean of (measured − 1)/(predicted − 1); null without shots. */
  meanRatio: number | null;
  /** Sample standard deviation of that ratio; null below two shots. */
  spread: number | null;
  /** Mean measured − predicted aspect ratio; null without shots. */
  meanResidual: number | null;
}

export function agreement(views: readonly ShotView[]): Agreement {
  const ratios = views.map((v) => v.deformationRatio).filter((r): r is number => r !== null);
  const residuals = views.map((v) => v.residual).filter((r): r is number => r !== null);
  const mean = (xs: number[]) => (xs.length === 0 ? null : xs.reduce((a, b) => a + b, 0) / xs.length);
  const meanRatio = mean(ratios);
  const spread = meanRatio === null || ratios.length < 2 ? null : Math.sqrt(ratios.reduce((s, r) => s + (r - meanRatio) ** 2, 0) / (ratios.length - 1));
  return { count: ratios.length, meanRatio, spread, meanResidual: mean(residuals) };
}

export type ShotColumn = 'label' | 'atMs' | 'thetaDeg' | 'phiDeg' | 'magnitudeG' | 'predictedAspect' | 'measuredAspect' | 'deformationRatio' | 'predictedAngleDeg' | 'measuredAngleDeg';

/** The rows sorted by a column (missing values last in either direction); unsorted when `direction` is empty. */
export function sortShots(views: readonly ShotView[], column: ShotColumn, direction: 'asc' | 'desc' | ''): ShotView[] {
  if (direction === '') return [...views];
  const sign = direction === 'asc' ? 1 : -1;
  return [...views].sort((a, b) => {
    const x = a[column];
    const y = b[column];
    if (x === null || y === null) return x === y ? 0 : x === null ? 1 : -1;
    return sign * (typeof x === 'string' ? x.localeCompare(y as string) : x - (y as number));
  });
}

/** Header of the exported CSV: one column per value, the unit in the name (aspect ratios are pure numbers). */
const CSV_HEADER = [
  'shot', 'label', 'time_utc', 'run', 'field_G', 'theta_deg', 'phi_deg',
  'predicted_tof_aspect_ratio', 'predicted_tof_angle_deg', 'measured_tof_aspect_ratio', 'measured_tof_angle_deg', 'sigma_aspect_ratio',
  'measured_minus_predicted', 'deformation_ratio',
];

/** The shots as CSV (RFC 4180 quoting, CRLF line ends), missing values as empty cells. */
export function shotsCsv(views: readonly ShotView[]): string {
  const cell = (value: string | number | null) => {
    if (value === null) return '';
    const text = String(value);
    return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
  };
  const lines = views.map((v) =>
    [
      v.id, v.label, new Date(v.atMs).toISOString(), v.runId, v.magnitudeG, v.thetaDeg, v.phiDeg,
      v.predictedAspect, v.predictedAngleDeg, v.measuredAspect, v.measuredAngleDeg, v.sigma, rounded(v.residual), rounded(v.deformationRatio),
    ].map(cell).join(','),
  );
  return [CSV_HEADER.join(','), ...lines].join('\r\n') + '\r\n';
}

/** A derived value to six significant digits, so the file does not show floating-point noise. */
function rounded(value: number | null): number | null {
  return value === null ? null : Number(value.toPrecision(6));
}
