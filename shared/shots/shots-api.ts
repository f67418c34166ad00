/**
 * Shapes of the shots API (server and web app): shots of runs with their prediction and the
 * TOF image the imaging analysis measured. Times ISO 8601 UTC; angles in degrees.
 */
import type { ShotRecord } from '../steering/steering-api.js';

/** Columns of the imaging analysis's measurement file, in this order; the last is optional. */
export const MEASUREMENT_COLUMNS = ['shot', 'tof_aspect_ratio', 'tof_angle_deg', 'sigma_aspect_ratio'] as const;

/** The TOF image of a shot as measured (long over short axis, long-axis angle in the camera frame). */
export interface ShotMeasurement {
  tofAspect: number;
  tofAngleDeg: number;
  /** One standard deviation of `tofAspect`; null when the file gave none. */
  sigma: number | null;
}

/** One shot as `GET /api/shots` lists it. */
export interface ShotRow extends ShotRecord {
  runId: number;
  measured: ShotMeasurement | null;
}

/** Body of `GET /api/shots`, oldest shot first. */
export interface ShotsResponse {
  shots: ShotRow[];
}

/** Body of a 201 from `POST /api/shots/measurements`. */
export interface MeasurementUploadResponse {
  stored: number;
}
