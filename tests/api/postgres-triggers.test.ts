import { spawnSync } from 'node:child_process';
import crypto from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { postgresStatements } from '../../server/db/migrations/0007-signing-keys-and-record-guards';

/**
 * The PostgreSQL text of migration 0007's guards, run on a real PostgreSQL server through psql,
 * statement by statement and apart from Sequelize (the whole API suite also runs on PostgreSQL
 * through Sequelize, see vitest.config.ts). Runs only when PANELPOINT_TEST_PGHOST names a server
 * (a host or a socket folder; PANELPOINT_TEST_PGPORT and PANELPOINT_TEST_PGUSER, else PGPORT and
 * PGUSER as psql reads them); each run works in a schema of its own and drops it afterwards.
 * The tables are the columns of migrations 0003 and 0004 that the triggers read.
 */

const host = process.env.PANELPOINT_TEST_PGHOST;
const schema = `pp_test_${crypto.randomBytes(4).toString('hex')}`;

function psql(sql: string): { ok: boolean; out: string } {
  const r = spawnSync('psql', ['-X', '-q', '-v', 'ON_ERROR_STOP=1', '-h', host!, '-d', process.env.PGDATABASE ?? 'postgres', '-c', sql], {
    env: {
      ...process.env,
      ...(process.env.PANELPOINT_TEST_PGPORT ? { PGPORT: process.env.PANELPOINT_TEST_PGPORT } : {}),
      ...(process.env.PANELPOINT_TEST_PGUSER ? { PGUSER: process.env.PANELPOINT_TEST_PGUSER } : {}),
      ...(process.env.PANELPOINT_TEST_PGPASSWORD ? { PGPASSWORD: process.env.PANELPOINT_TEST_PGPASSWORD } : {}),
      PGOPTIONS: `-c search_path=${schema}`,
    },
    encoding: 'utf8',
  });
  return { ok: r.status === 0, out: `${r.stdout}${r.stderr}` };
}
const must = (sql: string) => {
  const r = psql(sql);
  if (!r.ok) throw new Error(`${sql}\n${r.out}`);
  return r.out;
};
/** psql's error text for a refused statement, or 'not refused'. */
const refusal = (sql: string) => {
  const r = psql(sql);
  return r.ok ? 'not refused' : r.out;
};

const TABLES = `
CREATE TABLE analysis_runs (id serial PRIMARY KEY, "trussId" int NOT NULL, status varchar(16) NOT NULL, summary text);
CREATE TABLE sheet_revisions (
  id serial PRIMARY KEY, "trussId" int NOT NULL, "runId" int NOT NULL, number int NOT NULL, status varchar(16) NOT NULL,
  "preparedById" int NOT NULL, "checkedById" int, "issuedById" int, "preparedByName" varchar(120), "checkedByName" varchar(120),
  "issuedByName" varchar(120), "submittedAt" timestamptz, "checkedAt" timestamptz, "issuedAt" timestamptz, "supersededAt" timestamptz,
  "supersededById" int, "pdfStoredName" varchar(80), "pdfSize" int, sha256 varchar(64), "signedRecord" text, signature varchar(128),
  "keyFingerprint" varchar(64), "lastActorId" int, "lastNote" text, "createdAt" timestamptz NOT NULL, "updatedAt" timestamptz NOT NULL,
  UNIQUE ("trussId", number));
CREATE TABLE sheet_revision_events (id serial PRIMARY KEY, "revisionId" int NOT NULL, "fromStatus" varchar(16), "toStatus" varchar(16) NOT NULL,
  "actorId" int, note text NOT NULL DEFAULT '', at timestamptz NOT NULL, "prevHash" varchar(64), hash varchar(64));
CREATE TABLE sheet_comments (id serial PRIMARY KEY, "revisionId" int NOT NULL, "trussId" int NOT NULL, body text NOT NULL, "resolvedAt" timestamptz,
  "createdAt" timestamptz NOT NULL, "updatedAt" timestamptz NOT NULL);
CREATE TABLE signing_keys ("keyId" varchar(16) PRIMARY KEY, fingerprint varchar(64) NOT NULL UNIQUE, algorithm varchar(16) NOT NULL,
  "publicKeyPem" text NOT NULL, "createdAt" timestamptz NOT NULL, "retiredAt" timestamptz);`;

/** The check flow's moves as the service makes them: draft → … → checked, then issued with its record. */
function issueRevision(trussId: number, number: number, runId: number): number {
  const id = Number(
    must(`INSERT INTO sheet_revisions ("trussId","runId",number,status,"preparedById","lastActorId","createdAt","updatedAt")
          VALUES (${trussId},${runId},${number},'draft',1,1,now(),now()) RETURNING id`).match(/\d+/)![0],
  );
  must(`UPDATE sheet_revisions SET status = 'checked', "checkedById" = 2, "updatedAt" = now() WHERE id = ${id}`);
  must(`INSERT INTO sheet_comments ("revisionId","trussId",body,"createdAt","updatedAt") VALUES (${id},${trussId},'checked note',now(),now())`);
  must(`UPDATE sheet_revisions SET status = 'issued', "issuedAt" = now(), sha256 = '${'a'.repeat(64)}', signature = 'sig', "signedRecord" = '{}',
        "keyFingerprint" = '${'b'.repeat(64)}', "updatedAt" = now() WHERE id = ${id}`);
  return id;
}

