import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

const alias = {
  '@': fileURLToPath(new URL('./src', import.meta.url)),
  '@common': fileURLToPath(new URL('./common', import.meta.url)),
};

/** One throwaway PostgreSQL cluster per run, started only when a project that uses it runs. */
const withDatabase = ['tests/setup/global-db.ts'];

export default defineConfig({
  resolve: { alias },
  test: {
    setupFiles: ['tests/setup/fail-on-console-error.ts'],
    reporters: ['default'],
    projects: [
      {
        extends: true,
        test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' },
      },
      {
        extends: true,
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          globalSetup: withDatabase,
          environment: 'node',
          testTimeout: 20_000,
          hookTimeout: 30_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'client',
          include: ['tests/client/**/*.test.tsx'],
          environment: 'jsdom',
          setupFiles: ['tests/setup/client.ts'],
          // jsdom pages take seconds on a busy machine; waits are on events (tests/setup/client.ts).
          testTimeout: 30_000,
        },
      },
      {
        extends: true,
        test: {
          // Built instances behind Debian's nginx (scripts/cluster); one cluster at a time.
          name: 'cluster',
          include: ['tests/cluster/**/*.test.ts'],
          environment: 'node',
          testTimeout: 60_000,
          hookTimeout: 300_000,
          fileParallelism: false,
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: withDatabase,
          environment: 'node',
          testTimeout: 180_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
