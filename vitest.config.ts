import { defineConfig } from 'vitest/config';

// Two projects: pure/server code runs in node, React components in jsdom.
// Server tests talk to the real test database that `npm test` starts (DATABASE_URL).
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'node',
          environment: 'node',
          include: ['tests/shared/**/*.test.ts', 'tests/server/**/*.test.ts', 'tests/demo-data/**/*.test.ts'],
          setupFiles: ['tests/setup/node.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
          // Server tests share one database; run files one after another.
          fileParallelism: false,
        },
      },
      {
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['tests/e2e/**/*.e2e.ts'],
          globalSetup: ['tests/e2e/global-setup.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
      {
        test: {
          // Fault tests: clusters of their own made, restarted and killed by the test; several processes on one
          // database (npm run faults; the ones under a minute also in npm test).
          name: 'faults',
          environment: 'node',
          include: ['tests/faults/**/*.fault.ts'],
          // No console.error trap: a store or driver may log while the database is down on purpose.
          testTimeout: 300_000,
          hookTimeout: 300_000,
          fileParallelism: false,
        },
      },
      {
        test: {
          name: 'dom',
          environment: 'jsdom',
          include: ['tests/src/**/*.test.tsx'],
          setupFiles: ['tests/setup/dom.ts'],
        },
      },
    ],
  },
});
