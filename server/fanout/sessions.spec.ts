import { execFile } from 'node:child_process';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import jwt from 'jsonwebtoken';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { WebSocket } from 'ws';
import type { UserAccount } from '../../shared/auth/user-api.js';
import type { ServerMessage } from '../../shared/live/live-state.js';
import { JWT_SECRET_FILE } from '../auth/jwt-secret.js';
import { projectRoot } from '../project-root.js';
import type { RunningServer } from '../server.js';
import { databaseUrlFor, usesPostgres } from '../testing/external-services.js';
import { callApi, makeDataDir, removeDataDir, signIn, startTestServer, TEST_PASSWORD } from '../testing/test-server.js';
import { waitFor } from '../../test/support/stack.js';
import { WS_CLOSE_TRY_AGAIN_LATER, WS_CLOSE_UNAUTHENTICATED } from './live-fanout.js';

const execFileAsync = promisify(execFile);

interface Client {
  ws: WebSocket;
  messages: ServerMessage[];
  closed: Promise<{ code: number; reason: string }>;
  /** Resolves with the first message of `type`. */
  next(type: ServerMessage['type']): Promise<ServerMessage>;
}

/** A real WebSocket client of `/ws`, from `localAddress` (any 127.x.y.z is this machine). */
async function connect(server: RunningServer, token: string | null, localAddress = '127.0.0.1'): Promise<Client> {
  const ws = new WebSocket(`${server.url.replace('http', 'ws')}/ws`, { localAddress });
  const messages: ServerMessage[] = [];
  const waiters: { type: string; resolve: (m: ServerMessage) => void }[] = [];
  ws.on('message', (data) => {
    const message = JSON.parse(data.toString()) as ServerMessage;
    messages.push(message);
    for (const w of waiters.filter((w) => w.type === message.type)) {
      waiters.splice(waiters.indexOf(w), 1);
      w.resolve(message);
    }
  });
  const closed = new Promise<{ code: number; reason: string }>((resolve) => ws.on('close', (code, reason) => resolve({ code, reason: reason.toString() })));
  await new Promise((resolve, reject) => {
    ws.once('open', resolve);
    ws.once('error', reject);
  });
  if (token !== null) ws.send(JSON.stringify({ type: 'auth', token }));
  const next = (type: ServerMessage['type']) => {
    const seen = messages.find((m) => m.type === type);
    return seen ? Promise.resolve(seen) : new Promise<ServerMessage>((resolve) => waiters.push({ type, resolve }));
  };
  return { ws, messages, closed, next };
}

