import { defineConfig } from 'vitest/config';

/**
 * The second CI pass (`npm run test:external`, started by test/external/run.ts): the suites
 * that store data or speak MQTT, run against a real PostgreSQL server and an external mosquitto
 * broker (MQTT 5), plus the suites that need those servers (this folder). The browser suite
 * and the pure unit specs run once, in `npm test`.
 */
export default defineConfig({
  test: {
    include: [
      'test/integration/**/*.spec.ts',
      'test/external/**/*.spec.ts',
      'server/auth/auth.spec.ts',
      'server/http/hostile-input.spec.ts',
      'server/users/users.spec.ts',
      'server/users/users-cli.spec.ts',
      'server/fanout/sessions.spec.ts',
      'server/alarms/supervision-journal.spec.ts',
      'server/alarms/alarm-routes.spec.ts',
      'server/interlock/interlock-routes.spec.ts',
      'server/ingest/ingest.spec.ts',
      'server/storage/storage.spec.ts',
      'server/profiles/profiles.spec.ts',
      'server/shots/shots.spec.ts',
      'server/fanout/live-fanout.spec.ts',
      'server/prediction/live-prediction.spec.ts',
    ],
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: 'forks',
    maxWorkers: 2,
  },
});
