import { PhysicsInputError } from '../../../shared/physics/input-error';
import { computeOrientationMap, type MapQuantity } from '../../../shared/physics/orientation-map';
import type { SampleParams } from '../../../shared/physics/sample';
import type { ImagingInput } from '../../../shared/physics/tof';

/** What to compute: the sample, the quantity, and its grid. */
export interface MapSettings {
  quantity: MapQuantity;
  /** Requested grid step, degrees. */
  resolutionDeg: number;
  /** Expansion time for the TOF aspect ratio, ms. */
  tofMs: number;
  imaging: ImagingInput;
}

/** Main thread → worker: compute one map. Cancelling terminates the worker (the solve is synchronous). */
export interface MapRequest extends MapSettings {
  type: 'compute';
  jobId: number;
  params: SampleParams;
}

/** Worker → main thread. */
export type MapReply =
  | { type: 'progress'; jobId: number; fraction: number }
  | { type: 'result'; jobId: number; thetaDeg: number[]; phiDeg: number[]; values: Float64Array; epsDd: number; elapsedMs: number }
  | { type: 'error'; jobId: number; message: string };

/** Sends a reply, handing over the listed buffers instead of copying them. */
export type PostReply = (reply: MapReply, transfer: Transferable[]) => void;

/**
 * Answers one request: progress after each grid row, then the map (its values buffer
 * transferred, not copied) or an error that says what to fix. Runs synchronously in the
 * worker; tests call it directly.
 */
export function runMapRequest(request: MapRequest, post: PostReply): void {
  const jobId = typeof request?.jobId === 'number' ? request.jobId : -1;
  if (request?.type !== 'compute') {
    post({ type: 'error', jobId, message: `unknown request type ${String(request?.type)}; expected "compute"` }, []);
    return;
  }
  const started = performance.now();
  try {
    const map = computeOrientationMap(request.params, {
      quantity: request.quantity,
      resolutionDeg: request.resolutionDeg,
      tofMs: request.tofMs,
      imaging: request.imaging,
      onProgress: (fraction) => post({ type: 'progress', jobId, fraction }, []),
    });
    const reply: MapReply = {
      type: 'result',
      jobId,
      thetaDeg: map.thetaDeg,
      phiDeg: map.phiDeg,
      values: map.values,
      epsDd: map.epsDd,
      elapsedMs: performance.now() - started,
    };
    post(reply, [map.values.buffer]);
  } catch (err) {
    const message = err instanceof PhysicsInputError ? `The sample profile cannot be mapped: ${err.message}` : `The map computation failed: ${err instanceof Error ? err.message : String(err)}`;
    post({ type: 'error', jobId, message }, []);
  }
}
