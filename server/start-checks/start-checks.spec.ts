import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { createServer, type Server } from 'node:net';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ConfigError } from '../config.js';
import { lockDataFolder } from '../data-folder/data-folder-lock.js';
import { openDatabase } from '../db/database.js';
import { pino } from 'pino';
import { FrameGate } from '../ingest/frame-gate.js';
import { startIngest } from '../ingest/mqtt-ingest.js';
import { projectRoot } from '../project-root.js';
import { startServer } from '../server.js';
import { makeDataDir, makeEmptyDir, removeDataDir, testConfig } from '../testing/test-server.js';

const NODE_TSX = [process.execPath, '--import', 'tsx'] as const;

/** Runs a script of the project to its end; returns exit code and all output. */
function runScript(script: string, args: string[], env: NodeJS.ProcessEnv): Promise<{ code: number | null; output: string }> {
  return new Promise((resolve) => {
    const child = spawn(NODE_TSX[0], [...NODE_TSX.slice(1), script, ...args], { cwd: projectRoot(), env: { ...process.env, ...env } });
    let output = '';
    child.stdout.on('data', (c: Buffer) => (output += c.toString()));
    child.stderr.on('data', (c: Buffer) => (output += c.toString()));
    child.on('exit', (code) => resolve({ code, output }));
  });
}

/** Holds a TCP port on 127.0.0.1 as another program would. */
function occupy(): Promise<{ port: number; server: Server }> {
  return new Promise((resolve) => {
    const server = createServer();
    server.listen(0, '127.0.0.1', () => resolve({ port: (server.address() as { port: number }).port, server }));
  });
}

async function closedPort(): Promise<number> {
  const { port, server } = await occupy();
  await new Promise((r) => server.close(r));
  return port;
}

const PREFLIGHT = 'server/start-checks/main.ts';

describe('start-up checks (npm start runs them before the build)', () => {
  let dir: string;
  const held: Server[] = [];
  beforeEach(() => {
    dir = makeEmptyDir();
  });
  afterEach(async () => {
    for (const server of held.splice(0)) await new Promise((r) => server.close(r));
    removeDataDir(dir);
  });

  async function port(): Promise<number> {
    const { port, server } = await occupy();
    held.push(server);
    return port;
  }

  it('finds the data folder in use before anything is built', async () => {
    const lock = lockDataFolder(dir);
    try {
      const { code, output } = await runScript(PREFLIGHT, ['--demo'], { TILTWATCH_DATA_DIR: dir, PORT: '0', MQTT_PORT: '0', SIM_CONTROL_PORT: '0' });
      expect(code).toBe(2);
      expect(output).toMatch(new RegExp(`data folder ${dir} is already in use by Tiltwatch process ${process.pid}.*TILTWATCH_DATA_DIR`));
    } finally {
      lock.release();
    }
    expect((await runScript(PREFLIGHT, ['--demo'], { TILTWATCH_DATA_DIR: dir, PORT: '0', MQTT_PORT: '0', SIM_CONTROL_PORT: '0' })).code).toBe(0);
  });

  it('names the variable of every port already in use', async () => {
    const [web, mqtt, control] = [await port(), await port(), await port()];
    const { code, output } = await runScript(PREFLIGHT, ['--demo'], {
      TILTWATCH_DATA_DIR: dir,
      PORT: String(web),
      MQTT_PORT: String(mqtt),
      SIM_CONTROL_PORT: String(control),
    });
    expect(code).toBe(2);
    expect(output).toContain(`port ${web} is already in use (another Tiltwatch, or another program). Stop it, or set PORT to a free port.`);
    expect(output).toContain(`port ${mqtt} is already in use (another Tiltwatch, or another program). Stop it, or set MQTT_PORT to a free port.`);
    expect(output).toContain(`port ${control} is already in use (another Tiltwatch, or another program). Stop it, or set SIM_CONTROL_PORT to a free port.`);
  });

  it('names PORT when the server itself finds its port taken', { timeout: 120_000 }, async () => {
    const web = await port();
    const seeded = await makeDataDir();
    await expect(startServer(testConfig(seeded, { PORT: String(web) })).finally(() => removeDataDir(seeded))).rejects.toThrow(`port ${web} is already in use (another Tiltwatch, or another program). Stop it, or set PORT to a free port.`);
  });
});

