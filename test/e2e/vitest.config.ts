import { defineConfig } from 'vitest/config';

/**
 * Browser end-to-end suite: the built app (`npm run build` first) served by a real server with
 * the simulated controller, driven in Debian's Chromium through playwright-core.
 */
export default defineConfig({
  test: {
    include: ['test/e2e/**/*.e2e.ts'],
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 90_000,
    pool: 'forks',
    maxWorkers: 1,
    fileParallelism: false,
  },
});
