import type { Calibration } from './calibration.js';

type Row3 = [number, number, number];

/** A calibration fit as the command line prints it and the API returns it under `fit`. */
export interface CalibrationFitReport {
  kind: 'magnitude' | 'vector';
  points: number;
  /** K, G/A (row = field component, column = coil pair), coil frame. */
  gaussPerAmp: number[][];
  /** B0, G, coil frame. */
  offsetGauss: Row3;
  standardErrors: { gaussPerAmp: number[][]; offsetGauss: Row3 };
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
  currentA: Row3;
  /** Measured |B|, G. */
  measuredGauss: number;
  /** |B| of the fitted model, G. */
  fittedGauss: number;
  /** measured − fitted, G: one number for |B| fits, three (trap x, y, z) for vector fits. */
  residualGauss: number[];
  /** |residual| more than 3 standard deviations (the point's σ, or the fit's scatter s). */
  outlier: boolean;
}

export type CalibrationState = 'draft' | 'approved';
/** Where a version came from: the seeded demo values, a |B| or frequency fit, a vector-probe fit. */
export type CalibrationKind = 'demo' | 'magnitude' | 'vector';

/** A stored calibration version as the API returns it. */
export interface CalibrationRecord extends Calibration {
  state: CalibrationState;
  kind: CalibrationKind;
  /** The fit report; null for the seeded demo calibration. */
  fit: CalibrationFitReport | null;
  /** Name of the uploaded file. */
  sourceName: string | null;
  /** Zeeman coefficient given with a frequency file, MHz/G. */
  mhzPerGauss: number | null;
  /** Who fitted (uploaded) the version. */
  createdBy: string;
  createdAt: string;
  approvedBy: string | null;
  approvedAt: string | null;
  approvalReason: string | null;
  active: boolean;
}

/** `GET /api/calibrations/:id`: a version with the residual of every file line. */
export interface CalibrationDetail extends CalibrationRecord {
  points: FitPoint[] | null;
}

/** `POST /api/calibrations/fits` → 201. */
export interface CalibrationFitResponse {
  id: number;
  state: 'draft';
  fit: CalibrationFitReport;
  calibration: CalibrationDetail;
}
