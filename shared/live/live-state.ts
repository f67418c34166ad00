import type { FieldUncertainty } from '../field/field-uncertainty.js';
import type { Vec3, FieldState } from '../field/field-vector.js';
import type { Role } from '../auth/roles.js';
import type { AlarmsMessage } from '../alarms/alarm-api.js';
import type { ChannelBands } from './channels.js';

/** Per-axis numbers keyed by coil pair. */
export type PerAxis<T> = { x: T; y: T; z: T };

/** The latest state of the apparatus: body of `GET /api/live` and of each WebSocket `live`. */
export interface LiveState {
  /** ISO 8601 UTC time of the newest sample, or null before the first frame. */
  time: string | null;
  /** Mean of the newest fast frame, A. */
  currents: PerAxis<number> | null;
  setpoints: PerAxis<number> | null;
  voltageV: PerAxis<number> | null;
  temperatureC: PerAxis<number> | null;
  flowLpm: PerAxis<number> | null;
  waterSupplyC: number | null;
  waterReturnC: PerAxis<number> | null;
  field: FieldState | null;
  /**
   * One standard deviation of |B|, θ, φ at the present currents from the active calibration's
   * parameter covariance (shared/field/field-uncertainty.ts); null when it has none.
   */
  fieldUncertainty: FieldUncertainty | null;
  calibration: { id: number; version: number; label: string } | null;
  controller: {
    online: boolean;
    tripped: boolean;
    hardwareTripped: boolean;
    hardwareTripCause: string | null;
    softwareHold: boolean;
    mode: 'demo' | 'remote' | null;
    /** ISO time of the newest telemetry frame, used by clients to judge staleness. */
    lastFrameAt: string | null;
  };
  /** Live prediction for the measured field direction and the active sample profile. */
  prediction: LivePrediction | null;
  /** Whether that prediction describes the gas now. */
  predictionStatus: PredictionStatus;
}

/**
 * Whether the live prediction describes the gas now: `applies` with fresh telemetry and a
 * field strong enough to orient the dipoles; `weak-field` while |B| is below the lead-set
 * `minOrientingFieldG` of the level set in force; `stale` while no telemetry arrived for longer than the
 * stale limit; `no-telemetry` before the first frame. Screens grey the prediction out unless
 * it applies.
 */
export interface PredictionStatus {
  state: 'applies' | 'weak-field' | 'stale' | 'no-telemetry';
  /** |B| of the newest frame, G; null before the first. */
  fieldG: number | null;
  /** The least field that orients the dipoles, G (lead-set in the level set in force); null until known. */
  minFieldG: number | null;
  /** Why the prediction does not apply, in one sentence; null when it applies. */
  reason: string | null;
}

/** An ellipse as the camera sees it: semi-axes and the major axis angle from u towards v. */
export interface CameraEllipse {
  major: number;
  minor: number;
  /** Degrees from the camera's u axis towards v, in [−90°, 90°); null when circular. */
  majorAngleDeg: number | null;
}

/** Summary of the Hartree–Fock prediction (shared/physics) carried by the live state. */
export interface LivePrediction {
  stable: boolean;
  /** Why the gas is reported collapsed or the prediction is missing. */
  reason: string | null;
  /** β = K∥/K⊥. */
  fermiSurfaceAspect: number | null;
  /** Largest over smallest real-space radius. */
  cloudAspect: number | null;
  /** Principal TOF aspect ratio (major/minor) at the profile's first TOF time. */
  tofAspect: number | null;
  tofMajorAngleDeg: number | null;
  /** ε_dd / ε_dd,crit (1 = collapse threshold); null while not yet computed. */
  collapseRatio: number | null;
  epsDd: number;
  profileId: number;
  /** Field direction the prediction was computed for (trap frame). */
  thetaDeg: number;
  phiDeg: number;
  computedAt: string;
  /** Camera view of the profile's imaging geometry: in-situ cloud (µm), momentum (µm⁻¹), TOF (µm). */
  camera: {
    imaging: string;
    tofMs: number;
    inSituUm: CameraEllipse;
    momentumPerUm: CameraEllipse;
    tofUm: CameraEllipse;
  } | null;
}

/**
 * Time-series points for the charts, decimated on the server (means over a block of fast
 * samples). Parallel arrays; `t` in Unix epoch ms.
 */
export interface SeriesChunk {
  t: number[];
  currentA: PerAxis<number[]>;
  bMagG: number[];
  thetaDeg: (number | null)[];
  phiDeg: (number | null)[];
}

export interface SlowChunk {
  t: number[];
  temperatureC: PerAxis<number[]>;
  flowLpm: PerAxis<number[]>;
}

/** The display bands in force, sent after `hello` and whenever a lead changes a level. */
export type ChannelsMessage = { type: 'channels' } & ChannelBands;

/** Messages the server sends on the WebSocket `/ws`. */
export type ServerMessage =
  | { type: 'hello'; user: { email: string; role: Role }; serverTime: string; decimatedRateHz: number }
  | { type: 'live'; live: LiveState; series: SeriesChunk; slow: SlowChunk }
  | AlarmsMessage
  | ChannelsMessage
  | { type: 'error'; message: string };

export type { Vec3 };
