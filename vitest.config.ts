import { defineConfig } from 'vitest/config';

/**
 * Every suite in one run, so `npm test` can add them up. The api, worker, cli and browser
 * projects use the PostgreSQL, Redis and fakes that `npm test` starts (see infra/src/main.ts).
 */
export default defineConfig({
  test: {
    projects: [
      { test: { name: 'unit', include: ['shared/src/**/*.test.ts', 'infra/**/*.test.ts', 'seeds/**/*.test.ts'], environment: 'node' } },
      'portal/vitest.config.ts',
      { test: { name: 'api', include: ['services/api/**/*.test.ts'], testTimeout: 30_000, hookTimeout: 60_000 } },
      { test: { name: 'worker', include: ['services/worker/**/*.test.ts'], testTimeout: 30_000, hookTimeout: 60_000 } },
      { test: { name: 'cli', include: ['services/cli/**/*.test.ts'], testTimeout: 30_000, hookTimeout: 60_000 } },
      { test: { name: 'browser', include: ['portal/e2e/**/*.e2e.test.ts'], testTimeout: 90_000, hookTimeout: 90_000, fileParallelism: false } },
    ],
  },
});
