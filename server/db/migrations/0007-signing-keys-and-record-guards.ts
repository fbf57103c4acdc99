import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Signing keys and the remaining guards on what is issued.
 *
 *  - `signing_keys`: every public key the firm has signed records with, by key id (the first 16
 *    hex digits of the SHA-256 of the SPKI DER), with the dates it became current and was
 *    retired. Rows are never deleted; the only change is setting `retiredAt` once.
 *  - `sheet_revision_events` gains `prevHash` and `hash`: the audit log becomes a hash chain,
 *    computed by the records service when it writes the line. The one update the log allows is
 *    filling in the hash of a line that has none, leaving every other column as it was.
 *  - An issued revision may become superseded only by a later issued revision of the same truss
 *    (0004 already allows no other change to an issued row).
 *  - A revision row is inserted as a draft only, so no one can insert a ready-made issued row.
 *  - The comments of an issued or superseded revision, and the analysis run behind it, can be
 *    neither changed nor deleted, and no comment is added to such a revision.
 *
 * SQLite and PostgreSQL each get their own trigger text; the rules and messages are the same.
 */

const MSG = {
  supersede: 'panelpoint: an issued sheet revision can be superseded only by a later issued revision of the same truss',
  insert: 'panelpoint: a sheet revision is inserted as a draft; it is issued only through the check flow',
  comment: 'panelpoint: the comments of an issued sheet revision cannot be added, changed or deleted',
  run: 'panelpoint: the analysis run behind an issued sheet revision cannot be changed or deleted',
  log: 'panelpoint: the sheet audit log is append-only',
  keys: 'panelpoint: a signing key is kept forever; only its retirement date is set, once',
};

const FROZEN = `('issued', 'superseded')`;

const SQLITE_TRIGGERS = [
  `CREATE TRIGGER sheet_revisions_supersede_only_by_later BEFORE UPDATE ON sheet_revisions
   WHEN OLD.status = 'issued' AND NEW.status = 'superseded' AND (NEW.supersededAt IS NULL OR NOT EXISTS (
     SELECT 1 FROM sheet_revisions s
      WHERE s.id = NEW.supersededById AND s.trussId = OLD.trussId AND s.status = 'issued' AND s.number > OLD.number
   ))
   BEGIN
     SELECT RAISE(ABORT, '${MSG.supersede}');
   END`,
  `CREATE TRIGGER sheet_revisions_insert_draft BEFORE INSERT ON sheet_revisions
   WHEN NEW.status IS NOT 'draft' OR NEW.signature IS NOT NULL OR NEW.signedRecord IS NOT NULL OR NEW.sha256 IS NOT NULL
   BEGIN
     SELECT RAISE(ABORT, '${MSG.insert}');
   END`,
  `CREATE TRIGGER sheet_comments_frozen_insert BEFORE INSERT ON sheet_comments
   WHEN EXISTS (SELECT 1 FROM sheet_revisions s WHERE s.id = NEW.revisionId AND s.status IN ${FROZEN})
   BEGIN
     SELECT RAISE(ABORT, '${MSG.comment}');
   END`,
  `CREATE TRIGGER sheet_comments_frozen_update BEFORE UPDATE ON sheet_comments
   WHEN EXISTS (SELECT 1 FROM sheet_revisions s WHERE s.id IN (OLD.revisionId, NEW.revisionId) AND s.status IN ${FROZEN})
   BEGIN
     SELECT RAISE(ABORT, '${MSG.comment}');
   END`,
  `CREATE TRIGGER sheet_comments_frozen_delete BEFORE DELETE ON sheet_comments
   WHEN EXISTS (SELECT 1 FROM sheet_revisions s WHERE s.id = OLD.revisionId AND s.status IN ${FROZEN})
   BEGIN
     SELECT RAISE(ABORT, '${MSG.comment}');
   END`,
  `CREATE TRIGGER analysis_runs_frozen_update BEFORE UPDATE ON analysis_runs
   WHEN EXISTS (SELECT 1 FROM sheet_revisions s WHERE s.runId = OLD.id AND s.status IN ${FROZEN})
   BEGIN
     SELECT RAISE(ABORT, '${MSG.run}');
   END`,
  `CREATE TRIGGER analysis_runs_frozen_delete BEFORE DELETE ON analysis_runs
   WHEN EXISTS (SELECT 1 FROM sheet_revisions s WHERE s.runId = OLD.id AND s.status IN ${FROZEN})
   BEGIN
     SELECT RAISE(ABORT, '${MSG.run}');
   END`,
  // Replaces 0004's trigger of the same name: the one update allowed is sealing an unsealed line.
  `CREATE TRIGGER sheet_revision_events_no_update BEFORE UPDATE ON sheet_revision_events
   WHEN NOT (
     OLD.hash IS NULL AND NEW.hash IS NOT NULL
     AND NEW.id IS OLD.id AND NEW.revisionId IS OLD.revisionId AND NEW.fromStatus IS OLD.fromStatus
     AND NEW.toStatus IS OLD.toStatus AND NEW.actorId IS OLD.actorId AND NEW.note IS OLD.note AND NEW.at IS OLD.at
   )
   BEGIN
     SELECT RAISE(ABORT, '${MSG.log}');
   END`,
  `CREATE TRIGGER signing_keys_no_delete BEFORE DELETE ON signing_keys
   BEGIN
     SELECT RAISE(ABORT, '${MSG.keys}');
   END`,
  `CREATE TRIGGER signing_keys_retire_only BEFORE UPDATE ON signing_keys
   WHEN NOT (
     OLD.retiredAt IS NULL AND NEW.retiredAt IS NOT NULL
     AND NEW.keyId IS OLD.keyId AND NEW.fingerprint IS OLD.fingerprint AND NEW.algorithm IS OLD.algorithm
     AND NEW.publicKeyPem IS OLD.publicKeyPem AND NEW.createdAt IS OLD.createdAt
   )
   BEGIN
     SELECT RAISE(ABORT, '${MSG.keys}');
   END`,
];

