import type { LivePrediction } from '../../shared/live/live-state.js';
import type { SampleParams } from '../../shared/physics/predict.js';
import type { ImagingInput } from '../../shared/physics/tof.js';

/** The live numbers the worker derives from one prediction; the engine adds the rest. */
export type WorkerSummary = Omit<LivePrediction, 'profileId' | 'computedAt'>;

/** Messages from the engine to the prediction worker (structured-cloned plain data). */
export type WorkerRequest =
  | {
      kind: 'predict';
      jobId: number;
      params: SampleParams;
      thetaDeg: number;
      phiDeg: number;
      /** The profile's first TOF time, ms. */
      tofMs: number;
      imaging: ImagingInput;
      /** Forget the previous solution first (the profile changed). */
      cold: boolean;
    }
  | { kind: 'critical'; jobId: number; params: SampleParams; thetaDeg: number; phiDeg: number }
  /** Predictions with ε_dd,crit for a list of directions (a planned path), each warm-started from the one before. */
  | { kind: 'path'; jobId: number; params: SampleParams; directions: { thetaDeg: number; phiDeg: number }[]; tofMs: number; imaging: ImagingInput };

/** One direction of a `path` job; null fields where the gas is collapsed or the model failed. */
export interface PathPrediction {
  fermiSurfaceAspect: number | null;
  cloudAspect: number | null;
  tofAspect: number | null;
  tofMajorAngleDeg: number | null;
  epsDdCritical: number | null;
}

/** Messages from the prediction worker back to the engine. */
export type WorkerReply =
  | { kind: 'predict'; jobId: number; summary: WorkerSummary }
  | { kind: 'critical'; jobId: number; epsDdCritical: number }
  | { kind: 'path'; jobId: number; points: PathPrediction[] }
  | { kind: 'failed'; jobId: number; message: string };
