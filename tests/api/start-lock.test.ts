import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { QueryTypes, type Sequelize } from 'sequelize';
import { afterAll, describe, expect, it } from 'vitest';
import { openDatabase } from '../../server/db/sequelize';
import { MIGRATION_NAMES, migrate } from '../../server/db/migrate';
import { withStartLock } from '../../server/db/start-lock';
import { pgTestDatabaseCreate, pgTestsOn } from '../support/pg';

/**
 * Two server processes started at the same moment on one empty database both run the
 * migrations at start. Without the start lock, on PostgreSQL the second fails on the first
 * migration ("Validation error": the migrations table row the first has just written); tried
 * by hand with two connections, see db/start-lock.ts. Here: two separate connection pools (as
 * two processes hold) migrating at once under the lock both succeed, and every migration ran
 * once. On the SQLite project the same on a real file (without the lock file the second fails
 * there too: "index trusses_project_id already exists").
 */
const opened: Sequelize[] = [];
const dirs: string[] = [];
afterAll(async () => {
  for (const s of opened) await s.close();
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

async function target(): Promise<string> {
  if (pgTestsOn()) return pgTestDatabaseCreate();
  const d = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-start-lock-'));
  dirs.push(d);
  return path.join(d, 'panelpoint.sqlite');
}

describe('the start lock', () => {
  it('when two processes migrate one empty database at the same moment, then both succeed and each migration runs once', async () => {
    const where = await target();
    const a = await openDatabase(where);
    const b = await openDatabase(where);
    opened.push(a, b);
    const order: string[] = [];
    await Promise.all(
      [a, b].map((s, i) =>
        withStartLock(s, async () => {
          order.push(`start ${i}`);
          await migrate(s);
          order.push(`end ${i}`);
        }),
      ),
    );
    const rows = await a.query<{ name: string }>('SELECT "name" FROM "SequelizeMeta" ORDER BY "name"', { type: QueryTypes.SELECT });
    expect(rows.map((r) => r.name)).toEqual([...MIGRATION_NAMES].sort());
    // One after the other, never interleaved: start i, end i, start j, end j.
    expect(order.map((o) => o.split(' ')[0])).toEqual(['start', 'end', 'start', 'end']);
    expect(order[0].split(' ')[1]).toBe(order[1].split(' ')[1]);
  }, 120_000);
});

describe('the start lock file of a SQLite database', () => {
  it.skipIf(pgTestsOn())('when the lock file names a process that no longer runs, then a start takes it over instead of waiting', async () => {
    const where = await target();
    const s = await openDatabase(where);
    opened.push(s);
    // A process id far above any pid_max: no such process.
    fs.writeFileSync(`${where}.start-lock`, '999999999');
    let ran = false;
    await withStartLock(s, async () => {
      ran = true;
    }, { waitMs: 2000 });
    expect(ran).toBe(true);
    expect(fs.existsSync(`${where}.start-lock`)).toBe(false);
    // One holding this very process's id was left by an earlier process that had the same id.
    fs.writeFileSync(`${where}.start-lock`, String(process.pid));
    ran = false;
    await withStartLock(s, async () => {
      ran = true;
    }, { waitMs: 2000 });
    expect(ran).toBe(true);
  });

  it.skipIf(pgTestsOn())('when a running process holds it past the wait, then the start stops with one sentence naming the file to remove', async () => {
    const where = await target();
    const s = await openDatabase(where);
    opened.push(s);
    // A running process other than this one: the test runner's parent.
    fs.writeFileSync(`${where}.start-lock`, String(process.ppid));
    await expect(withStartLock(s, async () => {}, { waitMs: 300 })).rejects.toThrow(
      `Another Panelpoint process (pid ${process.ppid}) has been starting on ${where} for 0 s; if none is running, remove ${where}.start-lock and start again.`,
    );
    fs.rmSync(`${where}.start-lock`);
  });
});
