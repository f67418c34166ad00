/**
 * The second CI pass (`npm run test:external`) runs the server's integration suites against a
 * real PostgreSQL server and an external mosquitto broker instead of PGlite and the embedded
 * broker. It sets:
 *
 * * `TILTWATCH_TEST_DATABASE_URL`: maintenance connection of a PostgreSQL server; each test
 *   server gets a fresh database there;
 * * `TILTWATCH_TEST_MQTT=mosquitto`: each test server gets its own mosquitto (clean retained
 *   state, no cross-talk between parallel tests), configured like a real deployment;
 * * `TILTWATCH_TEST_MQTT_PROTOCOL_VERSION`: `3.1.1` or `5` for the server's and the simulator's clients.
 *
 * Without them (`npm test`) nothing changes: PGlite and the embedded broker.
 */
import type { RunningServer } from '../server.js';
import type { BrokerCredentials } from '../../broker/credentials.js';
import { mqttProtocolLevel, type MqttProtocolLevel } from '../../shared/telemetry/mqtt-protocol.js';
import { startMosquitto } from './mosquitto-server.js';
import { createDatabase } from './postgres-server.js';

export interface ExternalServices {
  /** Extra server environment (DATABASE_URL, MQTT_URL, …); empty in the ordinary pass. */
  env: Record<string, string>;
  /** The external broker's accounts; null with the embedded broker. */
  brokerCredentials: BrokerCredentials | null;
  close(): Promise<void>;
}

/** The MQTT protocol level the test clients speak (3.1.1 unless the external pass asks for 5). */
export function testMqttProtocol(): MqttProtocolLevel {
  return mqttProtocolLevel(process.env.TILTWATCH_TEST_MQTT_PROTOCOL_VERSION) ?? 4;
}

/** Whether this run uses an external broker (its behaviour on refusals differs from aedes). */
export function usesExternalBroker(): boolean {
  return process.env.TILTWATCH_TEST_MQTT === 'mosquitto';
}

/** Whether this run stores in a PostgreSQL server rather than PGlite in the data folder. */
export function usesPostgres(): boolean {
  return !!process.env.TILTWATCH_TEST_DATABASE_URL;
}

/** PostgreSQL database of each data folder, so a test that restarts its server finds its data again. */
const databases = new Map<string, string>();

/** The PostgreSQL database a test server on `dataDir` used; null in the ordinary pass (PGlite in the folder). */
export function databaseUrlFor(dataDir: string): string | null {
  return databases.get(dataDir) ?? null;
}

/**
 * The PostgreSQL database of the server on `dataDir` in the external pass (created on first use,
 * the same one for every later server on that folder); null in the ordinary pass.
 */
export async function testDatabaseUrl(dataDir: string): Promise<string | null> {
  const adminUrl = process.env.TILTWATCH_TEST_DATABASE_URL;
  if (!adminUrl) return null;
  let database = databases.get(dataDir);
  if (!database) {
    const name = `tiltwatch_t${process.pid}_${databases.size + 1}_${Math.random().toString(36).slice(2, 8)}`;
    await createDatabase(adminUrl, name);
    const url = new URL(adminUrl);
    url.pathname = `/${name}`;
    database = url.toString();
    databases.set(dataDir, database);
  }
  return database;
}

/** Starts what the external pass asks for a server on `dataDir` (nothing in the ordinary pass). */
export async function externalServices(dataDir: string): Promise<ExternalServices> {
  const env: Record<string, string> = {};
  const closers: (() => Promise<void>)[] = [];
  const database = await testDatabaseUrl(dataDir);
  if (database) env.DATABASE_URL = database;
  let brokerCredentials: BrokerCredentials | null = null;
  if (usesExternalBroker()) {
    const broker = await startMosquitto();
    closers.push(() => broker.close());
    brokerCredentials = broker.credentials;
    env.MQTT_URL = broker.url;
    env.MQTT_USERNAME = broker.credentials.server.username;
    env.MQTT_PASSWORD = broker.credentials.server.password;
    env.MQTT_PROTOCOL_VERSION = testMqttProtocol() === 5 ? '5' : '3.1.1';
  }
  return {
    env,
    brokerCredentials,
    async close() {
      for (const close of closers) await close();
    },
  };
}

/** The server as tests see it: the external broker's accounts filled in, and closed together with it. */
export function withServices(server: RunningServer, services: ExternalServices): RunningServer {
  if (!services.brokerCredentials && Object.keys(services.env).length === 0) return server;
  return {
    ...server,
    brokerCredentials: server.brokerCredentials ?? services.brokerCredentials,
    async close() {
      await server.close();
      await services.close();
    },
  };
}