const SQLITE_DROPS = [
  'sheet_revisions_supersede_only_by_later',
  'sheet_revisions_insert_draft',
  'sheet_comments_frozen_insert',
  'sheet_comments_frozen_update',
  'sheet_comments_frozen_delete',
  'analysis_runs_frozen_update',
  'analysis_runs_frozen_delete',
  'signing_keys_no_delete',
  'signing_keys_retire_only',
];

/** 0004's frozen-row rule, written again for PostgreSQL (0004 itself is SQLite-only). */
const SIGNED_COLUMNS = [
  'id', 'trussId', 'runId', 'number', 'preparedById', 'checkedById', 'issuedById', 'preparedByName', 'checkedByName',
  'issuedByName', 'submittedAt', 'checkedAt', 'issuedAt', 'pdfStoredName', 'pdfSize', 'sha256', 'signedRecord', 'signature',
  'keyFingerprint', 'createdAt',
];
const q = (c: string) => `"${c}"`;

/** PostgreSQL: one PL/pgSQL function per rule, fired per row. */
const PG_FUNCTIONS: { name: string; table: string; timing: string; body: string }[] = [
  {
    name: 'pp_sheet_revisions_guard',
    table: 'sheet_revisions',
    timing: 'BEFORE INSERT OR UPDATE OR DELETE',
    body: `
    IF TG_OP = 'INSERT' THEN
      IF NEW.status <> 'draft' OR NEW.signature IS NOT NULL OR NEW."signedRecord" IS NOT NULL OR NEW.sha256 IS NOT NULL THEN
        RAISE EXCEPTION '${MSG.insert}';
      END IF;
      RETURN NEW;
    END IF;
    IF TG_OP = 'DELETE' THEN
      IF OLD.status IN ${FROZEN} THEN RAISE EXCEPTION 'panelpoint: an issued sheet revision cannot be changed or deleted'; END IF;
      RETURN OLD;
    END IF;
    IF OLD.status IN ${FROZEN} THEN
      IF NOT (OLD.status = 'issued' AND NEW.status = 'superseded'
              AND ${SIGNED_COLUMNS.map((c) => `NEW.${q(c)} IS NOT DISTINCT FROM OLD.${q(c)}`).join('\n              AND ')}) THEN
        RAISE EXCEPTION 'panelpoint: an issued sheet revision cannot be changed or deleted';
      END IF;
      IF NEW."supersededAt" IS NULL OR NOT EXISTS (
        SELECT 1 FROM sheet_revisions s
         WHERE s.id = NEW."supersededById" AND s."trussId" = OLD."trussId" AND s.status = 'issued' AND s.number > OLD.number) THEN
        RAISE EXCEPTION '${MSG.supersede}';
      END IF;
    END IF;
    RETURN NEW;`,
  },
  {
    name: 'pp_sheet_revisions_log',
    table: 'sheet_revisions',
    timing: 'AFTER INSERT OR UPDATE',
    body: `
    IF TG_OP = 'INSERT' THEN
      INSERT INTO sheet_revision_events ("revisionId", "fromStatus", "toStatus", "actorId", note, at)
      VALUES (NEW.id, NULL, NEW.status, NEW."lastActorId", COALESCE(NEW."lastNote", ''), NEW."createdAt");
    ELSIF OLD.status IS DISTINCT FROM NEW.status THEN
      INSERT INTO sheet_revision_events ("revisionId", "fromStatus", "toStatus", "actorId", note, at)
      VALUES (NEW.id, OLD.status, NEW.status, NEW."lastActorId", COALESCE(NEW."lastNote", ''), NEW."updatedAt");
      IF NEW.status = 'issued' THEN
        UPDATE sheet_revisions
           SET status = 'superseded', "supersededById" = NEW.id, "supersededAt" = NEW."issuedAt",
               "lastActorId" = NEW."lastActorId", "lastNote" = 'A later revision was issued.', "updatedAt" = NEW."updatedAt"
         WHERE "trussId" = NEW."trussId" AND status = 'issued' AND number < NEW.number;
      END IF;
    END IF;
    RETURN NULL;`,
  },
  {
    name: 'pp_sheet_revision_events_guard',
    table: 'sheet_revision_events',
    timing: 'BEFORE UPDATE OR DELETE',
    body: `
    IF TG_OP = 'DELETE' THEN RAISE EXCEPTION '${MSG.log}'; END IF;
    IF NOT (OLD.hash IS NULL AND NEW.hash IS NOT NULL
            AND ${['id', 'revisionId', 'fromStatus', 'toStatus', 'actorId', 'note', 'at'].map((c) => `NEW.${q(c)} IS NOT DISTINCT FROM OLD.${q(c)}`).join(' AND ')}) THEN
      RAISE EXCEPTION '${MSG.log}';
    END IF;
    RETURN NEW;`,
  },
  {
    name: 'pp_sheet_comments_guard',
    table: 'sheet_comments',
    timing: 'BEFORE INSERT OR UPDATE OR DELETE',
    body: `
    IF EXISTS (SELECT 1 FROM sheet_revisions s WHERE s.status IN ${FROZEN} AND (
         (TG_OP <> 'INSERT' AND s.id = OLD."revisionId") OR (TG_OP <> 'DELETE' AND s.id = NEW."revisionId"))) THEN
      RAISE EXCEPTION '${MSG.comment}';
    END IF;
    IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
    RETURN NEW;`,
  },
  {
    name: 'pp_analysis_runs_guard',
    table: 'analysis_runs',
    timing: 'BEFORE UPDATE OR DELETE',
    body: `
    IF EXISTS (SELECT 1 FROM sheet_revisions s WHERE s."runId" = OLD.id AND s.status IN ${FROZEN}) THEN
      RAISE EXCEPTION '${MSG.run}';
    END IF;
    IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
    RETURN NEW;`,
  },
  {
    name: 'pp_signing_keys_guard',
    table: 'signing_keys',
    timing: 'BEFORE UPDATE OR DELETE',
    body: `
    IF TG_OP = 'DELETE' OR NOT (OLD."retiredAt" IS NULL AND NEW."retiredAt" IS NOT NULL
        AND ${['keyId', 'fingerprint', 'algorithm', 'publicKeyPem', 'createdAt'].map((c) => `NEW.${q(c)} IS NOT DISTINCT FROM OLD.${q(c)}`).join(' AND ')}) THEN
      RAISE EXCEPTION '${MSG.keys}';
    END IF;
    RETURN NEW;`,
  },
];

