import { asc, like } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../shared/auth/roles.js';
import type { MeasurementUploadResponse, ShotRow, ShotsResponse } from '../../shared/shots/shots-api.js';
import { openDatabase, type OpenDatabase } from '../db/database.js';
import { auditLog, shotMeasurements } from '../db/schema.js';
import type { RunningServer } from '../server.js';
import { createRun, addShot } from '../sequences/run-repository.js';
import { saveSequence } from '../sequences/sequence-repository.js';
import { testDatabaseUrl } from '../testing/external-services.js';
import { callApi, makeDataDir, removeDataDir, signIn, startTestServer } from '../testing/test-server.js';

const HEADER = 'shot, tof_aspect_ratio, tof_angle_deg, sigma_aspect_ratio';

/**
 * Measured TOF images over the API on a real server and database: shots of two runs are
 * written as the sequence runner writes them, then measurement files are uploaded.
 */
describe('shots measured against predicted', () => {
  let dir: string;
  let database: OpenDatabase;
  let server: RunningServer;
  const tokens = new Map<Role, string>();
  const runIds: number[] = [];
  let shotIds: string[] = [];
  const firstShotAt = new Date('2026-11-30T22:00:00Z');

  beforeAll(async () => {
    dir = await makeDataDir();
    database = await openDatabase({ dataDir: dir, databaseUrl: await testDatabaseUrl(dir) });
    const { db } = database;
    const sequence = await saveSequence(db, { name: 'Shots test scan', steps: [{ kind: 'shot', label: 'one' }], reason: 'test', actor: 'lead@tiltwatch.example' });
    for (let r = 0; r < 2; r++) {
      const runId = await createRun(db, { sequence, actor: 'operator@tiltwatch.example', reason: 'night scan', startedAt: new Date(firstShotAt.getTime() + r * 3_600_000) });
      runIds.push(runId);
      for (let i = 0; i < 6; i++) {
        const theta = i * 15;
        const shot = await addShot(db, {
          runId, stepIndex: i, label: `θ = ${theta}°`, at: new Date(firstShotAt.getTime() + r * 3_600_000 + i * 60_000), profileId: 1,
          field: { magnitude: 8, thetaDeg: theta, phiDeg: 0 },
          prediction: { fermiSurfaceAspect: 1.03, cloudAspect: 1.2, tofAspect: 1.02 - theta / 10_000, tofMajorAngleDeg: 90 - theta, collapseRatio: 0.4 },
        });
        shotIds.push(shot.id);
      }
    }
    server = await startTestServer(dir, { database });
    for (const role of ['viewer', 'operator', 'lead'] as const) tokens.set(role, await signIn(server, role));
  });
  afterAll(async () => {
    await server?.close();
    await database?.close();
    removeDataDir(dir);
  });

  async function upload(role: Role, text: string, name = 'imaging-2026-11-30.csv') {
    const form = new FormData();
    form.append('file', new Blob([text], { type: 'text/csv' }), name);
    const res = await fetch(`${server.url}/api/shots/measurements`, { method: 'POST', headers: { authorization: `Bearer ${tokens.get(role)}` }, body: form });
    return { status: res.status, body: (await res.json()) as MeasurementUploadResponse & { error?: string; field?: string } };
  }
  const get = <T>(path: string) => callApi<T>(server, tokens.get('viewer'), 'GET', path);
  const shotsOfRun = async (runId: number) => (await get<ShotsResponse>(`/api/shots?run=${runId}`)).body.shots;
  const storedCount = async () => (await database.db.select().from(shotMeasurements)).length;
  const line = (id: string, aspect: number | string, angle = 88, sigma: number | string = 0.004) => `${id}, ${aspect}, ${angle}, ${sigma}`;

  it('lists the shots of a run, oldest first, with the prediction and no measurement yet', async () => {
    const shots = await shotsOfRun(runIds[0]);
    expect(shots.map((s) => s.id)).toEqual(shotIds.slice(0, 6));
    expect(shots[1]).toEqual({
      id: shotIds[1], label: 'θ = 15°', at: '2026-11-30T22:01:00.000Z', runId: runIds[0],
      field: { magnitude: 8, thetaDeg: 15, phiDeg: 0 },
      prediction: { fermiSurfaceAspect: 1.03, cloudAspect: 1.2, tofAspect: 1.0185, tofMajorAngleDeg: 75, collapseRatio: 0.4 },
      measured: null,
    } satisfies ShotRow);
  });

  it('lists the shots of a time window across runs', async () => {
    const res = await get<ShotsResponse>('/api/shots?from=2026-11-30T22:04:00Z&to=2026-11-30T23:01:00Z');
    expect(res.status).toBe(200);
    expect(res.body.shots.map((s) => s.id)).toEqual([shotIds[4], shotIds[5], shotIds[6], shotIds[7]]);
  });

  it('refuses bad list parameters with a 400 naming them, and an unknown run with 404', async () => {
    const cases: [string, RegExp][] = [
      ['', /run: give run=ID, or from and to/],
      ['?run=abc', /run: must be a whole number/],
      ['?run=1&from=2026-11-30T22:00:00Z&to=2026-11-30T23:00:00Z', /run: give either run or from and to, not both/],
      ['?from=2026-11-30T22:00:00Z', /from: needed together with to|to: needed together with from/],
      ['?from=yesterday&to=2026-11-30T23:00:00Z', /from: must be a date and time such as/],
      ['?from=2026-11-30T23:00:00Z&to=2026-11-30T22:00:00Z', /to: must not be before from/],
      ['?run=1&colour=red', /colour/],
    ];
    for (const [query, message] of cases) {
      const res = await get<{ error: string }>(`/api/shots${query}`);
      expect(res.status, query).toBe(400);
      expect(res.body.error, query).toMatch(message);
    }
    const missing = await get<{ error: string }>('/api/shots?run=999');
    expect(missing.status).toBe(404);
    expect(missing.body.error).toMatch(/No run with id 999/);
  });

  it('stores a file whole for an operator and refuses it for a viewer', async () => {
    const text = [HEADER, line(shotIds[0], 1.012), line(shotIds[1], 1.011, 76, ''), `${shotIds[2]}, 1.009, 61`].join('\n');
    expect((await upload('viewer', text)).status).toBe(403);
    expect(await storedCount()).toBe(0);
    const res = await upload('operator', text);
    expect(res.body.error).toBeUndefined();
    expect(res.status).toBe(201);
    expect(res.body).toEqual({ stored: 3 });
    const shots = await shotsOfRun(runIds[0]);
    expect(shots.slice(0, 4).map((s) => s.measured)).toEqual([
      { tofAspect: 1.012, tofAngleDeg: 88, sigma: 0.004 },
      { tofAspect: 1.011, tofAngleDeg: 76, sigma: null },
      { tofAspect: 1.009, tofAngleDeg: 61, sigma: null },
      null,
    ]);
  });

  it('stores nothing from a file whose line 7 is bad', async () => {
    const before = await shotsOfRun(runIds[1]);
    const lines = [HEADER, ...shotIds.slice(6, 11).map((id) => line(id, 1.01)), line(shotIds[11], 0.7)];
    const res = await upload('operator', lines.join('\n'));
    expect(res.status).toBe(400);
    expect(res.body.error).toBe('Measurement file: line 7, column tof_aspect_ratio: 0.7 must be from 1 to 100 (long axis over short axis); nothing was stored');
    expect(res.body.field).toBe('file');
    // An unknown id on the last line is found in the store's transaction: the five good lines before it are not kept either.
    const unknown = await upload('operator', [...lines.slice(0, 6), line('shot-20261130T999999Z-r9-000000', 1.01)].join('\n'));
    expect(unknown.status).toBe(400);
    expect(unknown.body.error).toMatch(/^Measurement file: line 7, column shot: no shot with id shot-20261130T999999Z-r9-000000 /);
    expect(await shotsOfRun(runIds[1])).toEqual(before);
    expect(await storedCount()).toBe(3);
  });

  it('names the line and the problem of each kind of bad file', async () => {
    const id = shotIds[6];
    const cases: [string, string][] = [
      ['', 'the file is empty'],
      ['# only a comment\n', 'the file is empty'],
      [HEADER, 'the file has a header but no shots'],
      ['shot, tof_aspect_ratio\n' + `${id}, 1.01`, 'line 1: column tof_angle_deg is missing'],
      ['shot, tof_aspect_ratio, tof_angle_deg, colour\n', 'line 1, column 4: "colour" is not a measurement column'],
      [`${HEADER}\n${line(id, '1,01')}`, 'line 2: 5 cells, but the header has 4 columns'],
      [`${HEADER}\n${line(id, 'wide')}`, 'line 2, column tof_aspect_ratio: "wide" is not a number'],
      [`${HEADER}\n${line(id, -1.2)}`, 'line 2, column tof_aspect_ratio: -1.2 must be from 1 to 100'],
      [`${HEADER}\n${line(id, 1.01, 270)}`, 'line 2, column tof_angle_deg: 270 must be from −180 to 180°'],
      [`${HEADER}\n${line(id, 1.01, 10, 0)}`, 'line 2, column sigma_aspect_ratio: 0 must be positive'],
      [`${HEADER}\n${line(id, 1.01)}\n\n${line(id, 1.02)}`, `line 4, column shot: shot ${id} appears again (first on line 2)`],
      [`${HEADER}\n, 1.01, 10, 0.01`, 'line 2, column shot: empty'],
    ];
    for (const [text, message] of cases) {
      const res = await upload('operator', text);
      expect(res.status, text).toBe(400);
      expect(res.body.error, text).toContain(message);
    }
    expect(await storedCount()).toBe(3);
  });

  it('replaces a re-uploaded shot and audits the old and the new value', async () => {
    const res = await upload('lead', [HEADER, line(shotIds[0], 1.015, 87, 0.003), line(shotIds[3], 1.008, 46)].join('\r\n'), 'imaging-rerun.csv');
    expect(res.status).toBe(201);
    expect(res.body).toEqual({ stored: 2 });
    const shots = await shotsOfRun(runIds[0]);
    expect(shots[0].measured).toEqual({ tofAspect: 1.015, tofAngleDeg: 87, sigma: 0.003 });
    expect(await storedCount()).toBe(4);
    const rows = await database.db.select().from(auditLog).where(like(auditLog.action, 'shot%')).orderBy(asc(auditLog.id));
    expect(rows.map(({ actor, action, subject, oldValue, newValue, reason }) => ({ actor, action, subject, oldValue, newValue, reason }))).toEqual([
      { actor: 'operator@tiltwatch.example', action: 'shots.measurements.upload', subject: 'file:imaging-2026-11-30.csv', oldValue: null, newValue: { stored: 3, replaced: 0 }, reason: null },
      { actor: 'lead@tiltwatch.example', action: 'shots.measurements.upload', subject: 'file:imaging-rerun.csv', oldValue: null, newValue: { stored: 2, replaced: 1 }, reason: null },
      {
        actor: 'lead@tiltwatch.example', action: 'shot.measurement.replace', subject: `shot:${shotIds[0]}`,
        oldValue: { tofAspect: 1.012, tofAngleDeg: 88, sigma: 0.004 }, newValue: { tofAspect: 1.015, tofAngleDeg: 87, sigma: 0.003 },
        reason: 're-uploaded in imaging-rerun.csv, line 2',
      },
    ]);
  });

  it('refuses an upload without a file or with another form field', async () => {
    const form = new FormData();
    form.append('note', 'x');
    const res = await fetch(`${server.url}/api/shots/measurements`, { method: 'POST', headers: { authorization: `Bearer ${tokens.get('operator')}` }, body: form });
    expect(res.status).toBe(400);
    expect(((await res.json()) as { error: string }).error).toMatch(/"note" is not a field of the measurement upload/);
    const empty = new FormData();
    empty.append('other', new Blob(['x']), 'other.csv');
    const none = await fetch(`${server.url}/api/shots/measurements`, { method: 'POST', headers: { authorization: `Bearer ${tokens.get('operator')}` }, body: empty });
    expect(((await none.json()) as { error: string }).error).toBe('Measurement file: send one file in the form field "file" (got "other")');
  });
});
