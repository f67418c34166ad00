import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SecurityReport, UserAccount } from '../../shared/auth/user-api.js';
import { openDatabase } from '../db/database.js';
import { auditLog } from '../db/schema.js';
import type { RunningServer } from '../server.js';
import { databaseUrlFor } from '../testing/external-services.js';
import { callApi, makeDataDir, removeDataDir, signIn, startTestServer, TEST_PASSWORD } from '../testing/test-server.js';
import { waitFor } from '../../test/support/stack.js';

const NEW_PASSWORD = 'a new pass phrase for night shift';

describe('accounts, passwords and sign-in throttling', () => {
  let dir: string;
  let server: RunningServer;
  let admin: string;

  beforeAll(async () => {
    dir = await makeDataDir();
    // Six failed sign-ins per address and minute, across accounts.
    server = await startTestServer(dir, undefined, { TILTWATCH_LOGIN_ATTEMPTS_PER_MIN: '6' });
    admin = await signIn(server, 'admin');
  });
  afterAll(async () => {
    await server?.close();
    removeDataDir(dir);
  });

  const login = async (email: string, password: string) => {
    const res = await fetch(`${server.url}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email, password }),
    });
    const body = (await res.json()) as { token?: string; error?: string };
    return { status: res.status, retryAfter: res.headers.get('retry-after'), ...body };
  };
  const me = (token: string) => callApi<{ email: string; role: string }>(server, token, 'GET', '/api/auth/me');
  const users = async () => (await callApi<{ users: UserAccount[] }>(server, admin, 'GET', '/api/admin/users')).body.users;
  const idOf = async (email: string) => (await users()).find((u) => u.email === email)!.id;

  it('lists the accounts and adds one that can sign in', async () => {
    expect((await users()).map((u) => `${u.email}:${u.role}`)).toEqual([
      'admin@tiltwatch.example:admin',
      'lead@tiltwatch.example:lead',
      'operator@tiltwatch.example:operator',
      'viewer@tiltwatch.example:viewer',
    ]);
    const added = await callApi<{ user: UserAccount }>(server, admin, 'POST', '/api/admin/users', {
      email: 'Night.Operator@Lindqvist-Hall.example',
      role: 'operator',
      password: 'night shift pass phrase',
      reason: 'joins the night shift',
    });
    expect(added.status).toBe(201);
    expect(added.body.user).toMatchObject({ email: 'night.operator@lindqvist-hall.example', role: 'operator', disabled: false });
    expect((await login('night.operator@lindqvist-hall.example', 'night shift pass phrase')).status).toBe(200);
  });

  it.each([
    ['an existing e-mail', { email: 'lead@tiltwatch.example', role: 'lead', password: 'long enough password' }, 409, /exists already/],
    ['an unknown role', { email: 'x@lindqvist-hall.example', role: 'owner', password: 'long enough password' }, 400, /^Role: must be one of viewer, operator, lead, admin/],
    ['a short password', { email: 'x@lindqvist-hall.example', role: 'viewer', password: 'short' }, 400, /^First password: must be at least 12 characters/],
  ])('refuses to add an account with %s', async (_what, body, status, message) => {
    const res = await callApi<{ error: string }>(server, admin, 'POST', '/api/admin/users', body);
    expect(res.status).toBe(status);
    expect(res.body.error).toMatch(message);
  });

  it('a role change applies to the account’s tokens at once; the next sign-in carries the new role too', async () => {
    const before = (await login('night.operator@lindqvist-hall.example', 'night shift pass phrase')).token!;
    const id = await idOf('night.operator@lindqvist-hall.example');
    const changed = await callApi<{ user: UserAccount; changed: boolean }>(server, admin, 'PATCH', `/api/admin/users/${id}`, { role: 'viewer', reason: 'moved to day watch' });
    expect(changed.body).toMatchObject({ changed: true, user: { role: 'viewer' } });
    expect((await me(before)).body.role).toBe('viewer');
    expect((await callApi(server, before, 'POST', '/api/alarms/flow.x.LL/acknowledge')).status).toBe(403);
    const after = (await login('night.operator@lindqvist-hall.example', 'night shift pass phrase')).token!;
    expect((await me(after)).body.role).toBe('viewer');
  });

  it('a disabled account cannot sign in and its tokens are refused; enabling it lets it sign in again', async () => {
    const token = (await login('night.operator@lindqvist-hall.example', 'night shift pass phrase')).token!;
    const id = await idOf('night.operator@lindqvist-hall.example');
    expect((await callApi(server, admin, 'PATCH', `/api/admin/users/${id}`, { disabled: true, reason: 'left the group' })).status).toBe(200);
    expect((await me(token)).status).toBe(401);
    const refused = await login('night.operator@lindqvist-hall.example', 'night shift pass phrase');
    expect(refused.status).toBe(403);
    expect(refused.error).toMatch(/disabled/);
    expect((await login('night.operator@lindqvist-hall.example', 'wrong password')).error).toBe('Wrong e-mail or password');
    expect((await callApi(server, admin, 'PATCH', `/api/admin/users/${id}`, { disabled: false, reason: 'back from leave' })).status).toBe(200);
    expect((await login('night.operator@lindqvist-hall.example', 'night shift pass phrase')).status).toBe(200);
  });

  it('keeps at least one enabled admin', async () => {
    const id = await idOf('admin@tiltwatch.example');
    const res = await callApi<{ error: string }>(server, admin, 'PATCH', `/api/admin/users/${id}`, { role: 'lead', reason: 'test' });
    expect(res.status).toBe(409);
    expect(res.body.error).toMatch(/only enabled admin/);
    expect((await callApi(server, admin, 'PATCH', '/api/admin/users/999', { disabled: true, reason: 'test' })).status).toBe(404);
    expect((await callApi(server, admin, 'PATCH', `/api/admin/users/${id}`, { reason: 'nothing' })).status).toBe(400);
  });

  it('everyone changes their own password with the current one; older tokens stop working', async () => {
    const old = await signIn(server, 'operator');
    const wrong = await callApi<{ error: string }>(server, old, 'POST', '/api/auth/password', { currentPassword: 'not it at all', newPassword: NEW_PASSWORD });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error).toMatch(/^Current password: is not your current password$/);
    const short = await callApi<{ error: string }>(server, old, 'POST', '/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: 'short' });
    expect(short.body.error).toMatch(/^New password: must be at least 12 characters/);
    const changed = await callApi<{ token: string; user: { email: string } }>(server, old, 'POST', '/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: NEW_PASSWORD });
    expect(changed.status).toBe(200);
    expect((await me(changed.body.token)).body.email).toBe('operator@tiltwatch.example');
    expect((await me(old)).status).toBe(401);
    expect((await login('operator@tiltwatch.example', NEW_PASSWORD)).status).toBe(200);
  });

  it('delays guessing on one account after three failures, even for the right password, until it waits or an admin lifts it', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) statuses.push((await login('lead@tiltwatch.example', `guess number ${i}`)).status);
    expect(statuses).toEqual([401, 401, 401, 401]);
    const delayed = await login('lead@tiltwatch.example', TEST_PASSWORD);
    expect(delayed.status).toBe(429);
    expect(delayed.error).toMatch(/for this account: wait \d+ s/);
    expect(Number(delayed.retryAfter)).toBeGreaterThan(0);
    // Another account from the same computer is not delayed.
    expect((await login('viewer@tiltwatch.example', TEST_PASSWORD)).status).toBe(200);
    const report = await callApi<SecurityReport>(server, admin, 'GET', '/api/admin/security');
    expect(report.body.throttles).toContainEqual(expect.objectContaining({ scope: 'account', key: 'lead@tiltwatch.example', failures: 4 }));
    expect(report.body.events).toContainEqual(expect.objectContaining({ kind: 'sign-in.account-delayed', email: 'lead@tiltwatch.example', address: expect.any(String) }));
    const lifted = await callApi<{ lifted: boolean }>(server, admin, 'POST', '/api/admin/security/lift', { email: 'lead@tiltwatch.example', reason: 'owner mistyped; confirmed by phone' });
    expect(lifted.body.lifted).toBe(true);
    expect((await login('lead@tiltwatch.example', TEST_PASSWORD)).status).toBe(200);
  });

  it('throttles one address failing across many accounts (spraying) and logs it for the admin', async () => {
    // 5 failures so far from this address in this minute (1 disabled-account guess, 4 on lead); one more reaches 6.
    expect((await login('nobody-1@tiltwatch.example', 'spray password')).status).toBe(401);
    const refused = await login('viewer@tiltwatch.example', TEST_PASSWORD);
    expect(refused.status).toBe(429);
    expect(refused.error).toMatch(/from this computer/);
    const report = await callApi<SecurityReport>(server, admin, 'GET', '/api/admin/security');
    const event = report.body.events.find((e) => e.kind === 'sign-in.address-throttled')!;
    expect(event).toMatchObject({ address: expect.any(String), detail: { failures: 6 } });
    await callApi(server, admin, 'POST', '/api/admin/security/lift', { address: event.address, reason: 'our own test' });
    expect((await login('viewer@tiltwatch.example', TEST_PASSWORD)).status).toBe(200);
    const after = await callApi<SecurityReport>(server, admin, 'GET', '/api/admin/security');
    expect(after.body.events[0]).toMatchObject({ kind: 'sign-in.throttle-lifted', address: event.address, detail: { by: 'admin@tiltwatch.example' } });
  });

  it('keeps the growing delay of an account through a restart of the server', async () => {
    for (let i = 0; i < 4; i++) expect((await login('operator@tiltwatch.example', `guess number ${i}`)).status).toBe(401);
    expect((await login('operator@tiltwatch.example', NEW_PASSWORD)).status).toBe(429);
    await server.close();
    server = await startTestServer(dir, undefined, { TILTWATCH_LOGIN_ATTEMPTS_PER_MIN: '6' });
    const security = async () => (await callApi<SecurityReport>(server, admin, 'GET', '/api/admin/security')).body;
    expect((await security()).throttles).toContainEqual(expect.objectContaining({ scope: 'account', key: 'operator@tiltwatch.example', failures: 4 }));
    // Once the 1 s delay has passed, the next wrong guess doubles it (the fifth failure), as without the restart.
    await waitFor(async () => ((await login('operator@tiltwatch.example', 'guess number 4')).status === 401 ? true : undefined), 'the delay to pass');
    expect((await login('operator@tiltwatch.example', NEW_PASSWORD)).status).toBe(429);
    const delays = (await security()).events.filter((e) => e.kind === 'sign-in.account-delayed' && e.email === 'operator@tiltwatch.example').map((e) => e.detail?.['delayMs']);
    expect(delays[0]).toBe(2000);
  });

  it('wrote every account change to the audit trail, without passwords', async () => {
    await server.close();
    const database = await openDatabase({ dataDir: dir, databaseUrl: databaseUrlFor(dir) });
    try {
      const rows = await database.db.select().from(auditLog);
      const actions = rows.filter((r) => r.actor !== 'system').map((r) => `${r.action} ${r.subject}`);
      expect(actions).toEqual([
        'user.create user:night.operator@lindqvist-hall.example',
        'user.update user:night.operator@lindqvist-hall.example',
        'user.update user:night.operator@lindqvist-hall.example',
        'user.update user:night.operator@lindqvist-hall.example',
        'user.password-change user:operator@tiltwatch.example',
        'sign-in.throttle-lift sign-in:lead@tiltwatch.example',
        `sign-in.throttle-lift sign-in-address:${rows.at(-1)!.subject.split(':')[1]}`,
      ]);
      expect(JSON.stringify(rows)).not.toMatch(/pass phrase|argon2/);
    } finally {
      await database.close();
    }
  });
});
