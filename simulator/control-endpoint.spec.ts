import { request } from 'node:http';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { startControlEndpoint, type ControlEndpoint } from './control-endpoint.js';
import { DEMO_PARAMETERS } from '../shared/apparatus/coil-data.js';
import { Simulation } from './simulation.js';

let sim: Simulation;
let endpoint: ControlEndpoint;

beforeEach(async () => {
  sim = new Simulation({ params: DEMO_PARAMETERS, startMs: 1.7e12, sampleRateHz: 1000, frameMs: 20, seed: 1, thermalSpeedup: 1, demo: false, demoIdleMs: 30_000 });
  endpoint = await startControlEndpoint(
    {
      state: () => ({ truth: sim.plant.truth(), faults: sim.plant.faults.list() }),
      injectFault: (f) => sim.plant.faults.add(f),
      clearFaults: () => sim.plant.faults.clear(),
      resetHardwareTrip: () => sim.plant.resetHardwareTrip(),
    },
    0,
  );
});
afterEach(() => endpoint.close());

const post = (path: string, body: unknown) =>
  fetch(endpoint.url + path, { method: 'POST', headers: { 'content-type': 'application/json' }, body: typeof body === 'string' ? body : JSON.stringify(body) });

describe('control endpoint', () => {
  it('listens on 127.0.0.1 only, on a free port when asked for port 0', () => {
    expect(endpoint.url).toBe(`http://127.0.0.1:${endpoint.port}`);
    expect(endpoint.port).toBeGreaterThan(0);
  });

  it('injects a fault with its defaults and clears every fault', async () => {
    const res = await post('/faults', { kind: 'cooling-loss', axis: 'y' });
    expect(res.status).toBe(201);
    expect(await res.json()).toEqual({ injected: { kind: 'cooling-loss', axis: 'y', residualLpm: 0 } });
    expect(sim.plant.faults.list()).toHaveLength(1);
    const cleared = await fetch(endpoint.url + '/faults', { method: 'DELETE' });
    expect(cleared.status).toBe(200);
    expect(sim.plant.faults.list()).toHaveLength(0);
  });

  it.each([
    [{ kind: 'meltdown' }, /kind must be one of/],
    [{ kind: 'sign-swap' }, /axis: axis must be "x", "y" or "z"/],
    [{ kind: 'supply-runaway', axis: 'x', voltsPerSecond: -1 }, /voltsPerSecond/],
    [{ kind: 'frozen-sensor', axis: 'x', channel: 'pressure' }, /channel/],
    [{ kind: 'sign-swap', axis: 'x', extra: 1 }, /Unrecognized key: "extra"/],
    [[1, 2], /body must be a JSON object/],
    ['{not json', /body must be JSON/],
  ])('answers 400 naming what to fix for %j', async (body, message) => {
    const res = await post('/faults', body);
    expect(res.status).toBe(400);
    expect(((await res.json()) as { error: string }).error).toMatch(message);
    expect(sim.plant.faults.list()).toHaveLength(0);
  });

  it('refuses the local reset with 409 while the trip cause holds', async () => {
    sim.plant.faults.add({ kind: 'cooling-loss', axis: 'x', residualLpm: 0 });
    for (let k = 0; k < 400; k++) sim.nextFrame(); // 8 s
    expect(sim.plant.hardwareTrip?.cause).toBe('low-flow');
    const res = await post('/reset', {});
    expect(res.status).toBe(409);
    expect(((await res.json()) as { error: string }).error).toMatch(/reset refused: low-flow on axis x still holds/);
  });

  it('accepts the local reset once the cause has cleared', async () => {
    const res = await post('/reset', {});
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ reset: true });
  });

  it('reports the internal truth on GET /state', async () => {
    const state = (await (await fetch(endpoint.url + '/state')).json()) as { truth: { flowLpm: { x: number } } };
    expect(state.truth.flowLpm.x).toBe(DEMO_PARAMETERS.coils.x.nominalFlowLpm);
  });

  it('answers unknown routes with 404 and wrong methods with 405', async () => {
    expect((await fetch(endpoint.url + '/nope')).status).toBe(404);
    expect((await fetch(endpoint.url + '/reset')).status).toBe(405);
  });

  /** A raw request with exactly these headers (fetch would not let a test set Host). */
  const raw = (method: string, path: string, headers: Record<string, string>, body?: string) =>
    new Promise<{ status: number; error?: string }>((resolve, reject) => {
      const req = request(endpoint.url + path, { method, headers: { ...headers, ...(body === undefined ? {} : { 'content-length': String(Buffer.byteLength(body)) }) } }, (res) => {
        let text = '';
        res.on('data', (d: Buffer) => (text += d.toString()));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, error: (JSON.parse(text) as { error?: string }).error }));
      });
      req.on('error', reject);
      req.end(body);
    });
  const holdTrip = () => {
    sim.plant.faults.add({ kind: 'cooling-loss', axis: 'x', residualLpm: 0 });
    for (let k = 0; k < 400; k++) sim.nextFrame();
    sim.plant.faults.clear();
    for (let k = 0; k < 400; k++) sim.nextFrame();
    expect(sim.plant.hardwareTrip).not.toBeNull();
  };

  it.each([
    ['a foreign Origin', { origin: 'http://attacker.example' }, 403, /cross-site request from "http:\/\/attacker\.example"/],
    ['Origin null (a sandboxed page or a file)', { origin: 'null' }, 403, /cross-site/],
    ['another local port as Origin', { origin: 'http://127.0.0.1:1' }, 403, /cross-site/],
    ['a non-loopback Host (DNS rebinding)', { host: 'attacker.example:4281' }, 403, /requests addressed to this machine/],
    ['a browser-marked cross-site request', { 'sec-fetch-site': 'cross-site' }, 403, /Sec-Fetch-Site: cross-site/],
  ])('refuses a hardware-trip reset with %s, and the trip stays', async (_what, headers, status, message) => {
    holdTrip();
    const answer = await raw('POST', '/reset', headers);
    expect(answer.status).toBe(status);
    expect(answer.error).toMatch(message);
    expect(sim.plant.hardwareTrip).not.toBeNull();
  });

  it.each([
    ['text/plain', 'text/plain'],
    ['a form post', 'application/x-www-form-urlencoded'],
    ['no Content-Type', undefined],
  ])('takes a body only as JSON: refuses %s with 415 and injects nothing', async (_what, type) => {
    const headers: Record<string, string> = type === undefined ? {} : { 'content-type': type };
    const answer = await raw('POST', '/faults', headers, '{"kind":"cooling-loss","axis":"x"}');
    expect(answer.status).toBe(415);
    expect(answer.error).toMatch(/Content-Type: application\/json/);
    expect(sim.plant.faults.list()).toHaveLength(0);
  });

  it('keeps working for local tools: loopback Host names, its own Origin, a JSON body, a bodiless reset', async () => {
    for (const host of ['localhost', `localhost:${endpoint.port}`, `127.0.0.1:${endpoint.port}`, `[::1]:${endpoint.port}`]) {
      expect((await raw('GET', '/state', { host })).status).toBe(200);
    }
    expect((await raw('GET', '/state', { origin: `http://127.0.0.1:${endpoint.port}` })).status).toBe(200);
    expect((await raw('POST', '/faults', { 'content-type': 'application/json; charset=utf-8' }, '{"kind":"sign-swap","axis":"x"}')).status).toBe(201);
    expect((await raw('DELETE', '/faults', {})).status).toBe(200);
    holdTrip();
    expect(await raw('POST', '/reset', {})).toEqual({ status: 200, error: undefined });
  });
});
