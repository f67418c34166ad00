import { describe, expect, it } from 'vitest';
import { predict } from '../../../shared/physics/predict';
import { DEMO_PROFILE } from '../../../shared/profiles/demo-profile';
import { sampleParamsOf } from '../../../shared/profiles/sample-profile';
import { runMapRequest, type MapReply, type MapRequest } from './map-protocol';

const REQUEST: MapRequest = {
  type: 'compute',
  jobId: 7,
  params: sampleParamsOf(DEMO_PROFILE),
  quantity: 'fermiSurfaceAspect',
  resolutionDeg: 30,
  tofMs: 20,
  imaging: 'y',
};

/** Runs a request the way the worker does and collects what it posts. */
function run(request: MapRequest): { replies: MapReply[]; transfers: Transferable[][] } {
  const replies: MapReply[] = [];
  const transfers: Transferable[][] = [];
  runMapRequest(request, (reply, transfer) => {
    replies.push(reply);
    transfers.push(transfer);
  });
  return { replies, transfers };
}

describe('orientation-map worker protocol', () => {
  it('reports rising progress up to 1, then the map, all tagged with the job id', () => {
    const { replies } = run(REQUEST);
    const progress = replies.filter((r) => r.type === 'progress').map((r) => (r.type === 'progress' ? r.fraction : NaN));
    expect(progress.length).toBeGreaterThan(1);
    for (let i = 1; i < progress.length; i++) expect(progress[i]).toBeGreaterThan(progress[i - 1]);
    expect(progress.at(-1)).toBe(1);
    expect(replies.at(-1)?.type).toBe('result');
    expect(replies.every((r) => r.jobId === 7)).toBe(true);
  });

  it('hands the values buffer over instead of copying it', () => {
    const { replies, transfers } = run(REQUEST);
    const result = replies.at(-1);
    if (result?.type !== 'result') throw new Error('no result');
    expect(transfers.at(-1)).toEqual([result.values.buffer]);
  });

  it('gives the same β as a single prediction for a grid direction', () => {
    const result = run(REQUEST).replies.at(-1);
    if (result?.type !== 'result') throw new Error('no result');
    // Grid at 30°: θ = 60° is row 2, φ = 30° is column 1.
    const row = result.thetaDeg.indexOf(60);
    const col = result.phiDeg.indexOf(30);
    const single = predict(REQUEST.params, { thetaDeg: 60, phiDeg: 30 });
    // The map's warm-started solve and a cold solve agree to the minimiser's tolerance.
    expect(result.values[row * result.phiDeg.length + col]).toBeCloseTo(single.fermiSurface!.aspectRatio, 6);
  });

  it('answers a sample the model cannot take with an error that names the input', () => {
    const { replies } = run({ ...REQUEST, params: { ...REQUEST.params, atomNumber: 0 } });
    expect(replies).toEqual([{ type: 'error', jobId: 7, message: expect.stringMatching(/cannot be mapped: atomNumber must be a positive/) }]);
  });

  it('refuses a message that is not a compute request', () => {
    const { replies } = run({ ...REQUEST, type: 'stop' as 'compute' });
    expect(replies[0]).toMatchObject({ type: 'error', message: expect.stringMatching(/unknown request type stop/) });
  });
});
