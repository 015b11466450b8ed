import { defineConfig } from 'vitest/config';

// One test command for the whole repository; each workspace keeps its tests beside its code.
// One identity provider for every project (one issuer, so accounts bind the same way everywhere),
// the browser tests run after the integration tests (both use the one test database), and the
// reliability tests last.
export default defineConfig({
  test: {
    globalSetup: ['tests/support/global-setup.ts'],
    projects: [
      {
        test: {
          name: 'unit',
          include: ['shared/src/**/*.test.ts', 'api/src/**/*.test.ts', 'worker/src/**/*.test.ts', 'db/src/**/*.test.ts', 'web/src/**/*.test.ts'],
          sequence: { groupOrder: 0 },
        },
      },
      {
        test: {
          name: 'integration',
          include: ['tests/integration/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 60_000,
          sequence: { groupOrder: 0 },
        },
      },
      {
        test: {
          name: 'browser',
          include: ['tests/browser/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 120_000,
          hookTimeout: 120_000,
          sequence: { groupOrder: 1 },
        },
      },
      {
        // Hostile input, killed processes and a mail server that goes away: slow, so last.
        test: {
          name: 'reliability',
          include: ['tests/reliability/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 300_000,
          hookTimeout: 120_000,
          sequence: { groupOrder: 2 },
        },
      },
    ],
  },
});
