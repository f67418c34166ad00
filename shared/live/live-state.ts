import type { Vec3, FieldState } from '../field/field-vector.js';
import type { Role } from '../auth/roles.js';

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

/** Messages the server sends on the WebSocket `/ws`. */
export type ServerMessage =
  | { type: 'hello'; user: { email: string; role: Role }; serverTime: string; decimatedRateHz: number }
  | { type: 'live'; live: LiveState; series: SeriesChunk; slow: SlowChunk }
  | { type: 'error'; message: string };

export type { Vec3 };
