import { parentPort } from 'node:worker_threads';
import { criticalEpsDd } from '../../shared/physics/critical.js';
import { GroundStateSolver, type SolverState } from '../../shared/physics/ground-state.js';
import { predict, type WarmStart } from '../../shared/physics/predict.js';
import { sampleScales } from '../../shared/physics/sample.js';
import { cameraView } from './camera-view.js';
import { fieldDirectionOf } from './field-direction.js';
import type { PathPrediction, WorkerReply, WorkerRequest, WorkerSummary } from './prediction-protocol.js';
import { lowerThisThreadPriority } from '../workers/background-priority.js';

/**
 * Body of the prediction worker thread: solves one request at a time, so the server's event
 * loop never runs the model. The solver's scratch memory and the previous solution live
 * here; each prediction starts from the last one (the field moves little between requests).
 */
const port = parentPort;
if (!port) throw new Error('prediction-worker.ts must run in a worker thread');
// Background work: the event loop (ingest, supervision, fan-out) comes first when CPU is short.
lowerThisThreadPriority();

let warm: WarmStart | undefined;

port.on('message', (request: WorkerRequest) => {
  let reply: WorkerReply;
  try {
    reply = request.kind === 'predict' ? solvePrediction(request) : request.kind === 'path' ? solvePath(request) : solveCritical(request);
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

/** Relative precision of ε_dd,crit along a planned path: a limit check needs three digits, not six. */
const PATH_CRITICAL_TOLERANCE = 1e-3;
const PATH_NEIGHBOUR_STEP = 1 + 3 * PATH_CRITICAL_TOLERANCE;
const pathSolver = new GroundStateSolver();

function solvePath(request: Extract<WorkerRequest, { kind: 'path' }>): WorkerReply {
  const { lambda } = sampleScales(request.params);
  // Its own warm-start chains: neighbouring path points differ little, and the live solution is left alone.
  let chain: WarmStart | undefined = warm && { state: warm.state };
  let hint: { eps: number; state: SolverState | null } | null = null;
  const points = request.directions.map((direction): PathPrediction => {
    const p = predict(request.params, direction, { tofMs: [request.tofMs], imaging: request.imaging, warm: chain });
    if (p.stable) chain = p.warm;
    const e = fieldDirectionOf(direction.thetaDeg, direction.phiDeg).unit;
    const c = hint && hint.state && Number.isFinite(hint.eps)
      ? criticalEpsDd(pathSolver, lambda, e, { tolerance: PATH_CRITICAL_TOLERANCE, startEpsDd: hint.eps / PATH_NEIGHBOUR_STEP, startState: hint.state, growth: PATH_NEIGHBOUR_STEP })
      : criticalEpsDd(pathSolver, lambda, e, { tolerance: PATH_CRITICAL_TOLERANCE });
    hint = { eps: c.epsDdCritical, state: c.state };
    const tof = p.tof?.[0];
    return {
      fermiSurfaceAspect: p.fermiSurface?.aspectRatio ?? null,
      cloudAspect: p.cloud?.aspectRatios.r1OverR3 ?? null,
      tofAspect: tof?.aspectRatio ?? null,
      tofMajorAngleDeg: tof?.majorAngleDeg ?? null,
      epsDdCritical: Number.isFinite(c.epsDdCritical) && c.epsDdCritical > 0 ? c.epsDdCritical : null,
    };
  });
  return { kind: 'path', jobId: request.jobId, points };
}
