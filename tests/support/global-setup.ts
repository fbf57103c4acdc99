import { buildClientIfNeeded } from './browser';

/** Builds the client once before any browser test runs, not once per test file. */
export default function setup(): void {
  buildClientIfNeeded();
  if (!process.env.PANELPOINT_TEST_PGHOST) {
    console.log('PostgreSQL tests skipped: PANELPOINT_TEST_PGHOST is not set, so the API tests run on SQLite only (.ci/run starts a PostgreSQL server of its own and runs them on both).');
  }
}
