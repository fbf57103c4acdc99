import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes, type Sequelize } from 'sequelize';
import { openDatabase } from '../../server/db/sequelize';
import { migrate, MIGRATION_NAMES } from '../../server/db/migrate';
import { pgTestDatabaseCreate, pgTestsOn } from '../support/pg';
import { tempDataDir } from '../support/test-services';

/**
 * Migration 0014 on a database that already holds runs: built as the release before 0014 left
 * it (every migration up to the one before 0014, then rows written with that release's columns),
 * then migrated to the end. On a real SQLite file, and on PostgreSQL in the postgres project.
 *
 * The rows: truss A with runs a1, a2, a3 and truss B with runs b1, b2, interleaved by id
 * (a1 b1 a2 b2 a3); a2 is the run behind an issued sheet revision of A, so 0007's guard freezes
 * it. Expected: each truss counts its runs 1, 2, … in id order (the rule 0014 states); the
 * frozen run got its number, and afterwards the guard refuses a change to it again.
 */

const BEFORE_0014 = MIGRATION_NAMES[MIGRATION_NAMES.indexOf('0014-run-numbers') - 1]!;
const RUN_GUARD = 'panelpoint: the analysis run behind an issued sheet revision cannot be changed or deleted';

let sequelize: Sequelize;
let folder: string | undefined;
const ids: Record<'a1' | 'a2' | 'a3' | 'b1' | 'b2', number> = { a1: 0, a2: 0, a3: 0, b1: 0, b2: 0 };
let trussA = 0;
let trussB = 0;

async function insert(table: string, row: Record<string, unknown>): Promise<number> {
  const cols = Object.keys(row);
  await sequelize.query(`INSERT INTO ${table} (${cols.map((c) => `"${c}"`).join(', ')}) VALUES (${cols.map((c) => `:${c}`).join(', ')})`, { replacements: row });
  // This test is the database's only writer, so the new row is the largest id.
  const rows = await sequelize.query<{ id: number }>(`SELECT MAX(id) AS id FROM ${table}`, { type: QueryTypes.SELECT });
  return Number(rows[0]!.id);
}

/** The database's refusal of a statement (Sequelize wraps SQLite's RAISE as "Validation error"; the text is in `parent`). */
async function refusal(sql: string, replacements: Record<string, unknown>): Promise<string> {
  try {
    await sequelize.query(sql, { replacements });
  } catch (err) {
    const e = err as { parent?: { message?: string }; message: string };
    return e.parent?.message ?? e.message;
  }
  return 'no refusal';
}

async function runsByTruss(): Promise<{ id: number; trussId: number; number: number | null }[]> {
  const [rows] = (await sequelize.query('SELECT id, "trussId", number FROM analysis_runs ORDER BY id')) as [{ id: number; trussId: number; number: number | null }[], unknown];
  return rows.map((r) => ({ id: Number(r.id), trussId: Number(r.trussId), number: r.number === null ? null : Number(r.number) }));
}

beforeAll(async () => {
  if (pgTestsOn()) {
    sequelize = await openDatabase(await pgTestDatabaseCreate());
  } else {
    const { dataDir, databaseStorage } = tempDataDir();
    folder = dataDir;
    sequelize = await openDatabase(databaseStorage);
  }
  await migrate(sequelize, { to: BEFORE_0014 });

  const now = new Date('2026-03-02T09:00:00Z');
  const user = await insert('users', { email: 'e@backfill.test', name: 'E. Ngineer', role: 'engineer', disabled: false, createdAt: now, updatedAt: now });
  const project = await insert('projects', { name: 'Backfill depot', jobNumber: 'BF-1', createdAt: now, updatedAt: now });
  trussA = await insert('trusses', { projectId: project, name: 'T1', createdAt: now, updatedAt: now });
  trussB = await insert('trusses', { projectId: project, name: 'T2', createdAt: now, updatedAt: now });
  const run = (trussId: number) =>
    insert('analysis_runs', { trussId, modelVersion: 1, status: 'done', progress: '{}', model: '{}', ranById: user, createdAt: now, updatedAt: now });
  ids.a1 = await run(trussA);
  ids.b1 = await run(trussB);
  ids.a2 = await run(trussA);
  ids.b2 = await run(trussB);
  ids.a3 = await run(trussA);

  // Inserted as a draft (0007 refuses any other insert), then issued by an update, as the check flow does.
  const revision = await insert('sheet_revisions', { trussId: trussA, runId: ids.a2, number: 1, status: 'draft', preparedById: user, lastActorId: user, createdAt: now, updatedAt: now });
  await sequelize.query(
    `UPDATE sheet_revisions SET status = 'issued', "issuedById" = :user, "issuedAt" = :now, "issuedByName" = 'E. Ngineer', "updatedAt" = :now WHERE id = :revision`,
    { replacements: { user, now, revision } },
  );
  // The guard of 0007 holds before 0014: the issued revision's run cannot be changed.
  expect(await refusal(`UPDATE analysis_runs SET status = 'failed' WHERE id = :id`, { id: ids.a2 })).toContain(RUN_GUARD);

  await migrate(sequelize);
});

afterAll(async () => {
  await sequelize?.close();
  if (folder) fs.rmSync(folder, { recursive: true, force: true });
});

describe(`migration 0014 on a database holding runs (${pgTestsOn() ? 'PostgreSQL' : 'SQLite file'})`, () => {
  it('numbers each truss’s runs 1, 2, … in id order, the frozen run too', async () => {
    const rows = await runsByTruss();
    const numberOf = Object.fromEntries(rows.map((r) => [r.id, r.number]));
    expect([numberOf[ids.a1], numberOf[ids.a2], numberOf[ids.a3]]).toEqual([1, 2, 3]);
    expect([numberOf[ids.b1], numberOf[ids.b2]]).toEqual([1, 2]);
    expect(rows.every((r) => r.number !== null)).toBe(true);
  });

  it('puts the frozen-run guard back: a change to or delete of the issued revision’s run is refused, nothing changes', async () => {
    expect(await refusal(`UPDATE analysis_runs SET number = 9 WHERE id = :id`, { id: ids.a2 })).toContain(RUN_GUARD);
    expect(await refusal(`UPDATE analysis_runs SET status = 'failed' WHERE id = :id`, { id: ids.a2 })).toContain(RUN_GUARD);
    expect(await refusal(`DELETE FROM analysis_runs WHERE id = :id`, { id: ids.a2 })).toContain(RUN_GUARD);
    const a2 = (await runsByTruss()).find((r) => r.id === ids.a2);
    expect(a2).toEqual({ id: ids.a2, trussId: trussA, number: 2 });
  });

  it('leaves runs behind no issued revision changeable, and the unique (truss, number) index refuses a second run 1', async () => {
    await sequelize.query(`UPDATE analysis_runs SET status = 'failed' WHERE id = :id`, { replacements: { id: ids.b2 } });
    const [rows] = (await sequelize.query('SELECT status FROM analysis_runs WHERE id = :id', { replacements: { id: ids.b2 } })) as [{ status: string }[], unknown];
    expect(rows[0]!.status).toBe('failed');
    const now = new Date();
    await expect(
      insert('analysis_runs', { trussId: trussB, number: 1, modelVersion: 1, status: 'queued', progress: '{}', model: '{}', createdAt: now, updatedAt: now }),
    ).rejects.toMatchObject({ name: 'SequelizeUniqueConstraintError' });
  });
});
