/**
 * The steering state as the database keeps it (table `steering_state`, written by
 * steering-store.ts). Types only, so the schema can name them without importing the store.
 */
import type { Vec3 } from '../../shared/field/field-vector.js';

/** The program in force as stored: `reached` once the ramp had ended when it was written. */
export interface StoredProgram {
  target: { magnitudeG: number; thetaDeg: number; phiDeg: number; rampMs: number };
  /** The target field, trap frame, G. */
  to: Vec3;
  startedAt: string;
  actor: string;
  reason: string;
  runId: number | null;
  reached: boolean;
}

export interface StoredSteering {
  program: StoredProgram | null;
  lastStop: { at: string; why: string } | null;
}
