import { defineConfig } from 'vitest/config';

// One test command for the whole repository; each workspace keeps its tests beside its code.
export default defineConfig({
  test: {
    projects: [
      { test: { name: 'unit', include: ['shared/src/**/*.test.ts', 'api/src/**/*.test.ts', 'worker/src/**/*.test.ts', 'db/src/**/*.test.ts', 'web/src/**/*.test.ts'] } },
      { test: { name: 'integration', include: ['tests/integration/**/*.test.ts'], globalSetup: ['tests/support/global-setup.ts'], fileParallelism: false, testTimeout: 60_000, hookTimeout: 60_000 } },
      { test: { name: 'browser', include: ['tests/browser/**/*.test.ts'], globalSetup: ['tests/support/global-setup.ts'], fileParallelism: false, testTimeout: 120_000, hookTimeout: 120_000 } },
    ],
  },
});
