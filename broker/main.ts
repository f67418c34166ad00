/**
 * Standalone MQTT broker: `npm run broker`.
 *
 * Environment: TILTWATCH_DATA_DIR (default ./data) holds mqtt-credentials.json, created on first
 * start; MQTT_PORT (default 1883); MQTT_HOST (default 127.0.0.1).
 */
import { pino } from 'pino';
import { startBroker } from './broker.js';
import { credentialsFile, loadOrCreateCredentials } from './credentials.js';

const logger = pino({ name: 'tiltwatch-broker' });

interface BrokerEnv {
  dataDir: string;
  port: number;
  host: string;
}

/** Reads the broker's environment variables, throwing a message that says what to fix. */
function readEnv(env: NodeJS.ProcessEnv): BrokerEnv {
  const dataDir = env['TILTWATCH_DATA_DIR'] ?? './data';
  if (dataDir.trim() === '') throw new Error('TILTWATCH_DATA_DIR must name a folder, got an empty value');

  const rawPort = env['MQTT_PORT'] ?? '1883';
  const port = Number(rawPort);
  if (!/^\d+$/.test(rawPort) || port > 65535) {
    throw new Error(`MQTT_PORT must be an integer 0–65535, got '${rawPort}'`);
  }

  const host = env['MQTT_HOST'] ?? '127.0.0.1';
  if (host === '' || /\s/.test(host)) {
    throw new Error(`MQTT_HOST must be a host name or IP address without spaces, got '${host}'`);
  }
  return { dataDir, port, host };
}

async function main(): Promise<void> {
  const env = readEnv(process.env);
  const credentials = await loadOrCreateCredentials(env.dataDir);
  const broker = await startBroker({
    port: env.port,
    host: env.host,
    credentials,
    log: (msg, fields) => logger.info(fields ?? {}, msg),
  }).catch((error: unknown) => {
    throw new Error(`${(error as Error).message}; choose another MQTT_PORT or MQTT_HOST`);
  });
  logger.info({ url: broker.url, credentialsFile: credentialsFile(env.dataDir) }, 'MQTT broker listening');
  if (!['127.0.0.1', '::1', 'localhost'].includes(env.host)) {
    logger.warn({ host: env.host }, 'MQTT broker is reachable from other machines; MQTT traffic is not encrypted');
  }

  const shutdown = (signal: NodeJS.Signals): void => {
    logger.info({ signal }, 'closing MQTT broker');
    broker.close().then(
      () => logger.info('MQTT broker closed'),
      (error: unknown) => {
        logger.error({ err: error }, 'MQTT broker did not close cleanly');
        process.exitCode = 1;
      },
    );
  };
  process.once('SIGINT', shutdown);
  process.once('SIGTERM', shutdown);
}

main().catch((error: unknown) => {
  logger.fatal(error instanceof Error ? error.message : String(error));
  process.exitCode = 1;
});
