import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { InterlockStatus } from '../../shared/alarms/alarm-api.js';
import type { LiveState } from '../../shared/live/live-state.js';
import { centralAngleDeg } from '../../shared/steering/great-circle.js';
import type { PreflightResult, RunRecord, SequenceRecord, SteeringStatus } from '../../shared/steering/steering-api.js';
import { targetVector } from '../../shared/steering/target.js';
import { signIn, startStack, waitFor, type Stack } from '../support/stack.js';

type Role = 'viewer' | 'operator' | 'lead';

/**
 * Steering with the real broker, simulator and server: a target is pre-flighted, reached along
 * its path and held with the controller kept in remote mode; an impossible target is refused
 * with its failed checks and nothing is sent; a trip stops steering and refuses targets.
 */
describe('steering: server → broker → simulated controller', () => {
  let stack: Stack;
  const tokens = new Map<Role, string>();

  beforeAll(async () => {
    // Staleness is not under test here: a generous limit keeps a loaded test machine from tripping on it.
    stack = await startStack({ env: { LOG_LEVEL: 'error', TILTWATCH_STALE_TRIP_MS: '3000' }, simulatorOptions: { demo: true, thermalSpeedup: 30 } });
    for (const role of ['viewer', 'operator', 'lead'] as const) tokens.set(role, await signIn(stack.server.url, role));
    await waitFor(async () => ((await live()).field ? true : undefined), 'the first field from the controller');
  });
  afterAll(async () => {
    await stack?.close();
  });

  async function api<T>(role: Role, method: string, path: string, body?: unknown): Promise<{ status: number; body: T }> {
    const res = await fetch(`${stack.server.url}${path}`, {
      method,
      headers: { authorization: `Bearer ${tokens.get(role)}`, 'content-type': 'application/json' },
      body: body === undefined ? undefined : typeof body === 'string' ? body : JSON.stringify(body),
    });
    return { status: res.status, body: (await res.json()) as T };
  }
  async function sim(method: string, path: string, body?: unknown): Promise<number> {
    const res = await fetch(`${stack.simulator!.controlUrl}${path}`, { method, headers: { 'content-type': 'application/json' }, body: body === undefined ? undefined : JSON.stringify(body) });
    await res.arrayBuffer();
    return res.status;
  }
  async function recover(): Promise<void> {
    expect(await sim('DELETE', '/faults')).toBe(200);
    await waitFor(async () => ((await sim('POST', '/reset')) === 200 ? true : undefined), 'the local hardware reset', 15_000);
    await waitFor(async () => ((await api('operator', 'POST', '/api/interlock/reset', { reason: 'flow back' })).status === 200 ? true : undefined), 'the interlock reset', 15_000);
  }
  const live = async () => (await api<LiveState>('viewer', 'GET', '/api/live')).body;
  const steering = async () => (await api<SteeringStatus>('viewer', 'GET', '/api/steering')).body;
  const interlock = async () => (await api<InterlockStatus>('viewer', 'GET', '/api/interlock')).body;
  const target = { magnitudeG: 9, thetaDeg: 54.7, phiDeg: 120, rampMs: 3000, reason: 'magic angle for the afternoon scan' };

  async function reached(t: { magnitudeG: number; thetaDeg: number; phiDeg: number }): Promise<LiveState> {
    return waitFor(async () => {
      const l = await live();
      if (!l.field) return undefined;
      const off = centralAngleDeg(l.field.vector, targetVector(t));
      return off < 0.5 && Math.abs(l.field.magnitude - t.magnitudeG) < 0.05 ? l : undefined;
    }, `the field to reach ${JSON.stringify(t)}`, 15_000);
  }

  it('refuses viewers and malformed values', async () => {
    expect((await api('viewer', 'POST', '/api/steering/preflight', target)).status).toBe(403);
    expect((await api('viewer', 'POST', '/api/steering/target', target)).status).toBe(403);
    for (const bad of [
      { ...target, magnitudeG: 1e308 },
      { ...target, thetaDeg: 181 },
      { ...target, phiDeg: 360 },
      { ...target, rampMs: -1 },
      { ...target, magnitudeG: '9' },
      { ...target, reason: '' },
      { ...target, reason: 'bad \u0000 text' },
      { ...target, reason: 'lone \ud800 surrogate' },
      { ...target, extra: 1 },
    ]) {
      const res = await api<{ error: string }>('operator', 'POST', '/api/steering/target', bad);
      expect(res.status, JSON.stringify(bad)).toBe(400);
    }
    const named = await api<{ error: string; field: string }>('operator', 'POST', '/api/steering/preflight', { ...target, thetaDeg: 200 });
    expect(named.body).toMatchObject({ error: expect.stringMatching(/^θ \(from trap z\) must be at most 180/), field: 'thetaDeg' });
    expect((await steering()).mode).toBe('idle');
  });

  it('pre-flights a target without sending anything', async () => {
    const res = await api<PreflightResult>('operator', 'POST', '/api/steering/preflight', target);
    expect(res.status).toBe(200);
    expect(res.body.checks.filter((c) => !c.ok)).toEqual([]);
    expect(res.body.ok).toBe(true);
    expect(res.body.checks.map((c) => c.name)).toEqual(['controller', 'interlock', 'field-magnitude', 'currents', 'ramp-rate', 'coil-temperature', 'collapse-ratio']);
    for (const c of res.body.checks) expect(Object.keys(c)).toEqual(expect.arrayContaining(['name', 'ok', 'value', 'limit', 'message']));
    expect(res.body.path.length).toBeGreaterThan(10);
    const last = res.body.path.at(-1)!;
    expect(last.magnitudeG).toBeCloseTo(9, 9);
    expect(last.collapseRatio).toBeGreaterThan(0);
    expect(last.fermiSurfaceAspect).toBeGreaterThan(1);
    expect((await steering()).mode).toBe('idle');
    expect((await live()).controller.mode).toBe('demo');
  });

  it('steers to the target, reaches it and holds it in remote mode', async () => {
    const res = await api<PreflightResult>('operator', 'POST', '/api/steering/target', target);
    expect(res.status).toBe(200);
    expect(res.body.checks.every((c) => c.ok)).toBe(true);
    const status = await steering();
    expect(status).toMatchObject({ mode: 'ramping', actor: 'operator@tiltwatch.example', reason: target.reason });
    await waitFor(async () => ((await live()).controller.mode === 'remote' ? true : undefined), 'the controller to take remote mode');
    await reached(target);
    await waitFor(async () => ((await steering()).mode === 'holding' ? true : undefined), 'the hold');
    // Still held (and remote) a while later: the setpoints keep coming at the hold rate.
    await new Promise((r) => setTimeout(r, 1500));
    const held = await reached(target);
    expect(held.controller.mode).toBe('remote');
  });

  it('refuses an impossible target with its failed checks and sends nothing', async () => {
    const before = (await live()).setpoints!;
    const res = await api<PreflightResult & { error: string }>('operator', 'POST', '/api/steering/target', { ...target, magnitudeG: 40, rampMs: 100 });
    expect(res.status).toBe(422);
    const failed = res.body.checks.filter((c) => !c.ok).map((c) => c.name);
    expect(failed).toEqual(expect.arrayContaining(['field-magnitude', 'currents', 'ramp-rate']));
    await new Promise((r) => setTimeout(r, 300));
    const after = (await live()).setpoints!;
    for (const a of ['x', 'y', 'z'] as const) expect(after[a]).toBeCloseTo(before[a], 6);
    expect((await steering()).target).toMatchObject({ magnitudeG: 9 });
  });

  it('saves sequences as a lead only, naming a bad step', async () => {
    const steps = [{ kind: 'ramp', magnitudeG: 7, thetaDeg: 30, phiDeg: 0, durationMs: 1500 }, { kind: 'shot', label: 'first' }];
    expect((await api('operator', 'POST', '/api/sequences', { name: 'Short scan', steps, reason: 'test' })).status).toBe(403);
    const bad = await api<{ error: string; field: string }>('lead', 'POST', '/api/sequences', { name: 'Short scan', steps: [...steps, { kind: 'ramp', magnitudeG: 7, thetaDeg: 200, phiDeg: 0, durationMs: 1000 }], reason: 'test' });
    expect(bad.status).toBe(400);
    expect(bad.body).toMatchObject({ error: expect.stringMatching(/Step 3 \(ramp\): θ must be at most 180/), field: 'steps.2.thetaDeg' });
    const first = await api<{ id: number; version: number }>('lead', 'POST', '/api/sequences', { name: 'Short scan', steps, reason: 'test' });
    expect(first.status).toBe(201);
    expect(first.body.version).toBe(1);
    const second = await api<{ id: number; version: number }>('lead', 'POST', '/api/sequences', { name: 'Short scan', steps: [...steps, { kind: 'hold', durationMs: 500 }], reason: 'longer' });
    expect(second.body.version).toBe(2);
    const list = (await api<{ sequences: SequenceRecord[] }>('viewer', 'GET', '/api/sequences')).body.sequences;
    expect(list.map((q) => q.name)).toEqual(expect.arrayContaining(['Tilt scan, x–z plane, 8 G', 'Magic-angle check, 6 G', 'Short scan']));
  });

  it('runs a sequence: ramps, holds and shots with the measured field and the prediction', async () => {
    const steps = [
      { kind: 'ramp', magnitudeG: 7, thetaDeg: 20, phiDeg: 0, durationMs: 1500 },
      { kind: 'hold', durationMs: 2000 },
      { kind: 'shot', label: 'θ 20°' },
      { kind: 'ramp', magnitudeG: 7, thetaDeg: 60, phiDeg: 0, durationMs: 1500 },
      { kind: 'hold', durationMs: 2000 },
      { kind: 'shot', label: 'θ 60°' },
    ];
    const saved = await api<{ id: number }>('lead', 'POST', '/api/sequences', { name: 'Two angles', steps, reason: 'test' });
    expect((await api('viewer', 'POST', `/api/sequences/${saved.body.id}/run`, { reason: 'x' })).status).toBe(403);
    const started = await api<{ runId: number }>('operator', 'POST', `/api/sequences/${saved.body.id}/run`, { reason: 'afternoon scan' });
    expect(started.status).toBe(201);
    const runId = started.body.runId;
    expect((await api('operator', 'POST', `/api/sequences/${saved.body.id}/run`, { reason: 'again' })).status).toBe(409);
    expect((await api('operator', 'POST', '/api/steering/target', target)).status).toBe(409);
    const run = await waitFor(async () => {
      const r = (await api<RunRecord>('viewer', 'GET', `/api/runs/${runId}`)).body;
      return r.state === 'running' ? undefined : r;
    }, 'the run to end', 20_000);
    expect(run).toMatchObject({ id: runId, sequenceId: saved.body.id, state: 'done', stepCount: 6 });
    expect(run.endedAt).not.toBeNull();
    expect(run.shots.map((s) => s.label)).toEqual(['θ 20°', 'θ 60°']);
    for (const [i, shot] of run.shots.entries()) {
      expect(shot.id).toMatch(/^shot-\d{8}T\d{6}Z-r\d+-[0-9a-f]{6}$/);
      // The measured field at the shot: settled on the step's target (within what a loaded test machine allows).
      expect(Math.abs(shot.field.magnitude - 7)).toBeLessThan(0.3);
      expect(Math.abs(shot.field.thetaDeg! - [20, 60][i])).toBeLessThan(3);
      expect(shot.prediction!.fermiSurfaceAspect).toBeGreaterThan(1);
      expect(shot.prediction!.collapseRatio).toBeGreaterThan(0);
      expect(Object.keys(shot.prediction!)).toEqual(expect.arrayContaining(['fermiSurfaceAspect', 'cloudAspect', 'tofAspect', 'tofMajorAngleDeg', 'collapseRatio']));
    }
    expect(new Set(run.shots.map((s) => s.id)).size).toBe(2);
    const runs = (await api<{ runs: RunRecord[] }>('viewer', 'GET', '/api/runs')).body.runs;
    expect(runs[0].id).toBe(runId);
    // The last target stays held after the run, no longer tied to it.
    expect(await steering()).toMatchObject({ mode: 'holding', runId: null });
  });

  it('aborts a run and holds the present field', async () => {
    const saved = await api<{ id: number }>('lead', 'POST', '/api/sequences', {
      name: 'Long turn', steps: [{ kind: 'ramp', magnitudeG: 7, thetaDeg: 80, phiDeg: 90, durationMs: 8000 }, { kind: 'shot', label: 'end' }], reason: 'test',
    });
    const { runId } = (await api<{ runId: number }>('operator', 'POST', `/api/sequences/${saved.body.id}/run`, { reason: 'slow turn' })).body;
    await new Promise((r) => setTimeout(r, 1500));
    const aborted = await api<RunRecord>('operator', 'POST', `/api/runs/${runId}/abort`, { reason: 'wrong sample' });
    expect(aborted.status).toBe(200);
    expect(aborted.body).toMatchObject({ state: 'aborted', shots: [] });
    expect(aborted.body.endReason).toMatch(/operator@tiltwatch.example: wrong sample/);
    const status = await steering();
    expect(status.mode).toBe('holding');
    expect(status.runId).toBeNull();
    const held = status.target!;
    await new Promise((r) => setTimeout(r, 1000));
    const l = await live();
    expect(centralAngleDeg(l.field!.vector, targetVector(held))).toBeLessThan(1);
  });

  it('a trip during a run aborts it', async () => {
    const saved = await api<{ id: number }>('lead', 'POST', '/api/sequences', {
      name: 'Tripped', steps: [{ kind: 'ramp', magnitudeG: 7, thetaDeg: 30, phiDeg: 45, durationMs: 1000 }, { kind: 'hold', durationMs: 20_000 }, { kind: 'shot', label: 'never' }], reason: 'test',
    });
    const { runId } = (await api<{ runId: number }>('operator', 'POST', `/api/sequences/${saved.body.id}/run`, { reason: 'trip test' })).body;
    await new Promise((r) => setTimeout(r, 1200));
    expect(await sim('POST', '/faults', { kind: 'cooling-loss', axis: 'x' })).toBe(201);
    const run = await waitFor(async () => {
      const r = (await api<RunRecord>('viewer', 'GET', `/api/runs/${runId}`)).body;
      return r.state === 'aborted' ? r : undefined;
    }, 'the run to abort on the trip', 15_000);
    expect(run.endReason).toMatch(/interlock tripped/);
    expect(run.shots).toEqual([]);
    expect((await steering()).mode).toBe('idle');
    await recover();
  });

  it('stops on a trip and refuses targets with 409 until the reset', async () => {
    expect(await sim('POST', '/faults', { kind: 'cooling-loss', axis: 'y' })).toBe(201);
    await waitFor(async () => ((await interlock()).state === 'tripped' ? true : undefined), 'the trip');
    await waitFor(async () => ((await steering()).mode === 'idle' ? true : undefined), 'steering to stop');
    expect((await steering()).lastStop?.why).toMatch(/tripped/);
    const refused = await api<{ error: string }>('operator', 'POST', '/api/steering/target', target);
    expect(refused.status).toBe(409);
    const pre = await api<PreflightResult>('operator', 'POST', '/api/steering/preflight', target);
    expect(pre.body.checks.find((c) => c.name === 'interlock')!.ok).toBe(false);
    await recover();
  });
});
