import { spawn } from 'node:child_process';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase } from '../db/database.js';
import { auditLog } from '../db/schema.js';
import { projectRoot } from '../project-root.js';
import type { RunningServer } from '../server.js';
import { testDatabaseUrl, usesPostgres } from '../testing/external-services.js';
import { callApi, makeDataDir, removeDataDir, startTestServer, TEST_PASSWORD } from '../testing/test-server.js';

interface Run {
  code: number | null;
  stdout: string;
  stderr: string;
}

/**
 * Runs the users command as `npm run users` does, in a child process, with `input` on standard
 * input; on the data folder's PGlite, or in the external pass on the PostgreSQL database the
 * test servers on `dataDir` use.
 */
async function users(dataDir: string, args: string[], input: string): Promise<Run> {
  const databaseUrl = (await testDatabaseUrl(dataDir)) ?? '';
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx', path.join('server', 'users', 'users-cli.ts'), ...args], {
      cwd: projectRoot(),
      env: { ...process.env, TILTWATCH_DATA_DIR: dataDir, DATABASE_URL: databaseUrl, LOG_LEVEL: 'silent' },
      stdio: ['pipe', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    child.on('error', reject);
    child.on('close', (code) => resolve({ code, stdout, stderr }));
    child.stdin.end(input);
  });
}

