import type { LivePrediction } from '../../../shared/live/live-state';
import { NO_VALUE, formatLocalTime, formatNumber, formatQuantity, formatAzimuth } from '../readout/format-quantity';

/** Whether the gas is predicted stable, collapsed, or not known yet. */
export type StabilityKind = 'stable' | 'collapsed' | 'unknown';

/** The prediction as the panel shows it: text with units, ready for the template. */
export interface PredictionReadout {
  beta: string;
  /** (β − 1) in percent with its sign, e.g. "+2.05 %". */
  betaDeviation: string;
  cloudAspect: string;
  tofAspect: string;
  /** Major-axis angle of the TOF image from u towards v, or a word when the image is round. */
  tofAngle: string;
  epsDd: string;
  collapseRatio: string;
  stability: StabilityKind;
  /** One sentence on stability, e.g. "Stable: ε_dd is 7.0 % of the collapse threshold." */
  stabilityText: string;
  /** Field direction the prediction is for, e.g. "θ 35.0°, φ 25.0°". */
  direction: string;
  computedAt: string;
}

const EMPTY: PredictionReadout = {
  beta: NO_VALUE,
  betaDeviation: NO_VALUE,
  cloudAspect: NO_VALUE,
  tofAspect: NO_VALUE,
  tofAngle: NO_VALUE,
  epsDd: NO_VALUE,
  collapseRatio: NO_VALUE,
  stability: 'unknown',
  stabilityText: 'No prediction yet.',
  direction: NO_VALUE,
  computedAt: NO_VALUE,
};

/**
 * Formats a live prediction. A collapsed gas gets no shape numbers, only its collapse ratio: the
 * model has no stationary state there, and any shape would be made up.
 */
export function readPrediction(prediction: LivePrediction | null): PredictionReadout {
  if (!prediction) return EMPTY;
  const stable = prediction.stable;
  const ratio = prediction.collapseRatio;
  const beta = stable ? prediction.fermiSurfaceAspect : null;
  const computedAtMs = Date.parse(prediction.computedAt);
  return {
    beta: plain(beta, 4),
    betaDeviation: beta === null ? NO_VALUE : `${beta >= 1 ? '+' : ''}${formatNumber((beta - 1) * 100, 2)}\u00a0%`,
    cloudAspect: stable ? plain(prediction.cloudAspect, 3) : NO_VALUE,
    tofAspect: stable ? plain(prediction.tofAspect, 4) : NO_VALUE,
    tofAngle: !stable || prediction.tofAspect === null ? NO_VALUE : prediction.tofMajorAngleDeg === null ? 'round' : formatQuantity(prediction.tofMajorAngleDeg, '°', 1),
    epsDd: formatNumber(prediction.epsDd, 3),
    collapseRatio: ratio === null ? NO_VALUE : formatNumber(ratio, 3),
    stability: stable ? 'stable' : 'collapsed',
    stabilityText: stabilitySentence(stable, ratio),
    direction: `θ ${formatQuantity(prediction.thetaDeg, '°', 1)}, φ ${formatAzimuth(prediction.phiDeg, 1)}`,
    computedAt: Number.isFinite(computedAtMs) ? formatLocalTime(computedAtMs) : NO_VALUE,
  };
}

/** A dimensionless number, or the no-value mark. */
function plain(value: number | null, digits: number): string {
  return value === null || !Number.isFinite(value) ? NO_VALUE : formatNumber(value, digits);
}

function stabilitySentence(stable: boolean, ratio: number | null): string {
  const share = ratio === null ? null : `ε_dd is ${formatNumber(ratio * 100, 1)}\u00a0% of the collapse threshold`;
  if (stable) return share ? `Stable: ${share}.` : 'Stable. Collapse threshold for this direction is being computed.';
  return share ? `Collapsed: ${share}.` : 'Collapsed: the model finds no stable state for this direction.';
}
