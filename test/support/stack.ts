/**
 * Starts the whole product in one process for cross-part tests and benchmarks: the server with
 * its embedded broker on free ports, a real PGlite in a temporary data folder, and (optionally)
 * the simulated controller connected with the controller account. `close()` stops everything
 * in reverse order and removes the folder.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadConfig } from '../../server/config.js';
import { externalServices, testMqttProtocol, withServices } from '../../server/testing/external-services.js';
import { startServer, type RunningServer } from '../../server/server.js';
import { seedPglite } from '../../server/testing/pglite-template.js';
import { startSimulator, type RunningSimulator, type SimulatorOptions } from '../../simulator/index.js';

export interface Stack {
  server: RunningServer;
  simulator: RunningSimulator | null;
  dataDir: string;
  close(): Promise<void>;
}

export interface StackOptions {
  /** Start the simulated controller (default true). */
  simulator?: boolean;
  /** Extra simulator options (seed, demo, thermalSpeedup, …). */
  simulatorOptions?: Partial<SimulatorOptions>;
  /** Extra environment for the server's configuration. */
  env?: Record<string, string>;
  /** Runs on the data folder before the server starts (e.g. to fill its PGlite clusters). */
  beforeServer?: (dataDir: string) => Promise<void>;
}

export async function startStack(options: StackOptions = {}): Promise<Stack> {
  const dataDir = await mkdtemp(join(tmpdir(), 'tiltwatch-test-'));
  const services = await externalServices(dataDir);
  // A copy of the migrated template cluster: creating one from scratch takes half a minute on a busy machine.
  if (!services.env.DATABASE_URL && !options.env?.DATABASE_URL) await seedPglite(dataDir);
  const config = loadConfig({
    PORT: '0',
    MQTT_PORT: services.brokerCredentials ? '' : '0',
    TILTWATCH_DATA_DIR: dataDir,
    LOG_LEVEL: 'warn',
    ...services.env,
    ...options.env,
  });
  await options.beforeServer?.(dataDir);
  const server = withServices(await startServer(config, { demoAccounts: true }), services);
  let simulator: RunningSimulator | null = null;
  if (options.simulator !== false) {
    const account = server.brokerCredentials?.controller;
    if (!account) throw new Error('the embedded broker gave no controller account');
    simulator = await startSimulator({
      mqttUrl: server.mqttUrl,
      username: account.username,
      password: account.password,
      protocolVersion: testMqttProtocol(),
      controlPort: 0,
      demo: true,
      seed: 7,
      ...options.simulatorOptions,
    });
  }
  return {
    server,
    simulator,
    dataDir,
    async close() {
      await simulator?.close();
      await server.close();
      await rm(dataDir, { recursive: true, force: true });
    },
  };
}

/** Signs in through the HTTP API and returns the bearer token. */
export async function signIn(baseUrl: string, role: 'viewer' | 'operator' | 'lead' | 'admin'): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: `${role}@tiltwatch.example`, password: DEMO_PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${role} failed: ${res.status} ${await res.text()}`);
  const body = (await res.json()) as { token: string };
  return body.token;
}

/** The default demo password (README: demo only). */
export const DEMO_PASSWORD = 'tiltwatch-demo';

/** Polls `probe` until it returns a value other than undefined, or fails after `timeoutMs`. */
export async function waitFor<T>(probe: () => Promise<T | undefined> | T | undefined, what: string, timeoutMs = 10_000): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value !== undefined) return value;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}