describe.skipIf(!host)('migration 0007 guards on PostgreSQL (psql, when PANELPOINT_TEST_PGHOST is set)', () => {
  let runA: number;
  let a: number;
  let b: number;
  let other: number;

  beforeAll(() => {
    must(`CREATE SCHEMA ${schema}`);
    must(TABLES);
    for (const sql of postgresStatements()) must(sql);
    runA = Number(must(`INSERT INTO analysis_runs ("trussId", status) VALUES (1, 'solved') RETURNING id`).match(/\d+/)![0]);
  });
  afterAll(() => {
    if (host) psql(`DROP SCHEMA ${schema} CASCADE`);
  });

  it('when a later revision of the same truss is issued, then the earlier one is superseded and every move is logged', () => {
    a = issueRevision(1, 1, runA);
    b = issueRevision(1, 2, runA + 0);
    other = issueRevision(2, 1, runA);
    const rows = must(`SELECT id || ':' || status || ':' || COALESCE("supersededById"::text, '-') FROM sheet_revisions ORDER BY id`);
    expect(rows).toContain(`${a}:superseded:${b}`);
    expect(rows).toContain(`${b}:issued:-`);
    const log = must(`SELECT string_agg(COALESCE("fromStatus", 'new') || '>' || "toStatus", ',' ORDER BY id) FROM sheet_revision_events WHERE "revisionId" = ${a}`);
    expect(log).toContain('new>draft,draft>checked,checked>issued,issued>superseded');
  });

  it('when an issued row is changed, superseded by another truss, deleted or inserted ready-made, then PostgreSQL refuses it', () => {
    expect(refusal(`UPDATE sheet_revisions SET "checkedByName" = 'x' WHERE id = ${b}`)).toMatch(/issued sheet revision cannot be changed/);
    expect(refusal(`UPDATE sheet_revisions SET status = 'superseded', "supersededById" = ${other}, "supersededAt" = now() WHERE id = ${b}`)).toMatch(
      /superseded only by a later issued revision of the same truss/,
    );
    expect(refusal(`DELETE FROM sheet_revisions WHERE id = ${a}`)).toMatch(/cannot be changed or deleted/);
    expect(refusal(`INSERT INTO sheet_revisions ("trussId","runId",number,status,"preparedById","createdAt","updatedAt") VALUES (1,1,9,'issued',1,now(),now())`)).toMatch(
      /inserted as a draft/,
    );
  });

  it('when a comment or the run of an issued revision is changed, then PostgreSQL refuses it', () => {
    expect(refusal(`UPDATE sheet_comments SET body = 'rewritten' WHERE "revisionId" = ${b}`)).toMatch(/comments of an issued sheet revision/);
    expect(refusal(`DELETE FROM sheet_comments WHERE "revisionId" = ${a}`)).toMatch(/comments of an issued/);
    expect(refusal(`INSERT INTO sheet_comments ("revisionId","trussId",body,"createdAt","updatedAt") VALUES (${b},1,'late',now(),now())`)).toMatch(/comments of an issued/);
    expect(refusal(`UPDATE analysis_runs SET summary = 'forged' WHERE id = ${runA}`)).toMatch(/analysis run behind an issued sheet/);
    const loose = Number(must(`INSERT INTO analysis_runs ("trussId", status) VALUES (1, 'solved') RETURNING id`).match(/\d+/)![0]);
    expect(refusal(`UPDATE analysis_runs SET summary = 'edited' WHERE id = ${loose}`)).toBe('not refused');
  });

  it('when an audit line is sealed once, then that is allowed; any other change or a delete is refused; keys are kept', () => {
    const line = must(`SELECT min(id) FROM sheet_revision_events`).match(/\d+/)![0];
    expect(refusal(`UPDATE sheet_revision_events SET "prevHash" = '${'0'.repeat(64)}', hash = '${'1'.repeat(64)}' WHERE id = ${line}`)).toBe('not refused');
    expect(refusal(`UPDATE sheet_revision_events SET hash = '${'2'.repeat(64)}' WHERE id = ${line}`)).toMatch(/append-only/);
    expect(refusal(`UPDATE sheet_revision_events SET note = 'x' WHERE hash IS NULL`)).toMatch(/append-only/);
    expect(refusal(`DELETE FROM sheet_revision_events WHERE id = ${line}`)).toMatch(/append-only/);
    must(`INSERT INTO signing_keys VALUES ('k1', '${'c'.repeat(64)}', 'Ed25519', 'pem', now(), NULL)`);
    expect(refusal(`UPDATE signing_keys SET "retiredAt" = now() WHERE "keyId" = 'k1'`)).toBe('not refused');
    expect(refusal(`UPDATE signing_keys SET "retiredAt" = NULL WHERE "keyId" = 'k1'`)).toMatch(/kept forever/);
    expect(refusal(`DELETE FROM signing_keys WHERE "keyId" = 'k1'`)).toMatch(/kept forever/);
  });
});
