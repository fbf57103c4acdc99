import fs from 'node:fs';
import type { Sequelize } from 'sequelize';

/**
 * Holds one lock across every server process on the same database while a start migrates,
 * seeds and opens the keys, so two processes started at the same moment (two app processes
 * behind one proxy, brought up together) do not both run the migrations: without it the second
 * fails on a table, an index or a migrations-table row the first has just made (seen on both
 * databases, tests/api/start-lock.test.ts), or both make the first admin, or both register a
 * first signing key. The other start waits, then finds the work done.
 *
 * - PostgreSQL: a session-level advisory lock on a connection of its own, taken off the pool
 *   for the duration.
 * - SQLite file: a lock file beside the database (`<file>.start-lock`), created exclusively and
 *   holding the owner's process id; one left by a process that no longer runs (kill -9) is
 *   taken over. SQLite files are only ever shared by processes on one machine, so the process id
 *   says enough. An in-memory database needs nothing.
 */
export async function withStartLock<T>(sequelize: Sequelize, work: () => Promise<T>, options: { waitMs?: number } = {}): Promise<T> {
  if (sequelize.getDialect() === 'postgres') return withAdvisoryLock(sequelize, work);
  const storage = (sequelize as unknown as { options: { storage?: string } }).options.storage;
  if (!storage || storage === ':memory:') return work();
  return withLockFile(`${storage}.start-lock`, work, options.waitMs ?? 5 * 60 * 1000);
}

async function withAdvisoryLock<T>(sequelize: Sequelize, work: () => Promise<T>): Promise<T> {
  type Client = { query(sql: string): Promise<unknown> };
  const manager = sequelize.connectionManager as unknown as {
    getConnection(o?: { type?: string }): Promise<Client>;
    releaseConnection(c: Client): Promise<void>;
  };
  const client = await manager.getConnection({ type: 'write' });
  try {
    await client.query("SELECT pg_advisory_lock(hashtext('panelpoint:start'))");
    try {
      return await work();
    } finally {
      await client.query("SELECT pg_advisory_unlock(hashtext('panelpoint:start'))").catch(() => {});
    }
  } finally {
    await manager.releaseConnection(client);
  }
}

/** Lock files a start in this process holds now (two servers in one process, as tests make, take turns too). */
const heldHere = new Set<string>();

function running(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

async function withLockFile<T>(file: string, work: () => Promise<T>, waitMs: number): Promise<T> {
  const until = Date.now() + waitMs;
  for (;;) {
    try {
      fs.writeFileSync(file, String(process.pid), { flag: 'wx', mode: 0o600 });
      break;
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
    }
    let owner: number;
    try {
      owner = Number.parseInt(fs.readFileSync(file, 'utf8') || '0', 10);
    } catch (err) {
      // Released between our try and this read: try again at once.
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') continue;
      throw err;
    }
    // An empty file is one being written this instant: wait for it like a held lock.
    // Our own pid in a file no start of this process holds: left by an earlier process that had
    // the same pid (a container restarted after kill -9 often gives the server the same one).
    const stale = owner === process.pid ? !heldHere.has(file) : owner > 0 && !running(owner);
    if (stale) {
      fs.rmSync(file, { force: true });
      continue;
    }
    if (Date.now() > until) {
      throw new Error(`Another Panelpoint process (pid ${owner || 'unknown'}) has been starting on ${file.replace(/\.start-lock$/, '')} for ${Math.round(waitMs / 1000)} s; if none is running, remove ${file} and start again.`);
    }
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  heldHere.add(file);
  try {
    return await work();
  } finally {
    heldHere.delete(file);
    fs.rmSync(file, { force: true });
  }
}
