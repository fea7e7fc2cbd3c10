import { defineConfig } from 'vitest/config';

// Three suites: unit (shared/ against published sources), api (supertest on a real, migrated
// PostgreSQL) and e2e (real Chromium against the built client). `npm test` provides DATABASE_URL.
export default defineConfig({
  test: {
    // two files at a time (the default on two cores is one): a file spends much of its time
    // waiting on PostgreSQL or a browser. The browser suite still runs its files one by one.
    maxWorkers: 2,
    projects: [
      {
        test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' },
      },
      {
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/support/global-setup.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/support/global-setup.ts'],
          testTimeout: 120_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
