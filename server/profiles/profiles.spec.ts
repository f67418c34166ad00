import { asc, like } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../shared/auth/roles.js';
import { DEMO_PROFILE } from '../../shared/profiles/demo-profile.js';
import type { ProfileRecord } from '../../shared/profiles/profile-record.js';
import { openDatabase } from '../db/database.js';
import { auditLog, sampleProfiles } from '../db/schema.js';
import type { RunningServer } from '../server.js';
import { makeDataDir, removeDataDir, signIn, startTestServer } from '../testing/test-server.js';
import { databaseUrlFor } from '../testing/external-services.js';

/** A JSON API client signed in as the demo account of each role. */
async function clientsFor(server: RunningServer, roles: Role[]) {
  const tokens = new Map<Role, string>();
  for (const role of roles) tokens.set(role, await signIn(server, role));
  return async <T>(role: Role, method: string, path: string, body?: unknown): Promise<{ status: number; body: T }> => {
    const res = await fetch(`${server.url}${path}`, {
      method,
      headers: { authorization: `Bearer ${tokens.get(role)}`, 'content-type': 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    return { status: res.status, body: (await res.json()) as T };
  };
}

describe('sample profiles over the API', () => {
  let dir: string;
  let server: RunningServer;
  let call: Awaited<ReturnType<typeof clientsFor>>;

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir);
    call = await clientsFor(server, ['viewer', 'operator', 'lead']);
  });
  afterAll(async () => {
    await server?.close();
    removeDataDir(dir);
  });

  const list = async () => (await call<{ profiles: ProfileRecord[] }>('viewer', 'GET', '/api/profiles')).body.profiles;
  const active = async () => (await call<ProfileRecord>('viewer', 'GET', '/api/profiles/active')).body;

  it('seeds the demo profile on first start as version 1, active', async () => {
    const seeded = { name: DEMO_PROFILE.name, version: 1, profile: DEMO_PROFILE, active: true, createdBy: 'system' };
    expect(await list()).toEqual([expect.objectContaining(seeded)]);
    expect(await active()).toMatchObject(seeded);
  });

  it('saves an edit as the next version under the same name without touching the stored one or the active choice', async () => {
    const before = await active();
    const edited = { ...DEMO_PROFILE, atomNumber: 6e4 };
    const res = await call<ProfileRecord>('lead', 'POST', '/api/profiles', { profile: edited, reason: 'more atoms after the new MOT loading' });

    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ name: DEMO_PROFILE.name, version: 2, profile: edited, active: false, createdBy: 'lead@tiltwatch.example' });
    expect(Number.isNaN(Date.parse(res.body.createdAt))).toBe(false);
    expect(await active()).toEqual(before);
    const versions = (await list()).filter((p) => p.name === DEMO_PROFILE.name);
    expect(versions.map((p) => [p.version, p.profile.atomNumber])).toEqual([[1, 5e4], [2, 6e4]]);
  });

  it('starts a new name at version 1 as a draft, and makes it active only in the separate activation step', async () => {
    const dy = { ...DEMO_PROFILE, name: 'Lindqvist Hall 161Dy, crossed trap', species: '161Dy' };
    const before = await active();
    const asked = await call<{ error: string }>('lead', 'POST', '/api/profiles', { profile: dy, reason: 'dysprosium run', activate: true });
    expect(asked.status).toBe(400);
    expect(asked.body.error).toMatch(/^Saving never activates a profile/);
    const res = await call<ProfileRecord>('lead', 'POST', '/api/profiles', { profile: dy, reason: 'dysprosium run' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ name: dy.name, version: 1, active: false });
    expect(await active()).toEqual(before);
    const activated = await call<ProfileRecord>('lead', 'POST', `/api/profiles/${res.body.id}/activate`, { reason: 'dysprosium run starts' });
    expect(activated.body).toMatchObject({ id: res.body.id, active: true });
    expect((await list()).filter((p) => p.active).map((p) => p.id)).toEqual([res.body.id]);
  });

  it.each([
    ['2.5 atoms', { atomNumber: 2.5 }, 'profile.atomNumber', /Atom number must lie between 100 and 100000000/],
    ['10¹² atoms', { atomNumber: 1e12 }, 'profile.atomNumber', /Atom number must lie between 100 and 100000000/],
    ['a fractional atom number in range', { atomNumber: 5000.5 }, 'profile.atomNumber', /Atom number must be a whole number/],
    ['a 100 000° Euler angle', { trapToCoilEulerDeg: [100_000, 0, 0] }, 'profile.trapToCoilEulerDeg.0', /1st turn, about coil z must lie between -360 and 360°/],
    ['a 50 kHz trap', { trapHz: [350, 50_000, 400] }, 'profile.trapHz.1', /Frequency along y must lie between 1 and 10000 Hz/],
    ['a 5 s TOF', { tofMs: [5000] }, 'profile.tofMs.0', /Each of the TOF times must lie between 0 and 200 ms/],
  ])('refuses nonsense (%s) with 400 naming the field as the form labels it', async (_what, change, field, message) => {
    const count = (await list()).length;
    const res = await call<{ error: string; field: string }>('lead', 'POST', '/api/profiles', { profile: { ...DEMO_PROFILE, ...change }, reason: 'r' });
    expect(res.status).toBe(400);
    expect(res.body.field).toBe(field);
    expect(res.body.error).toMatch(message);
    expect(res.body.error).not.toMatch(/atomNumber|trapHz|trapToCoilEulerDeg|tofMs/);
    expect((await list()).length).toBe(count);
  });

  it('stores Euler angles normalised, the same rotation', async () => {
    const res = await call<ProfileRecord>('lead', 'POST', '/api/profiles', { profile: { ...DEMO_PROFILE, name: 'Tilted trap', trapToCoilEulerDeg: [350, -20, 190] }, reason: 'tilted' });
    expect(res.status).toBe(201);
    expect(res.body.profile.trapToCoilEulerDeg).toEqual([170, 20, 10].map((x) => expect.closeTo(x, 9)));
  });

  it('activates a stored version by id and answers 404 for an unknown one', async () => {
    const demo = (await list()).find((p) => p.name === DEMO_PROFILE.name && p.version === 1)!;
    const res = await call<ProfileRecord>('lead', 'POST', `/api/profiles/${demo.id}/activate`, { reason: 'back to erbium' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ id: demo.id, active: true });
    expect((await active()).id).toBe(demo.id);

    const missing = await call<{ error: string }>('lead', 'POST', '/api/profiles/9999/activate', { reason: 'no such version' });
    expect(missing.status).toBe(404);
    expect(missing.body.error).toMatch(/No sample profile version with id 9999/);
    const malformed = await call<{ error: string }>('lead', 'POST', '/api/profiles/first/activate', { reason: 'not an id' });
    expect(malformed.status).toBe(400);
    expect(malformed.body.error).toMatch(/id: must be a profile version id/);
  });

  it.each(['viewer', 'operator'] as const)('refuses saving and activating to a %s with 403', async (role) => {
    const save = await call(role, 'POST', '/api/profiles', { profile: DEMO_PROFILE, reason: 'not allowed' });
    const activate = await call(role, 'POST', '/api/profiles/1/activate', { reason: 'not allowed' });
    expect([save.status, activate.status]).toEqual([403, 403]);
  });

  it.each([
    ['a negative trap frequency', { profile: { ...DEMO_PROFILE, trapHz: [350, -80, 400] }, reason: 'r' }, /Frequency along y must lie between/],
    ['an unknown species', { profile: { ...DEMO_PROFILE, species: '999Xx' }, reason: 'r' }, /species/],
    ['an unknown profile key', { profile: { ...DEMO_PROFILE, trapFrequency: 1 }, reason: 'r' }, /unknown key\(s\) trapFrequency/],
    ['no TOF time', { profile: { ...DEMO_PROFILE, tofMs: [] }, reason: 'r' }, /TOF times must list at least one time/],
    ['no reason', { profile: DEMO_PROFILE }, /^Reason for this version: must be text saying why/],
    ['an empty reason', { profile: DEMO_PROFILE, reason: '  ' }, /^Reason for this version: must say why/],
  ])('answers 400 naming what to fix for %s, and stores nothing', async (_what, body, message) => {
    const count = (await list()).length;
    const res = await call<{ error: string }>('lead', 'POST', '/api/profiles', body);
    expect(res.status).toBe(400);
    expect(res.body.error).toMatch(message);
    expect((await list()).length).toBe(count);
  });

  it('asks for a reason when activating', async () => {
    const res = await call<{ error: string }>('lead', 'POST', '/api/profiles/1/activate', {});
    expect(res.status).toBe(400);
    expect(res.body.error).toMatch(/^Reason for activating: must be text saying why/);
  });
});