describe('configuration errors name the variable', () => {
  let dir: string;
  beforeEach(() => {
    dir = makeEmptyDir();
  });
  afterEach(() => removeDataDir(dir));

  it('refuses a HOST that is not an address of this machine before anything starts', async () => {
    const error = await startServer(testConfig(dir, { HOST: '203.0.113.9' })).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ConfigError);
    expect(String(error)).toMatch(/HOST="203\.0\.113\.9" is not an address of this machine\. Set HOST/);
    expect(readdirSync(dir)).toEqual([]); // no lock, no database: nothing was started
  });

  it('refuses a bad MQTT_HOST before anything starts', async () => {
    const error = await startServer(testConfig(dir, { MQTT_HOST: 'no-such-host.invalid' })).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ConfigError);
    expect(String(error)).toMatch(/MQTT_HOST="no-such-host\.invalid" is not an address of this machine\. Set MQTT_HOST/);
    expect(readdirSync(dir)).toEqual([]);
  });

  it('names MQTT_URL with the real reason when an external broker cannot be reached', async () => {
    const error = await startIngest({
      url: 'mqtt://no-such-broker.invalid:1883',
      username: null,
      password: null,
      gate: new FrameGate(),
      deliver: () => {},
      log: pino({ level: 'silent' }),
      connectTimeoutMs: 3000,
    }).catch((e: unknown) => e);
    expect(String(error)).toMatch(/Cannot reach the MQTT broker at mqtt:\/\/no-such-broker\.invalid:1883 within 3 s \(.*ENOTFOUND.*\): check MQTT_URL/);
  });

  it('refuses a data folder that is a file', async () => {
    const file = path.join(dir, 'not-a-folder');
    writeFileSync(file, '');
    await expect(startServer(testConfig(file))).rejects.toThrow(/TILTWATCH_DATA_DIR=".*not-a-folder" is a file, not a folder/);
  });

  it('shows the real connection error of an unreachable PostgreSQL server and retries before giving up', async () => {
    const port = await closedPort();
    const retries: string[] = [];
    // localhost: both ::1 and 127.0.0.1 refuse, which the driver reports as an error without a message of its own.
    const error = await openDatabase({ dataDir: dir, databaseUrl: `postgres://tiltwatch@localhost:${port}/tiltwatch`, maxAttempts: 2, onRetry: (reason) => retries.push(reason) }).catch((e: unknown) => e);
    expect(retries).toEqual([expect.stringMatching(new RegExp(`connect ECONNREFUSED .*:${port}`))]);
    expect(error).toBeInstanceOf(ConfigError);
    expect(String(error)).toMatch(new RegExp(`DATABASE_URL: cannot open the PostgreSQL database: connect ECONNREFUSED .*:${port}`));
  });

  it('keeps retrying at start while the database is down, saying why each time', { timeout: 60_000 }, async () => {
    const port = await closedPort();
    const child = spawn(NODE_TSX[0], [...NODE_TSX.slice(1), 'server/main.ts'], {
      cwd: projectRoot(),
      env: { ...process.env, TILTWATCH_DATA_DIR: dir, PORT: '0', MQTT_PORT: '0', LOG_LEVEL: 'warn', DATABASE_URL: `postgres://tiltwatch@127.0.0.1:${port}/tiltwatch` },
    });
    try {
      const output = await readUntil(child, (text) => (text.match(/trying again/g) ?? []).length >= 2);
      expect(output).toContain(`PostgreSQL at DATABASE_URL cannot be reached (connect ECONNREFUSED 127.0.0.1:${port}); trying again in 1 s`);
      expect(output).toContain('trying again in 2 s');
      expect(child.exitCode).toBeNull();
    } finally {
      await stopProcess(child, 'SIGKILL');
    }
  });
});

