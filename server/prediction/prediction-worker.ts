import { parentPort } from 'node:worker_threads';
import { predict, type WarmStart } from '../../shared/physics/predict.js';
import { cameraView } from './camera-view.js';
import { fieldDirectionOf } from './field-direction.js';
import type { WorkerReply, WorkerRequest, WorkerSummary } from './prediction-protocol.js';

/**
 * Body of the prediction worker thread: solves one request at a time, so the server's event
 * loop never runs the model. The solver's scratch memory and the previous solution live
 * here; each prediction starts from the last one (the field moves little between requests).
 */
const port = parentPort;
if (!port) throw new Error('prediction-worker.ts must run in a worker thread');

let warm: WarmStart | undefined;

port.on('message', (request: WorkerRequest) => {
  let reply: WorkerReply;
  try {
    reply = request.kind === 'predict' ? solvePrediction(request) : solveCritical(request);
  } catch (err) {
    reply = { kind: 'failed', jobId: request.jobId, message: err instanceof Error ? err.message : String(err) };
  }
  port.postMessage(reply);
});

function solvePrediction(request: Extract<WorkerRequest, { kind: 'predict' }>): WorkerReply {
  if (request.cold) warm = undefined;
  const field = { thetaDeg: request.thetaDeg, phiDeg: request.phiDeg };
  // t = 0 first: the in-situ image of the camera view.
  const p = predict(request.params, field, { tofMs: [0, request.tofMs], imaging: request.imaging, warm });
  warm = p.warm;
  const first = p.tof?.[1];
  const summary: WorkerSummary = {
    stable: p.stable,
    reason: p.reason ?? null,
    fermiSurfaceAspect: p.fermiSurface?.aspectRatio ?? null,
    cloudAspect: p.cloud?.aspectRatios.r1OverR3 ?? null,
    tofAspect: first?.aspectRatio ?? null,
    tofMajorAngleDeg: first?.majorAngleDeg ?? null,
    // A collapsed solve brings its own ε_dd,crit for the exact direction; a stable one gets
    // the cached cell value from the engine.
    collapseRatio: p.stable ? null : (p.collapseRatio ?? null),
    epsDd: p.epsDd,
    thetaDeg: request.thetaDeg,
    phiDeg: request.phiDeg,
    camera: p.stable ? cameraView(p, fieldDirectionOf(request.thetaDeg, request.phiDeg).unit, request.imaging) : null,
  };
  return { kind: 'predict', jobId: request.jobId, summary };
}

function solveCritical(request: Extract<WorkerRequest, { kind: 'critical' }>): WorkerReply {
  // Start from the latest live solution (a nearby direction) without replacing it.
  const p = predict(request.params, { thetaDeg: request.thetaDeg, phiDeg: request.phiDeg }, { computeCritical: true, warm: warm && { state: warm.state } });
  if (p.epsDdCritical === undefined) throw new Error('the model returned no critical ε_dd');
  return { kind: 'critical', jobId: request.jobId, epsDdCritical: p.epsDdCritical };
}
