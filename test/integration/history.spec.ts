import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { HistoryResponse } from '../../shared/history/history-api.js';
import { withAlarmMarks } from '../../shared/levels/channel-bands.js';
import type { LiveState } from '../../shared/live/live-state.js';
import type { RunRecord } from '../../shared/steering/steering-api.js';
import { HISTORY_CSV_COLUMNS } from '../../server/history/history-csv.js';
import { signIn, startStack, waitFor, type Stack } from '../support/stack.js';

type Role = 'viewer' | 'operator' | 'lead';

/**
 * History on the real stack (broker, simulated controller, server, storage worker): what
 * `/api/history` returns for a moment is what `/api/live` said then, the CSV export has the
 * JSON's points, a run's window holds its shots, and bad windows are refused naming the
 * parameter.
 */
describe('history: stored window of telemetry, predictions and records', () => {
  let stack: Stack;
  const tokens = new Map<Role, string>();
  let firstDataMs = 0;

  beforeAll(async () => {
    stack = await startStack({ env: { LOG_LEVEL: 'error', TILTWATCH_STALE_TRIP_MS: '3000' }, simulatorOptions: { demo: true } });
    for (const role of ['viewer', 'operator', 'lead'] as const) tokens.set(role, await signIn(stack.server.url, role));
    firstDataMs = Date.parse(await waitFor(async () => (await live()).time ?? undefined, 'the first telemetry'));
    await waitFor(async () => ((await live()).prediction ? true : undefined), 'the first prediction from the controller', 20_000);
    // The first window below starts 1 s before its first moment: let a prediction be in force by then.
    await new Promise((resolve) => setTimeout(resolve, 1500));
  });
  afterAll(async () => {
    await stack?.close();
  });

  async function api<T>(role: Role, method: string, path: string, body?: unknown): Promise<{ status: number; body: T; res: Response }> {
    const res = await fetch(`${stack.server.url}${path}`, {
      method,
      headers: { authorization: `Bearer ${tokens.get(role)}`, 'content-type': 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const text = await res.text();
    return { status: res.status, body: (res.headers.get('content-type')?.includes('json') ? JSON.parse(text) : text) as T, res };
  }
  const live = async () => (await api<LiveState>('viewer', 'GET', '/api/live')).body;
  const history = async (query: string) => api<HistoryResponse>('viewer', 'GET', `/api/history?${query}`);
  const iso = (ms: number) => new Date(ms).toISOString();

  it('returns for each moment what the live state said then', async () => {
    const seen: LiveState[] = [];
    for (let i = 0; i < 8; i++) {
      const l = await live();
      if (l.time && seen.at(-1)?.time !== l.time) seen.push(l);
      await new Promise((r) => setTimeout(r, 150));
    }
    const fromMs = Date.parse(seen[0].time!) - 1000;
    const toMs = Date.parse(seen.at(-1)!.time!) + 100;
    const { status, body } = await history(`from=${iso(fromMs)}&to=${iso(toMs)}`);
    expect(status).toBe(200);
    expect(body).toMatchObject({ from: iso(fromMs), to: iso(toMs), resolutionMs: 10, source: 'raw', run: null });
    const { series } = body;
    expect(series.t.length).toBeGreaterThan(100);
    expect(series.t.every((t, i) => i === 0 || t > series.t[i - 1])).toBe(true);
    for (const l of seen) {
      // Live shows the mean of the newest 20 ms frame, which ends at `time`: the 10 ms points just before it.
      const endMs = Date.parse(l.time!);
      const near = series.t.flatMap((t, i) => (t > endMs - 20 && t <= endMs ? [i] : []));
      expect(near.length).toBeGreaterThan(0);
      const mean = (values: (number | null)[]) => near.reduce((s, i) => s + (values[i] ?? Number.NaN), 0) / near.length;
      // How far the values move across the frame and its neighbours: while the demo program
      // ramps, a 10 ms block that straddles two frames differs from the frame's own mean by that much.
      const around = series.t.flatMap((t, i) => (t > endMs - 40 && t <= endMs + 20 ? [i] : []));
      const spread = (values: (number | null)[]) => Math.max(...around.map((i) => values[i] ?? Number.NaN)) - Math.min(...around.map((i) => values[i] ?? Number.NaN));
      // Within the current noise of the demo controller (a few mA on several A) and that spread.
      expect(Math.abs(mean(series.bMagG) - l.field!.magnitude)).toBeLessThan(0.005 + spread(series.bMagG));
      expect(Math.abs(mean(series.thetaDeg) - l.field!.thetaDeg!)).toBeLessThan(0.05 + spread(series.thetaDeg));
      expect(Math.abs(mean(series.phiDeg) - l.field!.phiDeg!)).toBeLessThan(0.05 + spread(series.phiDeg));
      expect(Math.abs(mean(series.currentA.x) - l.currents!.x)).toBeLessThan(0.005 + spread(series.currentA.x));
      // σ from the same calibration covariance at (almost) the same currents.
      expect(mean(series.sigmaThetaDeg)).toBeCloseTo(l.fieldUncertainty!.thetaDeg!, 3);
      expect(mean(series.sigmaBMagG)).toBeCloseTo(l.fieldUncertainty!.magnitudeGauss, 4);
    }
    expect(body.slow.t.length).toBeGreaterThan(5);
    expect(body.slow.temperatureC.x.every((v) => v > 0 && v < 100)).toBe(true);
    // The prediction shown last is stored and in force at the end of the window.
    const shown = seen.at(-1)!.prediction!;
    const i = body.prediction.t.lastIndexOf(Date.parse(shown.computedAt));
    expect(i).toBeGreaterThanOrEqual(0);
    expect(body.prediction.tofAspect[i]).toBeCloseTo(shown.tofAspect!, 4);
    expect(body.prediction.camera[i]?.tofMs).toBe(shown.camera?.tofMs);
    expect(body.prediction.t[0]).toBeLessThanOrEqual(fromMs + 1000);
    // Whether it applied, and the versions in force, as Live had them.
    expect(body.prediction.status.state.at(-1)).toBe(seen.at(-1)!.predictionStatus.state);
    expect(body.inForce.calibrations.map((c) => c.version)).toEqual([seen.at(-1)!.calibration!.version]);
    expect(body.inForce.profiles.map((p) => p.profile.id)).toEqual([shown.profileId]);
    const [alarmLimits] = body.inForce.alarmLimits;
    expect(body.inForce.alarmLimits).toHaveLength(1);
    expect(body.inForce.levels.map((l) => withAlarmMarks(l.bands, alarmLimits.limits))).toEqual([(await api('viewer', 'GET', '/api/channels')).body]);
  });

  it('serves older or longer windows from the 1 s roll-ups, agreeing with the raw points', async () => {
    // Three 2 s blocks of whole seconds of telemetry.
    const fromMs = Math.ceil((firstDataMs + 1000) / 2000) * 2000;
    const toMs = fromMs + 6000;
    // A second is rolled up once data 1.5 s past its end has arrived, and stored at the next hand-over.
    await waitFor(() => (Date.now() > toMs + 3000 ? true : undefined), 'the window to be rolled up', 15_000);
    await waitFor(async () => ((await history(`from=${iso(fromMs)}&to=${iso(toMs)}&points=3`)).body.series.t.length === 3 ? true : undefined), 'the roll-ups of the window');
    const rolled = (await history(`from=${iso(fromMs)}&to=${iso(toMs)}&points=3`)).body;
    expect(rolled).toMatchObject({ source: 'rollup', resolutionMs: 2000 });
    const rolledCsv = parse((await api<string>('viewer', 'GET', `/api/history?from=${iso(fromMs)}&to=${iso(toMs)}&points=3&format=csv`)).body, { columns: true }) as Record<string, string>[];
    expect(rolledCsv.map((row) => [Number(row.time_unix_ms), Number(row.field_phi_deg), Number(row.coil_temperature_y_degC)])).toEqual(
      rolled.series.t.map((t, k) => [t, rolled.series.phiDeg[k], rolled.slow.temperatureC.y[k]]),
    );
    const raw = (await history(`from=${iso(fromMs)}&to=${iso(toMs)}&points=3000`)).body;
    expect(raw).toMatchObject({ source: 'raw', resolutionMs: 10 });
    // 200 ms points come from the stored 100 ms block means, not the samples: the same means.
    const coarse = (await history(`from=${iso(fromMs)}&to=${iso(toMs)}&points=30`)).body;
    expect(coarse).toMatchObject({ source: 'raw', resolutionMs: 200 });
    expect(coarse.series.t.length).toBe(30);
    coarse.series.t.forEach((t, k) => {
      const inBlock = raw.series.t.flatMap((rt, i) => (Math.floor(rt / 200) === Math.floor(t / 200) ? [i] : []));
      const mean = inBlock.reduce((s, i) => s + raw.series.currentA.x[i], 0) / inBlock.length;
      expect(coarse.series.currentA.x[k]).toBeCloseTo(mean, 4);
    });
    rolled.series.t.forEach((t, k) => {
      const inBlock = raw.series.t.flatMap((rt, i) => (Math.abs(rt - t) < 1000 ? [i] : []));
      const mean = (values: number[]) => inBlock.reduce((s, i) => s + values[i], 0) / inBlock.length;
      expect(rolled.series.currentA.y[k]).toBeCloseTo(mean(raw.series.currentA.y), 3);
      expect(rolled.series.bMagG[k]).toBeCloseTo(mean(raw.series.bMagG), 3);
      expect(rolled.series.sigmaThetaDeg[k]).toBeCloseTo(mean(raw.series.sigmaThetaDeg as number[]), 3);
    });
  });

  it('exports the same points as CSV, streamed as an attachment with units in the header', async () => {
    const toMs = Date.now() - 500;
    const query = `from=${iso(toMs - 3000)}&to=${iso(toMs)}&points=150`;
    const json = (await history(query)).body;
    const { status, body, res } = await api<string>('viewer', 'GET', `/api/history?${query}&format=csv`);
    expect(status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    expect(res.headers.get('content-disposition')).toMatch(/^attachment; filename="?tiltwatch-history-\d{8}T\d{6}Z-\d{8}T\d{6}Z\.csv"?$/);
    const rows = parse(body, { columns: true }) as Record<(typeof HISTORY_CSV_COLUMNS)[number], string>[];
    expect(Object.keys(rows[0])).toEqual([...HISTORY_CSV_COLUMNS]);
    expect(rows.length).toBe(json.series.t.length);
    rows.forEach((row, i) => {
      expect(Number(row.time_unix_ms)).toBe(json.series.t[i]);
      expect(row.time_utc).toBe(iso(json.series.t[i]));
      expect(Number(row.current_z_A)).toBe(json.series.currentA.z[i]);
      expect(Number(row.field_magnitude_G)).toBe(json.series.bMagG[i]);
      expect(Number(row.field_theta_deg)).toBe(json.series.thetaDeg[i]);
      expect(Number(row.sigma_field_phi_deg)).toBe(json.series.sigmaPhiDeg[i]);
    });
    expect(rows.at(-1)!.coil_temperature_x_degC).not.toBe('');
    expect(rows.at(-1)!.predicted_tof_aspect_1).not.toBe('');
    // Whether the prediction applied: the state in force at each row, as the JSON answer has it.
    const { status: changes } = json.prediction;
    expect(changes.t.length).toBeGreaterThan(0);
    rows.forEach((row) => {
      const k = changes.t.findLastIndex((t) => t <= Number(row.time_unix_ms));
      expect(row.prediction_state).toBe(k < 0 ? '' : changes.state[k]);
      expect(row.prediction_not_applying_because).toBe(k < 0 ? '' : (changes.reason[k] ?? ''));
    });
  });

  it("gives a run's window with its shots and steps as events", async () => {
    const steps = [
      { kind: 'ramp', magnitudeG: 7, thetaDeg: 30, phiDeg: 0, durationMs: 1000 },
      { kind: 'hold', durationMs: 500 },
      { kind: 'shot', label: 'θ 30°' },
      { kind: 'ramp', magnitudeG: 7, thetaDeg: 50, phiDeg: 0, durationMs: 1000 },
      { kind: 'shot', label: 'θ 50°' },
    ];
    const saved = await api<{ id: number }>('lead', 'POST', '/api/sequences', { name: 'History scan', steps, reason: 'history test' });
    const started = await api<{ runId: number }>('operator', 'POST', `/api/sequences/${saved.body.id}/run`, { reason: 'history test' });
    expect(started.status).toBe(201);
    const run = await waitFor(async () => {
      const r = (await api<RunRecord>('viewer', 'GET', `/api/runs/${started.body.runId}`)).body;
      return r.state === 'running' ? undefined : r;
    }, 'the run to end', 20_000);
    expect(run.state).toBe('done');
    const noteAt = iso(Date.parse(run.shots[0].at) + 100);
    expect((await api('operator', 'POST', '/api/logbook/entries', { text: 'Cloud looks rounder than predicted\nat the first angle', at: noteAt })).status).toBe(201);
    const { status, body } = await history(`run=${run.id}`);
    expect(status).toBe(200);
    expect(body.from).toBe(iso(Date.parse(run.startedAt) - 5000));
    expect(body.to).toBe(iso(Date.parse(run.endedAt!) + 5000));
    expect(body.run).toMatchObject({ id: run.id, state: 'done', startedAt: run.startedAt, endedAt: run.endedAt });
    const shots = body.events.filter((e) => e.kind === 'shot');
    expect(shots.map((e) => e.id)).toEqual(run.shots.map((s) => s.id));
    expect(shots.map((e) => e.at)).toEqual(run.shots.map((s) => s.at));
    expect(body.events.filter((e) => e.kind === 'run').map((e) => e.label)).toEqual([expect.stringMatching(/^Run \d+ started: sequence "History scan"/), `Run ${run.id} done`]);
    // Each step's start, in order, between the run's start and its first shot for the first three.
    const stepMarks = body.events.filter((e) => e.kind === 'step');
    expect(stepMarks.map((e) => e.label)).toEqual([
      `Run ${run.id} step 1: ramp to |B| 7 G, θ 30°, φ 0° over 1.0 s`,
      `Run ${run.id} step 2: hold for 0.5 s`,
      `Run ${run.id} step 3: shot "θ 30°"`,
      `Run ${run.id} step 4: ramp to |B| 7 G, θ 50°, φ 0° over 1.0 s`,
      `Run ${run.id} step 5: shot "θ 50°"`,
    ]);
    expect(stepMarks.map((e) => e.detail)).toEqual(Array.from({ length: 5 }, () => expect.stringMatching(/^Done after \d+\.\d s$/)));
    expect(stepMarks[0].t).toBeGreaterThanOrEqual(Date.parse(run.startedAt));
    expect(stepMarks[2].t).toBeLessThanOrEqual(Date.parse(run.shots[0].at));
    expect(stepMarks[3].t - stepMarks[1].t).toBeGreaterThanOrEqual(500);
    expect(body.events.find((e) => e.kind === 'note')).toMatchObject({ at: noteAt, label: 'Logbook: Cloud looks rounder than predicted', actor: 'operator@tiltwatch.example' });
    expect(body.events.map((e) => e.t)).toEqual([...body.events.map((e) => e.t)].sort((a, b) => a - b));
    // The shot's stored field is what the history shows at its moment.
    const shotMs = Date.parse(run.shots[0].at);
    const k = body.series.t.findIndex((t) => t >= shotMs);
    expect(Math.abs(body.series.thetaDeg[k]! - run.shots[0].field.thetaDeg!)).toBeLessThan(0.1);
    const csv = await api<string>('viewer', 'GET', `/api/history?run=${run.id}&format=csv&points=500`);
    expect(csv.res.headers.get('content-disposition')).toMatch(new RegExp(`filename="?tiltwatch-run-${run.id}\\.csv`));
    expect((await history('run=999999')).status).toBe(404);
    // Steering commands are marks too: the run left the field held; release it.
    const releasedFrom = Date.now() - 1000;
    expect((await api('operator', 'POST', '/api/steering/release', { reason: 'end of the history scan' })).status).toBe(200);
    const after = (await history(`from=${iso(releasedFrom)}&to=${iso(Date.now() + 1000)}&points=10`)).body;
    expect(after.events.filter((e) => e.kind === 'steer')).toEqual([
      expect.objectContaining({ label: 'Steering released to the controller', actor: 'operator@tiltwatch.example', detail: 'end of the history scan' }),
    ]);
  });

  it('refuses a malformed, reversed or too long window naming the parameter', async () => {
    const cases: [string, RegExp][] = [
      ['', /from, to: give a window/],
      ['from=yesterday&to=2026-12-02T06:00:00Z', /from: must be a date and time/],
      ['from=2026-12-02T06:00:00Z', /to: missing/],
      ['to=2026-12-02T06:00:00Z', /from: missing/],
      ['from=2026-12-02T06:00:00Z&to=2026-12-02T05:00:00Z', /to: must be later than from/],
      ['from=2026-11-01T00:00:00Z&to=2026-12-02T00:00:00Z', /to: the window may be at most 7 days/],
      ['from=2026-12-02T05:00:00Z&to=2026-12-02T06:00:00Z&points=1', /points: must be a whole number from 2/],
      ['from=2026-12-02T05:00:00Z&to=2026-12-02T06:00:00Z&points=50000', /points: must be a whole number from 2 to 20000/],
      ['from=2026-12-02T05:00:00Z&to=2026-12-02T06:00:00Z&format=xml', /format: must be json or csv/],
      ['run=1&from=2026-12-02T05:00:00Z', /run: give either run or from and to/],
      ['run=abc', /run: must be a whole number/],
    ];
    for (const [query, message] of cases) {
      const { status, body } = await history(query);
      expect({ query, status }).toEqual({ query, status: 400 });
      expect((body as unknown as { error: string }).error).toMatch(message);
    }
    const res = await fetch(`${stack.server.url}/api/history?from=2026-12-02T05:00:00Z&to=2026-12-02T06:00:00Z`);
    expect(res.status).toBe(401);
  });
});
