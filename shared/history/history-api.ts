/**
 * Body of `GET /api/history` (server/history): a stored window of telemetry, predictions and
 * records, for the Replay screen and exports. Parallel arrays with `t` in Unix epoch ms.
 */
import type { LivePrediction, SeriesChunk, SlowChunk } from '../live/live-state.js';

/** Chart points of the field with one standard deviation of |B|, θ, φ from the calibration's covariance (null without one). */
export interface HistorySeries extends SeriesChunk {
  sigmaBMagG: (number | null)[];
  sigmaThetaDeg: (number | null)[];
  sigmaPhiDeg: (number | null)[];
}

/**
 * The live predictions as they were shown: each holds from its `t` until the next one. The
 * first entry may be older than the window: it is the prediction in force at its start.
 */
export interface HistoryPrediction {
  t: number[];
  profileId: number[];
  /** Field direction in the profile's trap frame the prediction was made for, degrees. */
  thetaDeg: number[];
  phiDeg: number[];
  stable: boolean[];
  reason: (string | null)[];
  epsDd: number[];
  fermiSurfaceAspect: (number | null)[];
  cloudAspect: (number | null)[];
  tofAspect: (number | null)[];
  tofMajorAngleDeg: (number | null)[];
  collapseRatio: (number | null)[];
  camera: LivePrediction['camera'][];
}

export type HistoryEventKind = 'alarm' | 'trip' | 'reset' | 'note' | 'shot' | 'run' | 'calibration' | 'profile' | 'steer';

/** A record in the window, for the timeline's marks. */
export interface HistoryEvent {
  /** ISO 8601 UTC. */
  at: string;
  /** The same moment, Unix epoch ms. */
  t: number;
  kind: HistoryEventKind;
  /** The record's id in its own list (alarm id, trip time, logbook entry, shot id, run id, calibration or profile id, audit entry). */
  id: string;
  /** One line for the mark's tooltip. */
  label: string;
  /** Who did it, when a person did. */
  actor: string | null;
  /** The reason or text given with it, if any. */
  detail: string | null;
}

/** The run a `?run=ID` window was taken for. */
export interface HistoryRun {
  id: number;
  label: string;
  state: string;
  startedAt: string;
  endedAt: string | null;
}

export interface HistoryResponse {
  /** The window, ISO 8601 UTC. */
  from: string;
  to: string;
  /** Length of the time block each series point is the mean of, ms (10 for raw data at most). */
  resolutionMs: number;
  /** `raw` while the 1 kHz samples are kept, `rollup` (1 s statistics) for older or long windows. */
  source: 'raw' | 'rollup';
  series: HistorySeries;
  slow: SlowChunk;
  prediction: HistoryPrediction;
  events: HistoryEvent[];
  /** The run, for `?run=ID`; null for a time window. */
  run: HistoryRun | null;
}
