import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes, type Sequelize } from 'sequelize';
import { openDatabase } from '../../server/db/sequelize';
import { migrate, MIGRATION_NAMES } from '../../server/db/migrate';
import { pgTestDatabaseCreate, pgTestsOn } from '../support/pg';
import { tempDataDir } from '../support/test-services';

/**
 * Migration 0017 (the chosen checker, sheet_revisions.checkerId) on a database that already
 * holds revisions in every state: built as the release before 0017 left it, rows written with
 * that release's columns, then migrated to the end. On a real SQLite file, and on PostgreSQL in
 * the postgres project. Expected: every old row has no checker and is otherwise unchanged, the
 * migration wrote no audit line, the issued revision is still frozen (its new column too), and
 * a revision still moving can be given a checker.
 */

const BEFORE_0017 = MIGRATION_NAMES[MIGRATION_NAMES.indexOf('0017-sheet-checker') - 1]!;
const FROZEN = 'panelpoint: an issued sheet revision cannot be changed or deleted';

let sequelize: Sequelize;
let folder: string | undefined;
let reviewer = 0;
const revisions: Record<'draft' | 'inCheck' | 'returned' | 'issued', number> = { draft: 0, inCheck: 0, returned: 0, issued: 0 };
let before: Record<string, unknown>[] = [];
let eventsBefore = 0;

async function insert(table: string, row: Record<string, unknown>): Promise<number> {
  const cols = Object.keys(row);
  await sequelize.query(`INSERT INTO ${table} (${cols.map((c) => `"${c}"`).join(', ')}) VALUES (${cols.map((c) => `:${c}`).join(', ')})`, { replacements: row });
  // This test is the database's only writer, so the new row is the largest id.
  const rows = await sequelize.query<{ id: number }>(`SELECT MAX(id) AS id FROM ${table}`, { type: QueryTypes.SELECT });
  return Number(rows[0]!.id);
}

async function refusal(sql: string, replacements: Record<string, unknown>): Promise<string> {
  try {
    await sequelize.query(sql, { replacements });
  } catch (err) {
    const e = err as { parent?: { message?: string }; message: string };
    return e.parent?.message ?? e.message;
  }
  return 'no refusal';
}

const allRevisions = () => sequelize.query<Record<string, unknown>>('SELECT * FROM sheet_revisions ORDER BY id', { type: QueryTypes.SELECT });
const eventCount = async () => Number((await sequelize.query<{ n: number | string }>('SELECT COUNT(*) AS n FROM sheet_revision_events', { type: QueryTypes.SELECT }))[0]!.n);

beforeAll(async () => {
  if (pgTestsOn()) {
    sequelize = await openDatabase(await pgTestDatabaseCreate());
  } else {
    const { dataDir, databaseStorage } = tempDataDir();
    folder = dataDir;
    sequelize = await openDatabase(databaseStorage);
  }
  await migrate(sequelize, { to: BEFORE_0017 });

  const now = new Date('2026-06-11T10:00:00Z');
  const engineer = await insert('users', { email: 'e@checker-migration.test', name: 'Wen Adeyemi', role: 'engineer', disabled: false, createdAt: now, updatedAt: now });
  reviewer = await insert('users', { email: 'r@checker-migration.test', name: 'Jonas Pell', role: 'reviewer', disabled: false, createdAt: now, updatedAt: now });
  const project = await insert('projects', { name: 'Orchard packhouse', jobNumber: 'OP-7', createdAt: now, updatedAt: now });
  const truss = await insert('trusses', { projectId: project, name: 'T1', createdAt: now, updatedAt: now });
  const run = await insert('analysis_runs', { trussId: truss, number: 1, modelVersion: 1, status: 'done', progress: '{}', model: '{}', ranById: engineer, createdAt: now, updatedAt: now });
  const draft = (number: number) =>
    insert('sheet_revisions', { trussId: truss, runId: run, number, status: 'draft', preparedById: engineer, lastActorId: engineer, createdAt: now, updatedAt: now });
  const move = (id: number, sql: string) => sequelize.query(`UPDATE sheet_revisions SET ${sql}, "updatedAt" = :now WHERE id = :id`, { replacements: { id, now, reviewer, engineer } });

  // Inserted as drafts (0007 refuses any other insert), then moved by updates as the check flow did before 0017.
  revisions.returned = await draft(1);
  await move(revisions.returned, `status = 'in-check', "submittedAt" = :now`);
  await move(revisions.returned, `status = 'returned', "lastActorId" = :reviewer`);
  revisions.issued = await draft(2);
  await move(revisions.issued, `status = 'in-check', "submittedAt" = :now`);
  await move(revisions.issued, `status = 'checked', "checkedById" = :reviewer, "checkedByName" = 'Jonas Pell', "checkedAt" = :now`);
  await move(revisions.issued, `status = 'issued', "issuedById" = :engineer, "issuedByName" = 'Wen Adeyemi', "issuedAt" = :now, sha256 = 'ab12', signature = 'sig', "signedRecord" = '{}'`);
  revisions.inCheck = await draft(3);
  await move(revisions.inCheck, `status = 'in-check', "submittedAt" = :now`);
  revisions.draft = await draft(4);

  before = await allRevisions();
  eventsBefore = await eventCount();
  await migrate(sequelize);
});

afterAll(async () => {
  await sequelize?.close();
  if (folder) fs.rmSync(folder, { recursive: true, force: true });
});

describe(`migration 0017 on a database holding revisions (${pgTestsOn() ? 'PostgreSQL' : 'SQLite file'})`, () => {
  it('gives every old revision no checker and leaves its other columns as they were, writing no audit line', async () => {
    const after = await allRevisions();
    expect(after).toHaveLength(4);
    expect(after.map((r) => r.checkerId)).toEqual([null, null, null, null]);
    expect(after.map(({ checkerId: _c, ...rest }) => rest)).toEqual(before);
    expect(await eventCount()).toBe(eventsBefore);
  });

  it('keeps the issued revision frozen, its new column too', async () => {
    expect(await refusal('UPDATE sheet_revisions SET "checkerId" = :reviewer WHERE id = :id', { reviewer, id: revisions.issued })).toContain(FROZEN);
    const issued = (await allRevisions()).find((r) => Number(r.id) === revisions.issued)!;
    expect(issued.checkerId).toBeNull();
    expect(issued.status).toBe('issued');
  });

  it('lets a revision still in check be given a checker, and the column refuses a person who does not exist', async () => {
    await sequelize.query('UPDATE sheet_revisions SET "checkerId" = :reviewer WHERE id = :id', { replacements: { reviewer, id: revisions.inCheck } });
    const inCheck = (await allRevisions()).find((r) => Number(r.id) === revisions.inCheck)!;
    expect(Number(inCheck.checkerId)).toBe(reviewer);
    if (sequelize.getDialect() === 'postgres') {
      // SQLite checks foreign keys only with PRAGMA foreign_keys on; PostgreSQL always does.
      expect(await refusal('UPDATE sheet_revisions SET "checkerId" = 999999 WHERE id = :id', { id: revisions.draft })).toMatch(/foreign key/);
    }
  });
});