describe('recovery after kill -9', () => {
  let dir: string;
  beforeEach(async () => {
    dir = await makeDataDir();
  });
  afterEach(() => removeDataDir(dir));

  it('under --demo the simulator ends with its server, and the next start is not blocked', { timeout: 240_000 }, async () => {
    const controlPort = await closedPort();
    const env = { TILTWATCH_DATA_DIR: dir, PORT: '0', MQTT_PORT: '0', SIM_CONTROL_PORT: String(controlPort), LOG_LEVEL: 'warn' };
    const first = spawn(NODE_TSX[0], [...NODE_TSX.slice(1), 'server/main.ts', '--demo'], { cwd: projectRoot(), env: { ...process.env, ...env } });
    let simulatorPid: number;
    try {
      await readUntil(first, (text) => text.includes('Simulated controller: running'));
      simulatorPid = await waitForValue(() => childrenOf(first.pid!)[0], 'the simulator process');
      await waitForValue(() => (portTaken(controlPort) ? true : undefined), 'the simulator control endpoint');
    } finally {
      await stopProcess(first, 'SIGKILL');
    }
    await waitForValue(() => (isRunning(simulatorPid) ? undefined : true), 'the orphaned simulator to end');
    expect(existsSync(path.join(dir, 'tiltwatch.lock'))).toBe(true); // left behind by the killed server

    const second = spawn(NODE_TSX[0], [...NODE_TSX.slice(1), 'server/main.ts', '--demo'], { cwd: projectRoot(), env: { ...process.env, ...env } });
    try {
      const output = await readUntil(second, (text) => text.includes('Simulated controller: running'));
      expect(output).not.toMatch(/already in use|cannot listen/);
    } finally {
      await stopProcess(second, 'SIGTERM');
    }
  });
});

function readUntil(child: ChildProcess, done: (text: string) => boolean, timeoutMs = 100_000): Promise<string> {
  return new Promise((resolve, reject) => {
    let text = '';
    const timer = setTimeout(() => reject(new Error(`timed out; output so far:\n${text}`)), timeoutMs);
    const take = (chunk: Buffer) => {
      text += chunk.toString();
      if (done(text)) {
        clearTimeout(timer);
        resolve(text);
      }
    };
    child.stdout!.on('data', take);
    child.stderr!.on('data', take);
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`exited with ${code}; output:\n${text}`));
    });
  });
}

async function stopProcess(child: ChildProcess, signal: NodeJS.Signals): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return;
  const exited = new Promise((r) => child.once('exit', r));
  child.kill(signal);
  await exited;
}

/** PIDs whose parent is `pid` (Linux /proc). */
function childrenOf(pid: number): number[] {
  const out: number[] = [];
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = readFileSync(`/proc/${entry}/stat`, 'utf8');
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      if (ppid === pid) out.push(Number(entry));
    } catch {
      // gone meanwhile
    }
  }
  return out;
}

function isRunning(pid: number): boolean {
  try {
    process.kill(pid, 0);
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    return stat.slice(stat.lastIndexOf(')') + 2)[0] !== 'Z';
  } catch {
    return false;
  }
}

function portTaken(port: number): boolean | undefined {
  const tcp = readFileSync('/proc/net/tcp', 'utf8') + (existsSync('/proc/net/tcp6') ? readFileSync('/proc/net/tcp6', 'utf8') : '');
  const hex = port.toString(16).toUpperCase().padStart(4, '0');
  return tcp.split('\n').some((line) => line.includes(`:${hex} `) && line.trim().split(/\s+/)[3] === '0A') || undefined;
}

async function waitForValue<T>(probe: () => T | undefined, what: string, timeoutMs = 20_000): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const value = probe();
    if (value !== undefined) return value;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}
