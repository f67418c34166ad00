/**
 * Shapes of the steering, sequence and run API (server and web app). Times are ISO 8601 UTC
 * unless the name ends in Ms; fields in G and degrees in the calibration's trap frame.
 */
import type { Vec3 } from '../field/field-vector.js';

/** Names of the pre-flight checks, in the order they are listed. */
export const PREFLIGHT_CHECKS = ['controller', 'interlock', 'field-magnitude', 'currents', 'ramp-rate', 'coil-temperature', 'collapse-ratio'] as const;
export type PreflightCheckName = (typeof PREFLIGHT_CHECKS)[number];

/** One pre-flight check: its worst value along the path against its limit, and a sentence. */
export interface PreflightCheck {
  name: PreflightCheckName;
  ok: boolean;
  /** Worst value along the path, in `unit`; null when it cannot be known (no data, runaway). */
  value: number | null;
  limit: number;
  unit: string;
  message: string;
}

/** One point of the planned path, time from the start of the plan. */
export interface PlannedPoint {
  tMs: number;
  magnitudeG: number;
  thetaDeg: number | null;
  phiDeg: number | null;
  currentsA: Vec3;
  /** The direction in the active sample profile's trap frame (the frame of the orientation map); null without profile or field. */
  mapThetaDeg: number | null;
  mapPhiDeg: number | null;
  /** Predicted β = K∥/K⊥ (null when collapsed or not computed). */
  fermiSurfaceAspect: number | null;
  /** Predicted ε_dd/ε_dd,crit (null when not computed). */
  collapseRatio: number | null;
}

/** Body of 200 and 422 answers of the pre-flight and target routes, and of a refused run. */
export interface PreflightResult {
  ok: boolean;
  checks: PreflightCheck[];
  path: PlannedPoint[];
}

/** Body of `POST /api/steering/preflight` and `/target`. */
export interface SteerTargetRequest {
  magnitudeG: number;
  thetaDeg: number;
  phiDeg: number;
  rampMs: number;
  reason: string;
}

/**
 * What steers the field now. After a server restart nothing is sent until the next command:
 * `restored` is a target that had been reached before the restart, `interrupted` a ramp that
 * was under way when the server stopped (the field stopped at an unknown point of its path).
 */
export type SteeringMode = 'idle' | 'ramping' | 'holding' | 'restored' | 'interrupted';

/** Body of `GET /api/steering` and of the WebSocket `steering` message. */
export interface SteeringStatus {
  mode: SteeringMode;
  /** The target being reached or held; null when idle. */
  target: { magnitudeG: number; thetaDeg: number; phiDeg: number; rampMs: number } | null;
  /** Who set it, why, and when the ramp started. */
  actor: string | null;
  reason: string | null;
  startedAt: string | null;
  /** The planned path of the present ramp (empty when idle). */
  path: PlannedPoint[];
  /** The run steering the field, if any. */
  runId: number | null;
  /** Why steering last stopped ("interlock tripped", "released by …"), for the screen. */
  lastStop: { at: string; why: string } | null;
}

/** Steps of a sequence. */
export type SequenceStep =
  | { kind: 'ramp'; magnitudeG: number; thetaDeg: number; phiDeg: number; durationMs: number }
  | { kind: 'hold'; durationMs: number }
  | { kind: 'shot'; label: string };

/** A stored sequence version. */
export interface SequenceRecord {
  id: number;
  name: string;
  version: number;
  steps: SequenceStep[];
  createdBy: string;
  createdAt: string;
  reason: string;
}

/** Body of `POST /api/sequences` (lead). */
export interface SequenceSaveRequest {
  name: string;
  steps: SequenceStep[];
  reason: string;
}

export type RunState = 'running' | 'done' | 'aborted';

/** How a step of a run ended: its whole course, cut short by an abort (or a stop of the run), or by an interlock trip. */
export type StepOutcome = 'done' | 'aborted' | 'tripped';

/** The prediction recorded with a shot (active sample profile, measured field). */
export interface ShotPrediction {
  fermiSurfaceAspect: number | null;
  cloudAspect: number | null;
  tofAspect: number | null;
  tofMajorAngleDeg: number | null;
  collapseRatio: number | null;
}

export interface ShotRecord {
  /** Unique across the lab; the imaging analysis writes it next to its images. */
  id: string;
  label: string;
  at: string;
  field: { magnitude: number; thetaDeg: number | null; phiDeg: number | null };
  prediction: ShotPrediction | null;
}

/** Body of `GET /api/runs/:id`; `GET /api/runs` lists these without shots. */
export interface RunRecord {
  id: number;
  sequenceId: number;
  sequenceName: string;
  sequenceVersion: number;
  state: RunState;
  startedAt: string;
  endedAt: string | null;
  /** Index of the step being executed (or where it ended). */
  step: number;
  stepCount: number;
  actor: string;
  reason: string;
  /** Why it ended early (abort by whom, a trip), null otherwise. */
  endReason: string | null;
  shots: ShotRecord[];
}