describe('WebSocket sessions', () => {
  let dir: string;
  let server: RunningServer;
  let admin: string;

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir, { fanout: { authTimeoutMs: 300, maxSocketsPerAddress: 3, maxPendingPerAddress: 2 } });
    admin = await signIn(server, 'admin');
  });
  afterAll(async () => {
    await server?.close();
    removeDataDir(dir);
  });

  const accountId = async (email: string) =>
    (await callApi<{ users: UserAccount[] }>(server, admin, 'GET', '/api/admin/users')).body.users.find((u) => u.email === email)!.id;

  it('closes a session when its token expires', async () => {
    const secret = Buffer.from(readFileSync(path.join(dir, JWT_SECRET_FILE), 'utf8'), 'base64');
    const claims = jwt.decode(await signIn(server, 'viewer')) as jwt.JwtPayload;
    const shortLived = jwt.sign({ email: claims['email'], role: claims['role'], tv: claims['tv'] }, secret, {
      algorithm: 'HS256',
      issuer: 'tiltwatch',
      subject: claims.sub,
      expiresIn: 3,
    });
    const client = await connect(server, shortLived);
    await client.next('hello');
    expect(await client.closed).toEqual({ code: WS_CLOSE_UNAUTHENTICATED, reason: 'session expired: sign in again' });
  });

  it('closes the sessions of an account when it is disabled, and keeps them with the new role greeted when its role changes', async () => {
    const operator = await connect(server, await signIn(server, 'operator'));
    const lead = await connect(server, await signIn(server, 'lead'));
    const viewer = await connect(server, await signIn(server, 'viewer'));
    await Promise.all([operator.next('hello'), lead.next('hello'), viewer.next('hello')]);

    await callApi(server, admin, 'PATCH', `/api/admin/users/${await accountId('operator@tiltwatch.example')}`, { disabled: true, reason: 'session test' });
    expect((await operator.closed).code).toBe(WS_CLOSE_UNAUTHENTICATED);

    const greetings = () => lead.messages.filter((m) => m.type === 'hello');
    await callApi(server, admin, 'PATCH', `/api/admin/users/${await accountId('lead@tiltwatch.example')}`, { role: 'viewer', reason: 'session test' });
    const again = await waitFor(() => greetings()[1], 'the welcome with the new role');
    expect(again).toMatchObject({ type: 'hello', user: { email: 'lead@tiltwatch.example', role: 'viewer' } });
    expect(lead.ws.readyState).toBe(WebSocket.OPEN);
    lead.ws.close();
    await lead.closed;

    // Unrelated sessions stay open.
    expect(viewer.ws.readyState).toBe(WebSocket.OPEN);
    viewer.ws.close();
    await viewer.closed;
  });

  // With PGlite the users command cannot run beside the server (it takes the data folder's lock).
  it.runIf(usesPostgres())('closes the sessions of an account at once when the users command in another process sets its password', async () => {
    const viewer = await connect(server, await signIn(server, 'viewer'));
    await viewer.next('hello');
    const cli = execFileAsync(process.execPath, ['--import', 'tsx', path.join('server', 'users', 'users-cli.ts'), 'set-password', 'viewer@tiltwatch.example'], {
      cwd: projectRoot(),
      env: { ...process.env, TILTWATCH_DATA_DIR: dir, DATABASE_URL: databaseUrlFor(dir)!, LOG_LEVEL: 'warn' },
    });
    cli.child.stdin!.end(`${TEST_PASSWORD}\n`);
    await cli;
    // Well before the once-a-minute re-check: the server heard the change from PostgreSQL.
    const closed = await Promise.race([viewer.closed, new Promise<null>((resolve) => setTimeout(() => resolve(null), 20_000))]);
    expect(closed).toEqual({ code: WS_CLOSE_UNAUTHENTICATED, reason: expect.stringMatching(/password changed/) });
  });

  it('closes a socket that does not sign in within the time allowed', async () => {
    const idle = await connect(server, null);
    expect((await idle.closed).code).toBe(WS_CLOSE_UNAUTHENTICATED);
  });

  it('caps connections per client address, so idle sockets from one address do not lock out a viewer elsewhere', async () => {
    // Two sockets wait to sign in from 127.0.0.2; a third waiting one is refused.
    const idle = [await connect(server, null, '127.0.0.2'), await connect(server, null, '127.0.0.2')];
    const third = await connect(server, null, '127.0.0.2');
    expect(await third.closed).toEqual({ code: WS_CLOSE_TRY_AGAIN_LATER, reason: 'too many connections from this address' });
    // A viewer at another address signs in.
    const elsewhere = await connect(server, await signIn(server, 'viewer'), '127.0.0.3');
    await elsewhere.next('hello');
    for (const socket of [...idle, elsewhere]) socket.ws.close();
    await Promise.all([...idle, elsewhere].map((s) => s.closed));

    // At most three connections per address in all, signed in or not.
    const token = await signIn(server, 'viewer');
    const signedIn = [await connect(server, token, '127.0.0.4'), await connect(server, token, '127.0.0.4'), await connect(server, token, '127.0.0.4')];
    await Promise.all(signedIn.map((s) => s.next('hello')));
    const fourth = await connect(server, token, '127.0.0.4');
    expect((await fourth.closed).code).toBe(WS_CLOSE_TRY_AGAIN_LATER);
    signedIn[0].ws.close();
    await signedIn[0].closed;
    const again = await connect(server, token, '127.0.0.4');
    await again.next('hello');
    for (const socket of [...signedIn.slice(1), again]) socket.ws.close();
  });
});
