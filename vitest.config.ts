import { defineConfig } from 'vitest/config';

/**
 * Node-side suites: shared/, server/, broker/, simulator/ unit specs beside their code, and the
 * cross-part integration suites under test/integration/. The Angular specs run through
 * `ng test`; the browser end-to-end suite has its own config under test/e2e/.
 */
export default defineConfig({
  test: {
    include: [
      'shared/**/*.spec.ts',
      'server/**/*.spec.ts',
      'broker/**/*.spec.ts',
      'simulator/**/*.spec.ts',
      'test/integration/**/*.spec.ts',
    ],
    environment: 'node',
    testTimeout: 30_000,
    hookTimeout: 60_000,
    pool: 'forks',
    maxWorkers: 2,
  },
});
