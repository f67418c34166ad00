import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import mqtt from 'mqtt';
import type { Role } from '../../shared/auth/roles.js';
import { loadConfig, type ServerConfig } from '../config.js';
import { externalServices, testMqttProtocol, withServices } from './external-services.js';
import { seedPglite } from './pglite-template.js';
import { startServer, type RunningServer, type StartOptions } from '../server.js';

/** Password of the demo accounts in test servers. */
export const TEST_PASSWORD = 'test-demo-password';

/**
 * A fresh temporary data folder holding a migrated PGlite cluster (copied from a shared
 * template, see pglite-template.ts); remove it with `removeDataDir`.
 */
export async function makeDataDir(): Promise<string> {
  const dir = mkdtempSync(path.join(tmpdir(), 'tiltwatch-test-'));
  await seedPglite(dir);
  return dir;
}

/** A fresh, empty temporary data folder. */
export function makeEmptyDir(): string {
  return mkdtempSync(path.join(tmpdir(), 'tiltwatch-test-'));
}

export function removeDataDir(dir: string): void {
  rmSync(dir, { recursive: true, force: true });
}

/** Configuration for a test server: free ports, quiet log, the given data folder. */
export function testConfig(dataDir: string, env: NodeJS.ProcessEnv = {}): ServerConfig {
  return loadConfig({
    PORT: '0',
    // An external broker (MQTT_URL) conflicts with the embedded broker's port.
    MQTT_PORT: env.MQTT_URL ? '' : '0',
    TILTWATCH_DATA_DIR: dataDir,
    TILTWATCH_DEMO_PASSWORD: TEST_PASSWORD,
    LOG_LEVEL: 'silent',
    ...env,
  });
}

/**
 * Starts a real server (embedded broker, PGlite) on free ports in `dataDir`, with the demo
 * accounts unless `opts` says otherwise; in the external pass with a fresh PostgreSQL database
 * and its own mosquitto (see external-services.ts).
 */
export async function startTestServer(dataDir: string, opts?: StartOptions, env?: NodeJS.ProcessEnv): Promise<RunningServer> {
  const services = await externalServices(dataDir);
  try {
    return withServices(await startServer(testConfig(dataDir, { ...services.env, ...env }), { demoAccounts: true, ...opts }), services);
  } catch (error) {
    await services.close();
    throw error;
  }
}

/** Signs in as the demo account of `role` and returns its token. */
export async function signIn(server: RunningServer, role: Role): Promise<string> {
  const res = await fetch(`${server.url}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: `${role}@tiltwatch.example`, password: TEST_PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${role} failed: ${res.status} ${await res.text()}`);
  return ((await res.json()) as { token: string }).token;
}

/** Sends `body` (if any) as JSON to `path` with `token` as the bearer; returns the status and the parsed JSON answer. */
export async function callApi<T>(server: RunningServer, token: string | undefined, method: string, path: string, body?: unknown): Promise<{ status: number; body: T }> {
  const res = await fetch(`${server.url}${path}`, {
    method,
    headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return { status: res.status, body: (await res.json()) as T };
}

/** An MQTT client with the embedded broker's controller account, as the simulator would use. */
export async function connectController(server: RunningServer): Promise<mqtt.MqttClient> {
  const account = server.brokerCredentials?.controller;
  if (!account) throw new Error('the test server has no embedded broker');
  return mqtt.connectAsync(server.mqttUrl, { protocolVersion: testMqttProtocol(), ...account, reconnectPeriod: 0 });
}
