import { readFileSync } from 'node:fs';
import path from 'node:path';
import jwt from 'jsonwebtoken';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, hasRole, type Role } from '../../shared/auth/roles.js';
import { DEMO_PROFILE } from '../../shared/profiles/demo-profile.js';
import { DEMO_LEVEL_SET } from '../levels/demo-levels.js';
import { API_ROUTES, type RouteId } from '../http/route-table.js';
import type { RunningServer } from '../server.js';
import { makeDataDir, removeDataDir, signIn, startTestServer, TEST_PASSWORD } from '../testing/test-server.js';
import { JWT_SECRET_FILE } from './jwt-secret.js';

type Caller = Role | 'nobody';

/** A different alarm for each caller, so that one caller's shelving does not block the next. */
const alarmFor = (caller: Caller, action: string) => `/api/alarms/current.${caller === 'lead' ? 'y' : caller === 'admin' ? 'z' : 'x'}.H/${action}`;

/**
 * A request each route answers with 2xx when the caller may use it (`path` fills in a route's
 * parameters, per caller where needed). `allowedStatus` is the answer of the route itself for
 * an allowed caller where no 2xx request exists on a quiet apparatus: resetting what is not
 * tripped or latched is refused with 409 after the role check.
 */
const VALID_REQUEST: Record<RouteId, { path?: string | ((caller: Caller) => string); query?: string; body?: unknown; allowedStatus?: number | number[] }> = {
  health: {},
  'auth.login': { body: { email: 'viewer@tiltwatch.example', password: TEST_PASSWORD } },
  'auth.me': {},
  // Refused after the role check: a new password must differ (a real change would revoke the caller's token mid-walk).
  'auth.password': { body: { currentPassword: TEST_PASSWORD, newPassword: TEST_PASSWORD }, allowedStatus: 400 },
  live: {},
  series: { query: '?seconds=60' },
  history: { query: '?from=2026-01-01T00:00:00Z&to=2026-01-01T00:01:00Z' },
  channels: {},
  'levels.get': {},
  'levels.history': {},
  'levels.update': { body: { levels: DEMO_LEVEL_SET, reason: 'route access check' } },
  'calibrations.list': {},
  'calibrations.active': {},
  'calibrations.get': { path: '/api/calibrations/1' },
  // A JSON request carries no file: the role check passes, then 400.
  'calibrations.fit': { body: { file: 'not a file' }, allowedStatus: 400 },
  // The seeded demo calibration (id 1) is approved already: the role check passes, then 409.
  'calibrations.approve': { path: '/api/calibrations/1/approve', body: { reason: 'route access check' }, allowedStatus: 409 },
  'profiles.list': {},
  'profiles.active': {},
  'profiles.save': { body: { profile: { ...DEMO_PROFILE, name: 'Access check' }, reason: 'route access check' } },
  // The seeded demo profile (id 1) is already active, so activating it again changes nothing.
  'profiles.activate': { path: '/api/profiles/1/activate', body: { reason: 'route access check' } },
  'prediction.history': { query: '?seconds=60' },
  'alarms.list': { query: '?state=all' },
  'alarms.history': { query: '?hours=1' },
  'alarms.health': {},
  // Nothing is raised, so acknowledging changes nothing and answers 200.
  'alarms.acknowledge': { path: '/api/alarms/stale.H/acknowledge' },
  'alarms.shelve': { path: (caller) => alarmFor(caller, 'shelve'), body: { minutes: 5, reason: 'route access check' } },
  'alarms.unshelve': { path: (caller) => alarmFor(caller, 'unshelve'), body: { reason: 'route access check' } },
  'alarms.out-of-service': { path: (caller) => `/api/alarms/waterSupply.${caller === 'admin' ? 'H' : 'L'}/out-of-service`, body: { on: true, reason: 'route access check' } },
  'alarms.reset': { path: '/api/alarms/flow.x.LL/reset', body: { reason: 'route access check' }, allowedStatus: 409 },
  'alarm-limits.list': {},
  'alarm-limits.update': { path: '/api/alarm-limits/waterReturn.x.H', body: { limit: 35, reason: 'route access check' } },
  'interlock.status': {},
  'interlock.reset': { body: { reason: 'route access check' }, allowedStatus: 409 },
  'users.list': {},
  'users.create': { body: { email: 'access-check@tiltwatch.example', role: 'viewer', password: 'access check password' } },
  // Account 1 (the viewer demo account) is enabled already, so this changes nothing and revokes no token.
  'users.update': { path: '/api/admin/users/1', body: { disabled: false, reason: 'route access check' } },
  'security.report': { query: '?hours=1' },
  'security.lift': { body: { email: 'nobody@tiltwatch.example', reason: 'route access check' } },
  'logbook.write': { body: { text: 'route access check', tags: ['access'] } },
  'logbook.list': { query: '?tag=access' },
  // No attachment exists on a fresh database: the role check passes, then 404.
  'logbook.attachment': { path: '/api/logbook/attachments/999999', allowedStatus: 404 },
  'handovers.list': {},
  // The first allowed caller starts the draft; later ones find it open (409 after the role check).
  'handovers.create': { allowedStatus: [201, 409] },
  'handovers.get': { path: '/api/handovers/999999', allowedStatus: 404 },
  'handovers.update': { path: '/api/handovers/999999', body: { summary: 'route access check' }, allowedStatus: 404 },
  'handovers.submit': { path: '/api/handovers/999999/submit', allowedStatus: 404 },
  'handovers.accept': { path: '/api/handovers/999999/accept', body: {}, allowedStatus: 404 },
  'handover-items.close': { path: '/api/handover-items/999999/close', body: { note: 'route access check' }, allowedStatus: 404 },
  'admin.outbox': {},
  'steering.status': {},
  // No controller runs here: the pre-flight answers with failed checks, a target is refused with them.
  'steering.preflight': { body: { magnitudeG: 5, thetaDeg: 30, phiDeg: 0, rampMs: 2000, reason: 'route access check' } },
  'steering.target': { body: { magnitudeG: 5, thetaDeg: 30, phiDeg: 0, rampMs: 2000, reason: 'route access check' }, allowedStatus: 422 },
  'steering.abort': { body: { reason: 'route access check' }, allowedStatus: 409 },
  'steering.release': { body: { reason: 'route access check' }, allowedStatus: 409 },
  'sequences.list': {},
  'sequences.save': { body: { name: 'Access check', steps: [{ kind: 'hold', durationMs: 1000 }, { kind: 'shot', label: 'one' }], reason: 'route access check' } },
  'sequences.preview': { body: { steps: [{ kind: 'ramp', magnitudeG: 5, thetaDeg: 30, phiDeg: 0, durationMs: 3000 }] } },
  // No controller runs here: the pre-flight of the demo sequence fails.
  'sequences.run': { path: '/api/sequences/1/run', body: { reason: 'route access check' }, allowedStatus: 422 },
  'runs.list': {},
  'runs.get': { path: '/api/runs/999', allowedStatus: 404 },
  'runs.abort': { path: '/api/runs/999/abort', body: { reason: 'route access check' }, allowedStatus: 404 },
  'shots.list': { query: '?from=2026-01-01T00:00:00Z&to=2026-01-02T00:00:00Z' },
  // A JSON request carries no file: the role check passes, then 400.
  'shots.measurements': { body: { file: 'not a file' }, allowedStatus: 400 },
};

