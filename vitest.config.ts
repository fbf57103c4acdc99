import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

const root = path.dirname(fileURLToPath(import.meta.url));

/**
 * Two projects. "sqlite": every test, the API tests on SQLite (in memory or a temp file).
 * "postgres": the API tests (tests/api) again, each fresh test server on a new database of
 * the PostgreSQL server that PANELPOINT_TEST_PGHOST names (tests/support/pg.ts); only when that
 * variable is set (.ci/run starts a server of its own and sets it), else skipped with a line.
 */
const pgHost = process.env.PANELPOINT_TEST_PGHOST;

export default defineConfig({
  resolve: {
    alias: {
      '@shared': path.resolve(root, 'shared'),
      '@': path.resolve(root, 'src'),
    },
  },
  test: {
    environment: 'node',
    testTimeout: 30_000,
    hookTimeout: 60_000,
    pool: 'forks',
    globalSetup: ['tests/support/global-setup.ts'],
    projects: [
      {
        extends: true as const,
        test: {
          name: 'sqlite',
          include: ['shared/**/*.test.ts', 'server/**/*.test.ts', 'src/**/*.test.{ts,tsx}', 'tests/**/*.test.ts'],
        },
      },
      ...(pgHost
        ? [
            {
              extends: true as const,
              test: {
                name: 'postgres',
                include: ['tests/api/**/*.test.ts'],
                env: { PANELPOINT_TEST_DATABASE: 'postgres' },
                setupFiles: ['tests/support/pg-setup.ts'],
              },
            },
          ]
        : []),
    ],
  },
});
