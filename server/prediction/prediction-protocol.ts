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
  | { kind: 'critical'; jobId: number; params: SampleParams; thetaDeg: number; phiDeg: number };

/** Messages from the prediction worker back to the engine. */
export type WorkerReply =
  | { kind: 'predict'; jobId: number; summary: WorkerSummary }
  | { kind: 'critical'; jobId: number; epsDdCritical: number }
  | { kind: 'failed'; jobId: number; message: string };