describe('sign-in and roles', () => {
  let dir: string;
  let server: RunningServer;
  const tokens = new Map<Role, string>();

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir, undefined, { TILTWATCH_LOGIN_ATTEMPTS_PER_MIN: '5' });
    for (const role of ROLES) tokens.set(role, await signIn(server, role));
  });
  afterAll(async () => {
    await server?.close();
    removeDataDir(dir);
  });

  const login = (body: unknown, contentType = 'application/json') =>
    fetch(`${server.url}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': contentType },
      body: typeof body === 'string' ? body : JSON.stringify(body),
    });
  const me = (token: string) => fetch(`${server.url}/api/auth/me`, { headers: { authorization: `Bearer ${token}` } });

  it('signs a demo account in and returns a token and the user', async () => {
    const res = await login({ email: 'Operator@Tiltwatch.example ', password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    const body = (await res.json()) as { token: string; user: unknown };
    expect(body.user).toEqual({ email: 'operator@tiltwatch.example', role: 'operator' });
    expect((await (await me(body.token)).json())).toEqual({ email: 'operator@tiltwatch.example', role: 'operator' });
  });

  it('answers 401 with the same message for a wrong password and an unknown e-mail', async () => {
    const wrong = await login({ email: 'lead@tiltwatch.example', password: 'not-the-password' });
    const unknown = await login({ email: 'nobody@tiltwatch.example', password: 'whatever-password' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(await wrong.json()).toEqual(await unknown.json());
  });

  it.each([
    ['a missing password', { email: 'viewer@tiltwatch.example' }, /^Password: must be text/],
    ['a malformed e-mail', { email: 'viewer', password: 'x' }, /^Email: must be an e-mail address/],
    ['an empty body', {}, /^Email: must be text.*; Password: must be text/],
    ['a body that is not JSON', '{"email":', /not valid JSON/],
  ])('answers 400 with a message for %s', async (_what, body, message) => {
    const res = await login(body);
    expect(res.status).toBe(400);
    expect(((await res.json()) as { error: string }).error).toMatch(message);
  });

  it('refuses an expired token with 401', async () => {
    const secret = Buffer.from(readFileSync(path.join(dir, JWT_SECRET_FILE), 'utf8'), 'base64');
    const good = jwt.decode(tokens.get('admin')!) as jwt.JwtPayload;
    const expired = jwt.sign(
      { email: good['email'], role: 'admin', sub: good.sub, iss: 'tiltwatch', exp: Math.floor(Date.now() / 1000) - 60 },
      secret,
      { algorithm: 'HS256' },
    );
    expect((await me(expired)).status).toBe(401);
  });

  it('refuses a token signed with another key, and one claiming a higher role than the account has', async () => {
    const forged = jwt.sign({ email: 'viewer@tiltwatch.example', role: 'admin' }, 'another-key', { subject: '1', issuer: 'tiltwatch' });
    expect((await me(forged)).status).toBe(401);
    // Correctly signed but the role in the token is ignored: the database says viewer.
    const secret = Buffer.from(readFileSync(path.join(dir, JWT_SECRET_FILE), 'utf8'), 'base64');
    const viewer = jwt.decode(tokens.get('viewer')!) as jwt.JwtPayload;
    const inflated = jwt.sign({ email: viewer['email'], role: 'admin', tv: viewer['tv'] }, secret, { subject: viewer.sub, issuer: 'tiltwatch', expiresIn: 60 });
    expect(await (await me(inflated)).json()).toEqual({ email: 'viewer@tiltwatch.example', role: 'viewer' });
  });

  it('answers a JSON 404 for an unknown API path', async () => {
    const res = await fetch(`${server.url}/api/no-such-thing`, { headers: { authorization: `Bearer ${tokens.get('admin')}` } });
    expect(res.status).toBe(404);
    expect(((await res.json()) as { error: string }).error).toMatch(/No API route GET \/api\/no-such-thing/);
  });

  const callers: Caller[] = ['nobody', ...ROLES];
  const cases = API_ROUTES.flatMap((route) => callers.map((caller) => ({ route, caller })));
  it.each(cases)('$route.method $route.path as $caller: allowed exactly as the route table says', async ({ route, caller }) => {
    const example = VALID_REQUEST[route.id];
    const headers: Record<string, string> = { 'content-type': 'application/json' };
    if (caller !== 'nobody') headers['authorization'] = `Bearer ${tokens.get(caller)}`;
    const path = typeof example.path === 'function' ? example.path(caller) : (example.path ?? route.path);
    const res = await fetch(`${server.url}${path}${example.query ?? ''}`, {
      method: route.method.toUpperCase(),
      headers,
      body: example.body === undefined ? undefined : JSON.stringify(example.body),
    });
    await res.arrayBuffer();
    const minRole: Role | null = route.minRole;
    if (minRole === null) expect(res.status).toBeLessThan(300);
    else if (caller === 'nobody') expect(res.status).toBe(401);
    else if (!hasRole(caller, minRole)) expect(res.status).toBe(403);
    else if (example.allowedStatus !== undefined) expect([example.allowedStatus].flat()).toContain(res.status);
    else expect(res.status).toBeLessThan(300);
  });
});
