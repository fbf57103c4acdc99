import { afterAll } from 'vitest';
import { pgTestDatabasesDrop } from './pg';

// Registered before the file's own hooks, so it runs after them (vitest runs after-hooks in
// reverse order): the file's servers are shut down before their databases are dropped.
afterAll(async () => {
  await pgTestDatabasesDrop();
});
