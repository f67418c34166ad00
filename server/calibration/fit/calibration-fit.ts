import type { CalibrationData, Triple } from './calibration-csv.js';
import type { Matrix } from './dense.js';
import { DEFAULT_GAUGE, VECTOR_GAUGE, embedUpperCovariance, procrustes, procrustesGauge, turn, unpackUpper } from './gauge.js';
import { MAGNITUDE_PARAMETERS, fitMagnitude } from './magnitude-fit.js';
import { VECTOR_PARAMETERS, fitVector } from './vector-fit.js';

/** The fit as the command line prints it and the API returns it under `fit`. */
export interface CalibrationFitReport {
  kind: 'magnitude' | 'vector';
  points: number;
  /** K, G/A (row = field component, column = coil pair), coil frame. */
  gaussPerAmp: Matrix;
  /** B0, G, coil frame. */
  offsetGauss: Triple;
  standardErrors: { gaussPerAmp: Matrix; offsetGauss: Triple };
  /** √(mean of the squared residuals), G (vector fits: over all three components). */
  residualRmsGauss: number;
  /** Largest |residual|, G (vector fits: largest component). */
  maxResidualGauss: number;
  /** How the frame freedom of the fit was fixed. */
  gauge: string;
}

/** One file line with its residual, for the residual plots. */
export interface FitPoint {
  line: number;
  currentA: Triple;
  /** Measured |B|, G. */
  measuredGauss: number;
  /** |B| of the fitted model, G. */
  fittedGauss: number;
  /** measured − fitted, G: one number for |B| fits, three (trap x, y, z) for vector fits. */
  residualGauss: number[];
  /** |residual| more than 3 standard deviations (the point's σ, or the fit's scatter s). */
  outlier: boolean;
}

export interface CalibrationFit {
  report: CalibrationFitReport;
  points: FitPoint[];
  /** 12×12 covariance of (K row-major, B0) in the reported frame. */
  covariance: Matrix;
  /** Coil → trap rotation to store with the fit. */
  coilToTrap: Matrix;
}

/** The active calibration a |B| fit is matched to: its K fixes the frame, its rotation is kept. */
export interface ActiveReference {
  version: number;
  gaussPerAmp: Matrix;
  coilToTrap: Matrix;
}

/** Outlier threshold in standard deviations (common practice). */
export const OUTLIER_SIGMAS = 3;
const IDENTITY: Matrix = [
  [1, 0, 0],
  [0, 1, 0],
  [0, 0, 1],
];

/** Fits K and B0 to a parsed calibration file; throws CalibrationInputError for data that cannot be fitted. */
export function fitCalibration(data: CalibrationData, active?: ActiveReference): CalibrationFit {
  return data.kind === 'vector' ? vectorFit(data.points) : magnitudeFit(data.points, active);
}

function magnitudeFit(points: Extract<CalibrationData, { kind: 'magnitude' }>['points'], active?: ActiveReference): CalibrationFit {
  const solution = fitMagnitude(points);
  let { k, b0 } = unpackUpper(solution.theta);
  let covariance = embedUpperCovariance(solution.covariance);
  if (active) {
    ({ k, b0, covariance } = turn(procrustes(k, active.gaussPerAmp), k, b0, covariance));
  }
  const s = Math.sqrt(solution.residuals.reduce((a, r) => a + r * r, 0) / (points.length - MAGNITUDE_PARAMETERS));
  const fitPoints = points.map((p, n): FitPoint => {
    const r = solution.residuals[n];
    return {
      line: p.line,
      currentA: p.currentA,
      measuredGauss: p.fieldGauss,
      fittedGauss: solution.fitted[n],
      residualGauss: [r],
      outlier: Math.abs(r) > OUTLIER_SIGMAS * (p.sigmaGauss ?? s),
    };
  });
  return {
    report: report('magnitude', k, b0, covariance, solution.residuals, active ? procrustesGauge(active.version) : DEFAULT_GAUGE),
    points: fitPoints,
    covariance,
    coilToTrap: active ? active.coilToTrap : IDENTITY,
  };
}

function vectorFit(points: Extract<CalibrationData, { kind: 'vector' }>['points']): CalibrationFit {
  const solution = fitVector(points);
  const all = solution.residuals.flat();
  const s = Math.sqrt(all.reduce((a, r) => a + r * r, 0) / (all.length - VECTOR_PARAMETERS));
  const fitPoints = points.map((p, n): FitPoint => ({
    line: p.line,
    currentA: p.currentA,
    measuredGauss: Math.hypot(...p.fieldGauss),
    fittedGauss: Math.hypot(...solution.fitted[n]),
    residualGauss: solution.residuals[n],
    outlier: solution.residuals[n].some((r) => Math.abs(r) > OUTLIER_SIGMAS * s),
  }));
  return {
    report: report('vector', solution.k, solution.b0, solution.covariance, all, VECTOR_GAUGE),
    points: fitPoints,
    covariance: solution.covariance,
    coilToTrap: IDENTITY,
  };
}

function report(kind: CalibrationFitReport['kind'], k: Matrix, b0: Triple, covariance: Matrix, residuals: number[], gauge: string): CalibrationFitReport {
  const se = covariance.map((row, i) => Math.sqrt(Math.max(0, row[i])));
  return {
    kind,
    points: kind === 'vector' ? residuals.length / 3 : residuals.length,
    gaussPerAmp: k,
    offsetGauss: b0,
    standardErrors: { gaussPerAmp: [se.slice(0, 3), se.slice(3, 6), se.slice(6, 9)], offsetGauss: [se[9], se[10], se[11]] },
    residualRmsGauss: Math.sqrt(residuals.reduce((a, r) => a + r * r, 0) / residuals.length),
    maxResidualGauss: Math.max(...residuals.map(Math.abs)),
    gauge,
  };
}
