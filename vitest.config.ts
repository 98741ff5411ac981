import { defineConfig } from 'vitest/config';

/**
 * Every suite in one run, so `npm test` can add them up. The api, worker, cli and browser
 * projects use the PostgreSQL, Redis and fakes that `npm test` starts (see infra/src/main.ts).
 */
export default defineConfig({
  test: {
    projects: [
      { test: { name: 'unit', include: ['shared/src/**/*.test.ts', 'infra/**/*.test.ts'], environment: 'node' } },
      'portal/vitest.config.ts',
      // api files run one after another: some change consortium-wide state (the admins).
      { test: { name: 'api', include: ['services/api/**/*.test.ts', 'seeds/**/*.test.ts'], testTimeout: 30_000, hookTimeout: 60_000, fileParallelism: false } },
      { test: { name: 'worker', include: ['services/worker/**/*.test.ts'], testTimeout: 30_000, hookTimeout: 60_000 } },
      // The cli signs in with the demo admin's token; it waits for the api suite, which changes admins.
      { test: { name: 'cli', include: ['services/cli/**/*.test.ts'], testTimeout: 30_000, hookTimeout: 60_000, sequence: { groupOrder: 1 } } },
      // The browser suite runs last (groupOrder) against the running test stack.
      // Pages wait on the api, which shares the machine with the other suites: polls get 10 s, not 1 s.
      { test: { name: 'browser', include: ['portal/e2e/**/*.e2e.test.ts'], testTimeout: 90_000, hookTimeout: 90_000, fileParallelism: false, sequence: { groupOrder: 2 }, expect: { poll: { timeout: 10_000 } } } },
    ],
  },
});
