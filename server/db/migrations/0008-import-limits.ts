import type { QueryInterface } from 'sequelize';

/**
 * The firm's caps on reading a drawing (one row, id 1; no row means the defaults): most
 * exploded line segments, deepest block nesting and the time limit. Bounds are checked by the
 * API's schema and again here, so a hand-written UPDATE cannot switch a cap off.
 */
export async function up({ context: qi }: { context: QueryInterface }) {
  if (qi.sequelize.getDialect() === 'postgres') {
    // The same table for PostgreSQL: its unquoted names fold to lower case, so the camel-case
    // columns the model reads are quoted, and it has TIMESTAMPTZ where SQLite has DATETIME.
    await qi.sequelize.query(`CREATE TABLE import_limits (
    id INTEGER PRIMARY KEY CHECK (id = 1),
    "maxSegments" INTEGER NOT NULL CHECK ("maxSegments" BETWEEN 1000 AND 2000000),
    "maxBlockDepth" INTEGER NOT NULL CHECK ("maxBlockDepth" BETWEEN 1 AND 200),
    "timeLimitSeconds" INTEGER NOT NULL CHECK ("timeLimitSeconds" BETWEEN 1 AND 300),
    "updatedById" INTEGER REFERENCES users (id) ON DELETE SET NULL,
    "createdAt" TIMESTAMPTZ NOT NULL,
    "updatedAt" TIMESTAMPTZ NOT NULL
  )`);
    return;
  }
  await qi.sequelize.query(`CREATE TABLE import_limits (
    id INTEGER PRIMARY KEY CHECK (id = 1),
    maxSegments INTEGER NOT NULL CHECK (maxSegments BETWEEN 1000 AND 2000000),
    maxBlockDepth INTEGER NOT NULL CHECK (maxBlockDepth BETWEEN 1 AND 200),
    timeLimitSeconds INTEGER NOT NULL CHECK (timeLimitSeconds BETWEEN 1 AND 300),
    updatedById INTEGER REFERENCES users (id) ON DELETE SET NULL,
    createdAt DATETIME NOT NULL,
    updatedAt DATETIME NOT NULL
  )`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('import_limits');
}