describe('sample profiles in the database', () => {
  let dir: string;

  beforeAll(async () => {
    dir = await makeDataDir();
  });
  afterAll(() => {
    removeDataDir(dir);
  });

  it('writes who, old and new value and reason of every save and activation to the audit trail, and allows one active row', async () => {
    const server = await startTestServer(dir);
    let saved: ProfileRecord;
    try {
      const call = await clientsFor(server, ['lead']);
      const edited = { ...DEMO_PROFILE, tofMs: [15, 25] };
      saved = (await call<ProfileRecord>('lead', 'POST', '/api/profiles', { profile: edited, reason: 'shorter flight' })).body;
      await call('lead', 'POST', `/api/profiles/${saved.id}/activate`, { reason: 'use the shorter flight' });
    } finally {
      await server.close();
    }

    const database = await openDatabase({ dataDir: dir, databaseUrl: databaseUrlFor(dir) });
    try {
      const { db } = database;
      const rows = await db.select().from(auditLog).where(like(auditLog.action, 'profile.%')).orderBy(asc(auditLog.id));
      const demo = { id: 1, name: DEMO_PROFILE.name, version: 1 };
      const v2 = { id: saved.id, name: DEMO_PROFILE.name, version: 2 };
      expect(rows.map(({ actor, action, subject, oldValue, newValue, reason }) => ({ actor, action, subject, oldValue, newValue, reason }))).toEqual([
        { actor: 'system', action: 'profile.seed', subject: 'profile:1', oldValue: null, newValue: { ...demo, profile: DEMO_PROFILE }, reason: expect.stringMatching(/first start/) },
        {
          actor: 'lead@tiltwatch.example', action: 'profile.save', subject: `profile:${saved.id}`,
          oldValue: { ...demo, profile: DEMO_PROFILE }, newValue: { ...v2, profile: saved.profile }, reason: 'shorter flight',
        },
        { actor: 'lead@tiltwatch.example', action: 'profile.activate', subject: `profile:${saved.id}`, oldValue: demo, newValue: v2, reason: 'use the shorter flight' },
      ]);
      for (const row of rows) expect(row.at).toBeInstanceOf(Date);

      const second = { name: 'second active', version: 1, body: DEMO_PROFILE, active: true, createdBy: 'test', reason: 'must be refused' };
      await expect(db.insert(sampleProfiles).values(second)).rejects.toMatchObject({
        cause: expect.objectContaining({ message: expect.stringMatching(/sample_profiles_one_active/) }),
      });
    } finally {
      await database.close();
    }
  });
});
