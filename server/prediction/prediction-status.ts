import type { PredictionStatus } from '../../shared/live/live-state.js';
import { staleReason, weakFieldReason } from '../../shared/live/prediction-status-text.js';

export interface PredictionStatusInput {
  /** |B| of the newest frame, G; null before the first. */
  fieldG: number | null;
  /** Server time the newest frame arrived, Unix epoch ms; null before the first. */
  lastFrameAtMs: number | null;
  nowMs: number;
  /** Telemetry older than this is stale, ms (the interlock's stale limit). */
  staleMs: number;
  /** The least field that orients the dipoles, G (lead-set, in the level set in force). */
  minFieldG: number;
}

/**
 * Whether the live prediction describes the gas now (see `PredictionStatus`). Staleness goes
 * first: an old |B| says nothing about the field now.
 */
export function predictionStatus(input: PredictionStatusInput): PredictionStatus {
  const { fieldG, lastFrameAtMs, minFieldG } = input;
  if (lastFrameAtMs === null || fieldG === null) {
    return { state: 'no-telemetry', fieldG: null, minFieldG, reason: 'No telemetry yet: the field, and with it the prediction, is unknown.' };
  }
  const ageMs = input.nowMs - lastFrameAtMs;
  if (ageMs > input.staleMs) {
    return { state: 'stale', fieldG, minFieldG, reason: staleReason(ageMs) };
  }
  if (fieldG < minFieldG) {
    return { state: 'weak-field', fieldG, minFieldG, reason: weakFieldReason(fieldG, minFieldG) };
  }
  return { state: 'applies', fieldG, minFieldG, reason: null };
}

/** True when two statuses would read the same on a screen (|B| to 0.01 G, the stale age to the second). */
export function sameStatus(a: PredictionStatus, b: PredictionStatus): boolean {
  return a.state === b.state && a.reason === b.reason && a.minFieldG === b.minFieldG && (a.state !== 'applies' || round(a.fieldG) === round(b.fieldG));
}

function round(v: number | null): number | null {
  return v === null ? null : Math.round(v * 100);
}
