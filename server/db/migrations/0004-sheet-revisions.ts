import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Calc-sheet revisions, their audit log and step comments.
 *
 * Three rules live in the database as triggers, so that no code path (a later service, a
 * script, a hand-written UPDATE) can break them:
 *  - every status change writes one audit line (from, to, who — `lastActorId`, why —
 *    `lastNote`, when — `updatedAt`), in the same statement as the change;
 *  - issuing a revision supersedes the earlier issued revisions of the same truss;
 *  - an issued or superseded revision never changes and is never deleted, except for the one
 *    move issued → superseded (which may touch only status, supersededById/At, lastActorId,
 *    lastNote and updatedAt). The audit log is append-only.
 *
 * `runId` names a row of analysis_runs (another module's table), checked by the service when
 * the revision is made; no foreign key, so this migration does not depend on that one's order.
 */

const FROZEN_MESSAGE = 'panelpoint: an issued sheet revision cannot be changed or deleted';

/** Columns the issued → superseded move must leave as they were. */
const SIGNED_COLUMNS = [
  'id',
  'trussId',
  'runId',
  'number',
  'preparedById',
  'checkedById',
  'issuedById',
  'preparedByName',
  'checkedByName',
  'issuedByName',
  'submittedAt',
  'checkedAt',
  'issuedAt',
  'pdfStoredName',
  'pdfSize',
  'sha256',
  'signedRecord',
  'signature',
  'keyFingerprint',
  'createdAt',
];

const TRIGGERS = [
  `CREATE TRIGGER sheet_revisions_log_insert AFTER INSERT ON sheet_revisions
   BEGIN
     INSERT INTO sheet_revision_events (revisionId, fromStatus, toStatus, actorId, note, at)
     VALUES (NEW.id, NULL, NEW.status, NEW.lastActorId, COALESCE(NEW.lastNote, ''), NEW.createdAt);
   END`,
  `CREATE TRIGGER sheet_revisions_log_status AFTER UPDATE OF status ON sheet_revisions
   WHEN OLD.status IS NOT NEW.status
   BEGIN
     INSERT INTO sheet_revision_events (revisionId, fromStatus, toStatus, actorId, note, at)
     VALUES (NEW.id, OLD.status, NEW.status, NEW.lastActorId, COALESCE(NEW.lastNote, ''), NEW.updatedAt);
   END`,
  `CREATE TRIGGER sheet_revisions_supersede AFTER UPDATE OF status ON sheet_revisions
   WHEN NEW.status = 'issued' AND OLD.status IS NOT 'issued'
   BEGIN
     UPDATE sheet_revisions
        SET status = 'superseded', supersededById = NEW.id, supersededAt = NEW.issuedAt,
            lastActorId = NEW.lastActorId, lastNote = 'A later revision was issued.', updatedAt = NEW.updatedAt
      WHERE trussId = NEW.trussId AND status = 'issued' AND number < NEW.number;
   END`,
  `CREATE TRIGGER sheet_revisions_frozen_update BEFORE UPDATE ON sheet_revisions
   WHEN OLD.status IN ('issued', 'superseded') AND NOT (
     OLD.status = 'issued' AND NEW.status = 'superseded'
     AND ${SIGNED_COLUMNS.map((c) => `NEW.${c} IS OLD.${c}`).join(' AND ')}
   )
   BEGIN
     SELECT RAISE(ABORT, '${FROZEN_MESSAGE}');
   END`,
  `CREATE TRIGGER sheet_revisions_frozen_delete BEFORE DELETE ON sheet_revisions
   WHEN OLD.status IN ('issued', 'superseded')
   BEGIN
     SELECT RAISE(ABORT, '${FROZEN_MESSAGE}');
   END`,
  `CREATE TRIGGER sheet_revision_events_no_update BEFORE UPDATE ON sheet_revision_events
   BEGIN
     SELECT RAISE(ABORT, 'panelpoint: the sheet audit log is append-only');
   END`,
  `CREATE TRIGGER sheet_revision_events_no_delete BEFORE DELETE ON sheet_revision_events
   BEGIN
     SELECT RAISE(ABORT, 'panelpoint: the sheet audit log is append-only');
   END`,
];

export async function up({ context: qi }: { context: QueryInterface }) {
  const dialect = qi.sequelize.getDialect();
  if (dialect !== 'sqlite' && dialect !== 'postgres') {
    // Refusing is safer than running without the issued-sheet guarantees.
    throw new Error(`Migration 0004-sheet-revisions has triggers for SQLite and PostgreSQL only; ${dialect} needs its own.`);
  }
  await qi.createTable('sheet_revisions', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    trussId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'trusses', key: 'id' } },
    runId: { type: DataTypes.INTEGER, allowNull: false },
    number: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.STRING(16), allowNull: false },
    preparedById: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' } },
    checkedById: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    issuedById: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    // Names as they were when each person signed, so a later rename or leaver keeps the record.
    preparedByName: { type: DataTypes.STRING(120), allowNull: true },
    checkedByName: { type: DataTypes.STRING(120), allowNull: true },
    issuedByName: { type: DataTypes.STRING(120), allowNull: true },
    submittedAt: { type: DataTypes.DATE, allowNull: true },
    checkedAt: { type: DataTypes.DATE, allowNull: true },
    issuedAt: { type: DataTypes.DATE, allowNull: true },
    supersededAt: { type: DataTypes.DATE, allowNull: true },
    supersededById: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'sheet_revisions', key: 'id' } },
    pdfStoredName: { type: DataTypes.STRING(80), allowNull: true },
    pdfSize: { type: DataTypes.INTEGER, allowNull: true },
    sha256: { type: DataTypes.STRING(64), allowNull: true },
    signedRecord: { type: DataTypes.TEXT, allowNull: true },
    signature: { type: DataTypes.STRING(128), allowNull: true },
    keyFingerprint: { type: DataTypes.STRING(64), allowNull: true },
    lastActorId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    lastNote: { type: DataTypes.TEXT, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('sheet_revisions', ['trussId', 'number'], { unique: true });
  await qi.addIndex('sheet_revisions', ['sha256']);
  await qi.addIndex('sheet_revisions', ['status']);

  await qi.createTable('sheet_revision_events', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    revisionId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'sheet_revisions', key: 'id' } },
    fromStatus: { type: DataTypes.STRING(16), allowNull: true },
    toStatus: { type: DataTypes.STRING(16), allowNull: false },
    actorId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    at: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('sheet_revision_events', ['revisionId']);

  await qi.createTable('sheet_comments', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    revisionId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'sheet_revisions', key: 'id' } },
    trussId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'trusses', key: 'id' } },
    parentId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'sheet_comments', key: 'id' } },
    anchor: { type: DataTypes.STRING(200), allowNull: false },
    body: { type: DataTypes.TEXT, allowNull: false },
    authorId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' } },
    resolvedById: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    resolvedAt: { type: DataTypes.DATE, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('sheet_comments', ['trussId']);
  await qi.addIndex('sheet_comments', ['revisionId']);

  // PostgreSQL: these same rules (the audit line per status change, superseding, the frozen
  // issued row, the append-only log) are PL/pgSQL functions made by migration 0007
  // (pp_sheet_revisions_log, pp_sheet_revisions_guard, pp_sheet_revision_events_guard), which
  // runs in the same migrate() as this one; PostgreSQL never ran this migration before 0007 had
  // its text, so there is no install with these tables and no guards.
  if (dialect === 'sqlite') for (const sql of TRIGGERS) await qi.sequelize.query(sql);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  // PostgreSQL has no triggers of this migration (see up); dropping the tables is enough.
  if (qi.sequelize.getDialect() === 'sqlite') for (const name of [
    'sheet_revision_events_no_delete',
    'sheet_revision_events_no_update',
    'sheet_revisions_frozen_delete',
    'sheet_revisions_frozen_update',
    'sheet_revisions_supersede',
    'sheet_revisions_log_status',
    'sheet_revisions_log_insert',
  ]) {
    await qi.sequelize.query(`DROP TRIGGER IF EXISTS ${name}`);
  }
  await qi.dropTable('sheet_comments');
  await qi.dropTable('sheet_revision_events');
  await qi.dropTable('sheet_revisions');
}