/** The statements for PostgreSQL, exported so a test can run them on a real server. */
export function postgresStatements(): string[] {
  const out: string[] = [];
  for (const f of PG_FUNCTIONS) {
    out.push(`CREATE OR REPLACE FUNCTION ${f.name}() RETURNS trigger LANGUAGE plpgsql AS $fn$\n  BEGIN${f.body}\n  END;\n$fn$`);
    out.push(`DROP TRIGGER IF EXISTS ${f.name} ON ${f.table}`);
    out.push(`CREATE TRIGGER ${f.name} ${f.timing} ON ${f.table} FOR EACH ROW EXECUTE FUNCTION ${f.name}()`);
  }
  return out;
}

export async function up({ context: qi }: { context: QueryInterface }) {
  const dialect = qi.sequelize.getDialect();
  if (dialect !== 'sqlite' && dialect !== 'postgres') {
    throw new Error(`Migration 0007-signing-keys-and-record-guards has triggers for SQLite and PostgreSQL only; ${dialect} needs its own.`);
  }
  await qi.createTable('signing_keys', {
    keyId: { type: DataTypes.STRING(16), primaryKey: true },
    fingerprint: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    algorithm: { type: DataTypes.STRING(16), allowNull: false },
    publicKeyPem: { type: DataTypes.TEXT, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    retiredAt: { type: DataTypes.DATE, allowNull: true },
  });
  await qi.addColumn('sheet_revision_events', 'prevHash', { type: DataTypes.STRING(64), allowNull: true });
  await qi.addColumn('sheet_revision_events', 'hash', { type: DataTypes.STRING(64), allowNull: true });

  if (dialect === 'sqlite') {
    await qi.sequelize.query('DROP TRIGGER IF EXISTS sheet_revision_events_no_update');
    for (const sql of SQLITE_TRIGGERS) await qi.sequelize.query(sql);
  } else {
    for (const sql of postgresStatements()) await qi.sequelize.query(sql);
  }
}

export async function down({ context: qi }: { context: QueryInterface }) {
  if (qi.sequelize.getDialect() === 'sqlite') {
    for (const name of SQLITE_DROPS) await qi.sequelize.query(`DROP TRIGGER IF EXISTS ${name}`);
    await qi.sequelize.query('DROP TRIGGER IF EXISTS sheet_revision_events_no_update');
    await qi.sequelize.query(`CREATE TRIGGER sheet_revision_events_no_update BEFORE UPDATE ON sheet_revision_events
      BEGIN SELECT RAISE(ABORT, '${MSG.log}'); END`);
  } else {
    for (const f of PG_FUNCTIONS) {
      await qi.sequelize.query(`DROP TRIGGER IF EXISTS ${f.name} ON ${f.table}`);
      await qi.sequelize.query(`DROP FUNCTION IF EXISTS ${f.name}()`);
    }
  }
  await qi.removeColumn('sheet_revision_events', 'hash');
  await qi.removeColumn('sheet_revision_events', 'prevHash');
  await qi.dropTable('signing_keys');
}