const login = async (server: RunningServer, email: string, password: string) => {
  const res = await fetch(`${server.url}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  return { status: res.status, body: (await res.json()) as { user?: { role: string } } };
};

// Each case starts child processes (and sometimes a server); allow for a busy machine.
describe('accounts without --demo and the users command', { timeout: 120_000 }, () => {
  let dir: string;

  beforeAll(async () => {
    dir = await makeDataDir();
  });
  afterAll(() => removeDataDir(dir));

  it('starts without any account unless asked for the demo accounts', async () => {
    const server = await startTestServer(dir, { demoAccounts: false });
    try {
      expect(server.hasAdmin).toBe(false);
      expect(server.seededDemoAccounts).toBe(false);
      expect((await login(server, 'admin@tiltwatch.example', TEST_PASSWORD)).status).toBe(401);
    } finally {
      await server.close();
    }
  });

  it('lets the demo accounts sign in only while started with the demo accounts', async () => {
    const other = await makeDataDir();
    try {
      const demo = await startTestServer(other, { demoAccounts: true });
      expect(demo.seededDemoAccounts).toBe(true);
      const token = ((await login(demo, 'admin@tiltwatch.example', TEST_PASSWORD)).body as { token: string }).token;
      await demo.close();
      const real = await startTestServer(other, { demoAccounts: false });
      try {
        expect(real.hasAdmin).toBe(false);
        expect((await login(real, 'admin@tiltwatch.example', TEST_PASSWORD)).status).toBe(401);
        expect((await fetch(`${real.url}/api/auth/me`, { headers: { authorization: `Bearer ${token}` } })).status).toBe(401);
      } finally {
        await real.close();
      }
      const again = await startTestServer(other, { demoAccounts: true });
      try {
        expect((await login(again, 'admin@tiltwatch.example', TEST_PASSWORD)).status).toBe(200);
      } finally {
        await again.close();
      }
    } finally {
      removeDataDir(other);
    }
  });

  it('creates the first admin with the password from standard input; the server signs it in', async () => {
    const run = await users(dir, ['add', 'First.Admin@Lindqvist-Hall.example', '--role', 'admin'], 'first admin pass phrase\nignored second line\n');
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/Added first\.admin@lindqvist-hall\.example \(admin\)/);
    const listed = await users(dir, ['list'], '');
    expect(listed.stdout).toMatch(/first\.admin@lindqvist-hall\.example\tadmin/);

    const server = await startTestServer(dir, { demoAccounts: true });
    try {
      // An account exists, so --demo adds no demo accounts to this database.
      expect(server.seededDemoAccounts).toBe(false);
      const signedIn = await login(server, 'first.admin@lindqvist-hall.example', 'first admin pass phrase');
      expect(signedIn.status).toBe(200);
      expect(signedIn.body.user?.role).toBe('admin');

      const beside = await users(dir, ['add', 'second@lindqvist-hall.example', '--role', 'viewer'], 'second pass phrase\n');
      if (usesPostgres()) {
        // With a PostgreSQL server the command works next to the running server.
        expect(beside.code).toBe(0);
        expect((await login(server, 'second@lindqvist-hall.example', 'second pass phrase')).status).toBe(200);
      } else {
        // While the server holds the data folder, the command refuses politely and changes nothing.
        expect(beside.code).toBe(2);
        expect(beside.stderr).toMatch(/in use by Tiltwatch process .*stop the server to use this command/s);
        expect((await login(server, 'second@lindqvist-hall.example', 'second pass phrase')).status).toBe(401);
      }
    } finally {
      await server.close();
    }
  });

  it.each([
    ['an unknown role', ['add', 'x@lindqvist-hall.example', '--role', 'owner'], 'long enough password\n', 2, /--role must be one of viewer, operator, lead, admin/],
    ['a malformed e-mail', ['add', 'not-an-address', '--role', 'viewer'], 'long enough password\n', 2, /EMAIL must be an e-mail address/],
    ['a short password', ['add', 'x@lindqvist-hall.example', '--role', 'viewer'], 'short\n', 2, /at least 12 characters/],
    ['no password', ['add', 'x@lindqvist-hall.example', '--role', 'viewer'], '', 1, /no password on standard input/],
    ['an existing account', ['add', 'first.admin@lindqvist-hall.example', '--role', 'viewer'], 'long enough password\n', 1, /exists already/],
    ['no command', [], '', 2, /usage: npm run users -- add EMAIL --role/],
    ['a role change for an unknown account', ['set-role', 'nobody@lindqvist-hall.example', 'lead', '--reason', 'new shift lead'], '', 1, /no account for nobody@lindqvist-hall\.example; see the accounts with: npm run users -- list/],
    ['an unknown role for set-role', ['set-role', 'first.admin@lindqvist-hall.example', 'owner', '--reason', 'new shift lead'], '', 2, /ROLE must be one of viewer, operator, lead, admin \(got "owner"\)/],
    ['disabling without a reason', ['disable', 'first.admin@lindqvist-hall.example'], '', 2, /disable needs --reason TEXT.*it goes into the audit trail/],
    ['enabling with a blank reason', ['enable', 'first.admin@lindqvist-hall.example', '--reason', '  '], '', 2, /--reason must not be empty: say why/],
    ['disabling the only enabled admin', ['disable', 'first.admin@lindqvist-hall.example', '--reason', 'leaving'], '', 1, /first\.admin@lindqvist-hall\.example is the only enabled admin; make another account admin first \(npm run users -- set-role OTHER-EMAIL admin/],
    ['taking the admin role from the only enabled admin', ['set-role', 'first.admin@lindqvist-hall.example', 'lead', '--reason', 'leaving'], '', 1, /is the only enabled admin.*nothing was changed/],
  ])('refuses %s with a message', async (_what, args, input, code, message) => {
    const run = await users(dir, args, input);
    expect(run.code).toBe(code);
    expect(run.stderr).toMatch(message);
  });

  it('sets a new password, which the server then accepts', async () => {
    const run = await users(dir, ['set-password', 'first.admin@lindqvist-hall.example'], 'a replaced pass phrase\n');
    expect(run.code).toBe(0);
    const server = await startTestServer(dir, { demoAccounts: false });
    try {
      expect((await login(server, 'first.admin@lindqvist-hall.example', 'first admin pass phrase')).status).toBe(401);
      expect((await login(server, 'first.admin@lindqvist-hall.example', 'a replaced pass phrase')).status).toBe(200);
    } finally {
      await server.close();
    }
  });

  it('changes a role, disables and enables an account, each audited with its reason; a disabled account cannot sign in', async () => {
    const email = 'night.operator@lindqvist-hall.example';
    expect((await users(dir, ['add', email, '--role', 'viewer'], 'night operator pass phrase\n')).code).toBe(0);
    let server = await startTestServer(dir, { demoAccounts: false });
    const before = await login(server, email, 'night operator pass phrase');
    expect(before.status).toBe(200);
    const token = (before.body as { token: string }).token;
    await server.close();

    const promoted = await users(dir, ['set-role', 'Night.Operator@lindqvist-hall.example', 'operator', '--reason', 'runs the night shift'], '');
    expect(promoted.stderr).toBe('');
    expect(promoted.code).toBe(0);
    expect(promoted.stdout).toMatch(/night\.operator@lindqvist-hall\.example is now operator \(was viewer\)/);
    const disabled = await users(dir, ['disable', email, '--reason', 'laptop stolen at the conference'], '');
    expect(disabled.code).toBe(0);
    expect(disabled.stdout).toMatch(/Disabled night\.operator@lindqvist-hall\.example: its earlier sign-ins are revoked/);
    expect((await users(dir, ['disable', email, '--reason', 'again'], '')).stdout).toMatch(/is already disabled; nothing was changed/);
    expect((await users(dir, ['list'], '')).stdout).toMatch(/night\.operator@lindqvist-hall\.example\toperator\tdisabled/);

    server = await startTestServer(dir, { demoAccounts: false });
    try {
      expect((await login(server, email, 'night operator pass phrase')).status).toBe(403);
      expect((await fetch(`${server.url}/api/auth/me`, { headers: { authorization: `Bearer ${token}` } })).status).toBe(401);
    } finally {
      await server.close();
    }

    const enabled = await users(dir, ['enable', email, '--reason', 'new laptop issued'], '');
    expect(enabled.code).toBe(0);
    expect(enabled.stdout).toMatch(/Enabled night\.operator@lindqvist-hall\.example; it can sign in again/);
    server = await startTestServer(dir, { demoAccounts: false });
    try {
      const again = await login(server, email, 'night operator pass phrase');
      expect(again.status).toBe(200);
      expect(again.body.user?.role).toBe('operator');
    } finally {
      await server.close();
    }

    const database = await openDatabase({ dataDir: dir, databaseUrl: await testDatabaseUrl(dir) });
    try {
      const entries = (await database.db.select().from(auditLog)).filter((a) => a.action === 'user.update' && a.subject === `user:${email}`);
      expect(entries.map(({ actor, oldValue, newValue, reason }) => ({ actor, oldValue, newValue, reason }))).toEqual([
        { actor: expect.stringMatching(/^cli:./), oldValue: { role: 'viewer', disabled: false }, newValue: { role: 'operator', disabled: false }, reason: 'runs the night shift' },
        { actor: expect.stringMatching(/^cli:./), oldValue: { role: 'operator', disabled: false }, newValue: { role: 'operator', disabled: true }, reason: 'laptop stolen at the conference' },
        { actor: expect.stringMatching(/^cli:./), oldValue: { role: 'operator', disabled: true }, newValue: { role: 'operator', disabled: false }, reason: 'new laptop issued' },
      ]);
    } finally {
      await database.close();
    }
  });
  it('never counts a demo admin as the remaining admin without --demo, on the command line or the Users page', async () => {
    const folder = await makeDataDir();
    try {
      await (await startTestServer(folder, { demoAccounts: true })).close();
      const email = 'site.admin@lindqvist-hall.example';
      expect((await users(folder, ['add', email, '--role', 'admin'], 'site admin pass phrase\n')).code).toBe(0);
      const refused = await users(folder, ['disable', email, '--reason', 'leaving'], '');
      expect(refused.code).toBe(1);
      expect(refused.stderr).toMatch(/is the only enabled admin \(demo accounts do not count: they sign in only with --demo\)/);

      const server = await startTestServer(folder, { demoAccounts: false });
      try {
        const token = ((await login(server, email, 'site admin pass phrase')).body as { token: string }).token;
        const listed = await callApi<{ users: { id: number; email: string }[] }>(server, token, 'GET', '/api/admin/users');
        const id = listed.body.users.find((u) => u.email === email)!.id;
        const res = await callApi(server, token, 'PATCH', `/api/admin/users/${id}`, { role: 'lead', reason: 'leaving' });
        expect(res.status).toBe(409);
      } finally {
        await server.close();
      }
    } finally {
      removeDataDir(folder);
    }
  });
});
