/**
 * Body of `GET /api/history` (server/history): a stored window of telemetry, predictions and
 * records, for the Replay screen and exports. Parallel arrays with `t` in Unix epoch ms.
 */
import type { AlarmLevelOf } from '../levels/channel-bands.js';
import type { ChannelBands } from '../live/channels.js';
import type { LivePrediction, PredictionStatus, SeriesChunk, SlowChunk } from '../live/live-state.js';
import type { ProfileRecord } from '../profiles/profile-record.js';

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

/**
 * Whether the live prediction described the gas (`PredictionStatus`: field strong enough to
 * orient the dipoles, telemetry not stale), each change holding until the next. The first entry
 * may be older than the window: the status in force at its start. Empty where nothing was kept.
 */
export interface HistoryPredictionStatus {
  t: number[];
  state: PredictionStatus['state'][];
  /** |B| of the newest frame at the change, G. */
  fieldG: (number | null)[];
  /** The least field that orients the dipoles then, G. */
  minFieldG: (number | null)[];
  /** The sentence Live showed at the change; null while the prediction applies. */
  reason: (string | null)[];
  /** While stale: when the newest frame had arrived, Unix epoch ms (Live's stale age grows from it). */
  lastFrameAtMs: (number | null)[];
}

/** A level set version (display bands, trip levels) in force from `t`. */
export interface HistoryLevels {
  /** When it came into force, Unix epoch ms. */
  t: number;
  version: number;
  createdBy: string;
  reason: string;
  /** The gauges' bands of that version, without alarm marks (`high`, `low` null): see `HistoryAlarmLimits`. */
  bands: ChannelBands;
}

/**
 * The alarm limits in force from `t`, rebuilt from today's limits and the audited edits (each
 * edit's value before it). Their levels only: what the gauges mark.
 */
export interface HistoryAlarmLimits {
  /**
   * When the edit putting this set in force was made, Unix epoch ms; for the set in force at the
   * window's start without any audited edit before it, the window's start.
   */
  t: number;
  /** The limit that edit changed, who made it and why; null for the set in force without an audited edit. */
  changedId: string | null;
  changedBy: string | null;
  reason: string | null;
  limits: (AlarmLevelOf & { id: string })[];
}

/** A calibration version in force from `t` (its approval). */
export interface HistoryCalibration {
  t: number;
  id: number;
  version: number;
  label: string;
  approvedBy: string | null;
}

/** A sample profile version in force from `t` (its activation). */
export interface HistoryProfile {
  t: number;
  profile: ProfileRecord;
}

/**
 * The versions in force over the window, oldest first: the one in force at its start (which may
 * have come into force long before), then each change inside it.
 */
export interface HistoryInForce {
  levels: HistoryLevels[];
  calibrations: HistoryCalibration[];
  profiles: HistoryProfile[];
  alarmLimits: HistoryAlarmLimits[];
}

export type HistoryEventKind = 'alarm' | 'trip' | 'reset' | 'note' | 'shot' | 'run' | 'step' | 'calibration' | 'profile' | 'steer';

/** A record in the window, for the timeline's marks. */
export interface HistoryEvent {
  /** ISO 8601 UTC. */
  at: string;
  /** The same moment, Unix epoch ms. */
  t: number;
  kind: HistoryEventKind;
  /** The record's id in its own list (alarm id, trip time, logbook entry, shot id, run id, run and step number as `12.3`, calibration or profile id, audit entry). */
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
  /** The predictions as stored with the telemetry, and whether they applied (kept by the prediction feed). */
  prediction: HistoryPrediction & { status: HistoryPredictionStatus };
  inForce: HistoryInForce;
  events: HistoryEvent[];
  /** The run, for `?run=ID`; null for a time window. */
  run: HistoryRun | null;
}
