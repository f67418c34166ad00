/**
 * The server as its own process (`server/main.ts`), and the lab's own accounts made with the
 * `users` command, for tests that stop or kill the process or change accounts from outside it.
 */
import { execFileSync, spawn, type ChildProcessWithoutNullStreams } from 'node:child_process';
import path from 'node:path';
import type { Role } from '../../shared/auth/roles.js';
import { projectRoot } from '../../server/project-root.js';
import { testDatabaseUrl } from '../../server/testing/external-services.js';
import { TEST_PASSWORD } from '../../server/testing/test-server.js';
import { waitFor } from './stack.js';

export interface ServerProcess {
  child: ChildProcessWithoutNullStreams;
  url: string;
  mqttUrl: string;
  output: () => string;
}

/**
 * Starts `server/main.ts` (with `args`) as a process group of its own on free ports in `dir`;
 * `env` is added to its environment (e.g. a DATABASE_URL of the test's own PostgreSQL server).
 */
export async function spawnServer(dir: string, args: string[], env: Record<string, string> = {}): Promise<ServerProcess> {
  // In the external pass the process stores in the PostgreSQL database that later in-process servers on `dir` use too.
  const database = await testDatabaseUrl(dir);
  const child = spawn(process.execPath, ['--import', 'tsx', path.join('server', 'main.ts'), ...args], {
    cwd: projectRoot(),
    env: {
      ...process.env,
      PORT: '0',
      MQTT_PORT: '0',
      SIM_CONTROL_PORT: '0',
      TILTWATCH_DATA_DIR: dir,
      TILTWATCH_DEMO_PASSWORD: TEST_PASSWORD,
      LOG_LEVEL: 'info',
      ...(database ? { DATABASE_URL: database } : {}),
      ...env,
    },
    // Its own group, as a terminal runs a foreground job: Ctrl-C goes to the whole group.
    detached: true,
  });
  let output = '';
  child.stdout.on('data', (chunk: Buffer) => (output += chunk.toString()));
  child.stderr.on('data', (chunk: Buffer) => (output += chunk.toString()));
  const line = await waitFor(() => output.split('\n').find((l) => l.includes('"msg":"Tiltwatch server started"')), 'the server process to start', 60_000);
  const started = JSON.parse(line) as { url: string; mqtt: string };
  return { child, url: started.url, mqttUrl: started.mqtt, output: () => output };
}

/** A real (non-demo) account per role, as a lab makes them: with the users command. */
export const accountOf = (role: Role) => `${role}.on-shift@lindqvist-hall.example`;

/** Adds an account per role with the `users` command (`env` as for `spawnServer`). */
export async function addAccounts(dir: string, roles: Role[], env: Record<string, string> = {}): Promise<void> {
  const database = await testDatabaseUrl(dir);
  for (const role of roles) {
    execFileSync(process.execPath, ['--import', 'tsx', path.join('server', 'users', 'users-cli.ts'), 'add', accountOf(role), '--role', role], {
      cwd: projectRoot(),
      env: { ...process.env, TILTWATCH_DATA_DIR: dir, LOG_LEVEL: 'warn', ...(database ? { DATABASE_URL: database } : {}), ...env },
      input: `${TEST_PASSWORD}\n`,
    });
  }
}

/** Signs in with the `users` command's account of `role`; returns the token. */
export async function login(url: string, role: Role): Promise<string> {
  const res = await fetch(`${url}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: accountOf(role), password: TEST_PASSWORD }),
  });
  return ((await res.json()) as { token: string }).token;
}

