import { readFileSync } from 'node:fs';
import { asc, eq, like } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../shared/auth/roles.js';
import type { CalibrationDetail, CalibrationFitResponse, CalibrationRecord } from '../../shared/field/calibration-record.js';
import { DEMO_CALIBRATION } from '../../shared/field/demo-calibration.js';
import { fieldFromCurrents } from '../../shared/field/field-vector.js';
import type { LiveState } from '../../shared/live/live-state.js';
import { openDatabase } from '../db/database.js';
import { auditLog, calibrations } from '../db/schema.js';
import type { RunningServer } from '../server.js';
import { startControllerFeed, type ControllerFeed } from '../testing/controller-feed.js';
import { callApi, connectController, makeDataDir, removeDataDir, signIn, startTestServer } from '../testing/test-server.js';

const EXAMPLES = 'server/calibration/examples';
const example = (name: string) => readFileSync(`${EXAMPLES}/${name}`);

describe('calibration fits and approval over the API', () => {
  let dir: string;
  let server: RunningServer;
  const tokens = new Map<Role, string>();
  let feed: ControllerFeed;
  let controller: Awaited<ReturnType<typeof connectController>>;

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir);
    for (const role of ['viewer', 'operator', 'lead'] as const) tokens.set(role, await signIn(server, role));
    controller = await connectController(server);
    feed = await startControllerFeed(controller);
    feed.currents = { x: 3.2, y: -1.7, z: 4.4 };
  });
  afterAll(async () => {
    feed?.stop();
    await controller?.endAsync();
    await server?.close();
    removeDataDir(dir);
  });

  /** Uploads `file` as multipart field `file` (plus optional form fields). */
  async function upload(role: Role, name: string, file: Buffer | string, fields: Record<string, string> = {}) {
    const form = new FormData();
    form.append('file', new Blob([file], { type: 'text/csv' }), name);
    for (const [key, value] of Object.entries(fields)) form.append(key, value);
    const res = await fetch(`${server.url}/api/calibrations/fits`, { method: 'POST', headers: { authorization: `Bearer ${tokens.get(role)}` }, body: form });
    return { status: res.status, body: (await res.json()) as CalibrationFitResponse & { error?: string } };
  }
  const call = <T>(role: Role, method: string, path: string, body?: unknown) => callApi<T>(server, tokens.get(role), method, path, body);
  const list = async () => (await call<{ calibrations: CalibrationRecord[] }>('viewer', 'GET', '/api/calibrations')).body.calibrations;

  it('stores a |B| fit as a draft matched to the active calibration, for a lead only', async () => {
    for (const role of ['viewer', 'operator'] as const) expect((await upload(role, 'scan.csv', example('lindqvist-field-magnitude.csv'))).status).toBe(403);
    const res = await upload('lead', 'lindqvist-field-magnitude.csv', example('lindqvist-field-magnitude.csv'));
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ id: expect.any(Number), state: 'draft' });
    expect(Object.keys(res.body.fit)).toEqual(['kind', 'points', 'gaussPerAmp', 'offsetGauss', 'standardErrors', 'residualRmsGauss', 'maxResidualGauss', 'gauge']);
    expect(res.body.fit).toMatchObject({ kind: 'magnitude', points: 36, gauge: expect.stringMatching(/active calibration v1/) });
    expect(res.body.calibration).toMatchObject({ version: 2, state: 'draft', active: false, createdBy: 'lead@tiltwatch.example', approvedBy: null, sourceName: 'lindqvist-field-magnitude.csv' });
    expect(res.body.calibration.coilToTrap).toEqual(DEMO_CALIBRATION.coilToTrap);
    expect(res.body.calibration.points).toHaveLength(36);
    expect(res.body.calibration.covariance).toHaveLength(12);
    // The example data were made with K close to the demo one: matched to it, K comes back close element by element.
    res.body.fit.gaussPerAmp.flat().forEach((v, i) => expect(Math.abs(v - DEMO_CALIBRATION.gaussPerAmp.flat()[i])).toBeLessThan(0.03));
    const detail = await call<CalibrationDetail>('viewer', 'GET', `/api/calibrations/${res.body.id}`);
    expect(detail.body.points).toEqual(res.body.calibration.points);
  });

  it('refuses a bad file with the line and column and stores nothing', async () => {
    const before = await list();
    const bad = await upload('lead', 'bad-cell.csv', example('bad-cell.csv'));
    expect(bad).toMatchObject({ status: 400, body: { error: 'Calibration file: line 4, column current_z_A: "oops" is not a number' } });
    const noCoefficient = await upload('lead', 'rf.csv', example('lindqvist-rf-frequency.csv'));
    expect(noCoefficient.status).toBe(400);
    expect(noCoefficient.body.error).toMatch(/Zeeman coefficient/);
    const zero = await upload('lead', 'rf.csv', example('lindqvist-rf-frequency.csv'), { mhzPerGauss: '0' });
    expect(zero.body.error).toMatch(/must be a positive number of MHz\/G/);
    const text = await upload('lead', 'rf.csv', example('lindqvist-rf-frequency.csv'), { mhzPerGauss: 'fast' });
    expect(text).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^MHz per G: must be a number/) } });
    const absurd = await upload('lead', 'rf.csv', example('lindqvist-rf-frequency.csv'), { mhzPerGauss: '1e308' });
    expect(absurd.status).toBe(400);
    const hostile = await upload('lead', 'nul.csv', 'current_x_A,current_y_A,current_z_A,field_G\n1,2,3\u0000,4\n');
    expect(hostile).toMatchObject({ status: 400, body: { error: expect.stringMatching(/NUL/) } });
    const onePair = await upload('lead', 'x-only.csv', `current_x_A,current_y_A,current_z_A,field_G\n${Array.from({ length: 12 }, (_, n) => `${n},0,0,${1.2 * n + 0.1}`).join('\n')}`);
    expect(onePair.body.error).toMatch(/only the x pair ever moves/);
    const noFile = await fetch(`${server.url}/api/calibrations/fits`, { method: 'POST', headers: { authorization: `Bearer ${tokens.get('lead')}` }, body: new FormData() });
    expect(noFile.status).toBe(400);
    expect(((await noFile.json()) as { error: string }).error).toMatch(/choose a CSV file/);
    const wrongField = new FormData();
    wrongField.append('upload', new Blob(['x']), 'a.csv');
    const wrong = await fetch(`${server.url}/api/calibrations/fits`, { method: 'POST', headers: { authorization: `Bearer ${tokens.get('lead')}` }, body: wrongField });
    expect(wrong.status).toBe(400);
    expect(await list()).toEqual(before);
    const frequency = await upload('lead', 'lindqvist-rf-frequency.csv', example('lindqvist-rf-frequency.csv'), { mhzPerGauss: '1.4' });
    expect(frequency.status).toBe(201);
    expect(frequency.body.calibration.mhzPerGauss).toBe(1.4);
  });

  it('approves a draft with a reason, makes it active for the live field at once, and never changes an approved version', async () => {
    const draft = (await list()).find((c) => c.sourceName === 'lindqvist-field-magnitude.csv')!;
    expect((await call('operator', 'POST', `/api/calibrations/${draft.id}/approve`, { reason: 'x' })).status).toBe(403);
    const noReason = await call<{ error: string }>('lead', 'POST', `/api/calibrations/${draft.id}/approve`, {});
    expect(noReason.status).toBe(400);
    expect(noReason.body).toMatchObject({ field: 'reason', error: expect.stringMatching(/^Reason for approving: /) });
    expect((await call('lead', 'POST', `/api/calibrations/${draft.id}/approve`, { reason: '   ' })).status).toBe(400);
    expect((await call('lead', 'POST', '/api/calibrations/9999/approve', { reason: 'none' })).status).toBe(404);
    expect((await call('lead', 'POST', '/api/calibrations/abc/approve', { reason: 'none' })).status).toBe(400);

    const approved = await call<CalibrationRecord>('lead', 'POST', `/api/calibrations/${draft.id}/approve`, { reason: 'viewport flange moved; re-measured 36 points' });
    expect(approved.status).toBe(200);
    expect(approved.body).toMatchObject({ id: draft.id, state: 'approved', active: true, approvedBy: 'lead@tiltwatch.example', approvalReason: 'viewport flange moved; re-measured 36 points' });
    expect((await call<CalibrationRecord>('viewer', 'GET', '/api/calibrations/active')).body.id).toBe(draft.id);
    const versions = await list();
    expect(versions.filter((c) => c.active).map((c) => c.id)).toEqual([draft.id]);
    expect(versions.find((c) => c.version === 1)).toMatchObject({ state: 'approved', active: false, createdBy: 'system', approvedBy: 'system' });

    // The live field now goes through the new version, with its uncertainty.
    let live: LiveState | null = null;
    for (let i = 0; i < 100; i++) {
      live = (await call<LiveState>('viewer', 'GET', '/api/live')).body;
      if (live.calibration?.id === draft.id) break;
      await new Promise((resolve) => setTimeout(resolve, 50));
    }
    expect(live!.calibration?.id).toBe(draft.id);
    const expected = fieldFromCurrents(approved.body, feed.currents);
    expect(live!.field!.thetaDeg).toBeCloseTo(expected.thetaDeg!, 9);
    expect(live!.fieldUncertainty).toMatchObject({ magnitudeGauss: expect.any(Number), thetaDeg: expect.any(Number), phiDeg: expect.any(Number) });
    expect(live!.fieldUncertainty!.thetaDeg!).toBeGreaterThan(0);
    expect(live!.fieldUncertainty!.thetaDeg!).toBeLessThan(1);

    const again = await call<{ error: string }>('lead', 'POST', `/api/calibrations/${draft.id}/approve`, { reason: 'again' });
    expect(again.status).toBe(409);
    expect(again.body.error).toMatch(/already approved/);
  });

  it('audits every fit and approval and refuses to change an approved version in the database', async () => {
    feed.stop();
    await controller.endAsync();
    await server.close();
    const database = await openDatabase({ dataDir: dir, databaseUrl: null });
    try {
      const { db } = database;
      const rows = await db.select().from(auditLog).where(like(auditLog.action, 'calibration.%')).orderBy(asc(auditLog.id));
      expect(rows.map((r) => [r.actor, r.action])).toEqual([
        ['system', 'calibration.seed'],
        ['lead@tiltwatch.example', 'calibration.fit'],
        ['lead@tiltwatch.example', 'calibration.fit'],
        ['lead@tiltwatch.example', 'calibration.approve'],
      ]);
      expect(rows[3]).toMatchObject({ reason: 'viewport flange moved; re-measured 36 points', oldValue: { activeId: 1, activeVersion: 1 } });
      const [approved] = await db.select().from(calibrations).where(eq(calibrations.version, 2));
      await expect(db.update(calibrations).set({ offsetGauss: [0, 0, 0] }).where(eq(calibrations.id, approved.id))).rejects.toMatchObject({
        cause: expect.objectContaining({ message: expect.stringMatching(/approved calibration .* cannot change/) }),
      });
      await expect(db.delete(calibrations).where(eq(calibrations.id, approved.id))).rejects.toMatchObject({
        cause: expect.objectContaining({ message: expect.stringMatching(/cannot be removed/) }),
      });
      const [draft] = await db.select().from(calibrations).where(eq(calibrations.version, 3));
      await expect(db.update(calibrations).set({ active: true }).where(eq(calibrations.id, draft.id))).rejects.toBeDefined();
    } finally {
      await database.close();
    }
  });
});
