import fs from 'node:fs';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { readRows } from '../../server/db/read-rows';
import { startTestServices } from '../support/test-services';

// readRows goes past Sequelize to the SQLite driver (on PostgreSQL it is sequelize.query). The
// check is Sequelize itself: for the same SQL and replacements both give the same rows, on a
// real database file (SQLite) and on PostgreSQL (the postgres project).
let services: Services;
beforeAll(async () => {
  services = await startTestServices({}, { realFile: true });
});
afterAll(async () => {
  await services.shutdown();
  if (services.config.dataDir) fs.rmSync(services.config.dataDir, { recursive: true, force: true });
});

const viaSequelize = (sql: string, replacements: Record<string, unknown>) => services.sequelize.query(sql, { type: QueryTypes.SELECT, replacements, raw: true });

describe('readRows', () => {
  it('when given a number, a text, a boolean and a list, then it returns the rows sequelize.query returns', async () => {
    const cases: [string, Record<string, unknown>][] = [
      ['SELECT "id", "email", "role", "disabled", "createdAt" FROM "users" WHERE "id" = :id', { id: 1 }],
      ['SELECT "id", "role" FROM "users" WHERE "email" = :email', { email: 'engineer@demo.panelpoint.test' }],
      ['SELECT "id" FROM "users" WHERE "disabled" = :no ORDER BY "id"', { no: false }],
      ['SELECT "id", "role" FROM "users" WHERE "role" IN (:roles) ORDER BY "id"', { roles: ['engineer', 'admin'] }],
      ['SELECT COUNT(*) AS "n" FROM "users" WHERE "id" > :a AND "id" < :b', { a: 0, b: 1000 }],
    ];
    let rowsSeen = 0;
    for (const [sql, replacements] of cases) {
      const expected = await viaSequelize(sql, replacements);
      expect(await readRows(services.sequelize, sql, replacements), sql).toEqual(expected);
      rowsSeen += expected.length;
    }
    // The demo firm has its four users, so the comparisons were of real rows, not empty lists.
    expect(rowsSeen).toBeGreaterThan(8);
  });

  it('when a list is empty, a value cannot be bound (an object) or a name has no value, then it reads nothing or throws (SQLite)', async () => {
    if (services.sequelize.getDialect() !== 'sqlite') return; // PostgreSQL: sequelize.query's own handling
    // An empty list is IN (NULL), as Sequelize writes it on SQLite (on PostgreSQL Sequelize writes
    // IN (), a syntax error, so callers return early on an empty list).
    const empty = 'SELECT "id" FROM "users" WHERE "role" IN (:roles)';
    expect(await readRows(services.sequelize, empty, { roles: [] })).toEqual(await viaSequelize(empty, { roles: [] }));
    await expect(readRows(services.sequelize, 'SELECT "id" FROM "users" WHERE "id" = :id', {})).rejects.toThrow(/no value for :id/);
    await expect(readRows(services.sequelize, 'SELECT "id" FROM "users" WHERE "id" = :id', { id: { a: 1 } })).rejects.toThrow(/not supported/);
  });

  it('when a text holds quotes and a colon word, then it is bound as a value, never read as SQL', async () => {
    const sql = 'SELECT "id" FROM "users" WHERE "email" = :email';
    const hostile = "x' OR '1'='1 :id";
    expect(await readRows(services.sequelize, sql, { email: hostile })).toEqual([]);
    expect(await viaSequelize(sql, { email: hostile })).toEqual([]);
  });
});
