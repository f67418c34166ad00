/**
 * `npm run test:external`: starts a private PostgreSQL server (Debian's binaries, as a non-root
 * user, on a free port, in a temporary folder), runs the suites of test/external/vitest.config.ts
 * against it and against mosquitto (each test server gets its own broker, MQTT 5 unless
 * TILTWATCH_TEST_MQTT_PROTOCOL_VERSION says 3.1.1), then stops the server. Needs
 * `postgresql` and `mosquitto` installed (`.ci/run` installs them); exits 2 when they are missing.
 */
import { spawn } from 'node:child_process';
import { mosquittoBinary } from '../../server/testing/mosquitto-server.js';
import { postgresBinDir, startPostgres } from '../../server/testing/postgres-server.js';

const missing = [postgresBinDir() ? null : 'PostgreSQL server binaries (apt-get install postgresql)', mosquittoBinary() ? null : 'mosquitto (apt-get install mosquitto)'].filter(Boolean);
if (missing.length > 0) {
  console.error(`test:external needs ${missing.join(' and ')}`);
  process.exit(2);
}

const postgres = await startPostgres();
console.log(`test:external: PostgreSQL on port ${postgres.port}, mosquitto per test server`);
let code = 1;
try {
  const args = ['vitest', 'run', '--config', 'test/external/vitest.config.ts', ...process.argv.slice(2)];
  const child = spawn('npx', args, {
    stdio: 'inherit',
    env: {
      ...process.env,
      TILTWATCH_TEST_DATABASE_URL: postgres.url(),
      TILTWATCH_TEST_MQTT: 'mosquitto',
      TILTWATCH_TEST_MQTT_PROTOCOL_VERSION: process.env.TILTWATCH_TEST_MQTT_PROTOCOL_VERSION ?? '5',
    },
  });
  const stop = (signal: NodeJS.Signals) => child.kill(signal);
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
  code = await new Promise<number>((resolve) => child.on('exit', (c, signal) => resolve(c ?? (signal ? 1 : 0))));
} finally {
  await postgres.close();
}
process.exit(code);
