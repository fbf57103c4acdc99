import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Runs numbered per truss: `analysis_runs.number` is 1, 2, … within each truss, so people can
 * cite "Run 2 of T7" instead of the firm-wide row id. Existing rows are numbered per truss in id
 * order; a unique index on (trussId, number) makes sure two runs of one truss never share one.
 *
 * The column stays nullable because neither SQLite nor PostgreSQL lets ADD COLUMN be NOT NULL
 * without a default, and rebuilding the table on SQLite would drop 0007's guards; the app always
 * writes it (runs.repository.ts).
 *
 * 0007 refuses any change to the run behind an issued or superseded sheet revision. Filling in
 * the number of such a run is the one change this migration makes to it, so the guard is set
 * aside for the backfill only, inside the migration, and put back with the same text.
 */

const RUN_MSG = 'panelpoint: the analysis run behind an issued sheet revision cannot be changed or deleted';
const FROZEN = `('issued', 'superseded')`;
const SQLITE_RUN_UPDATE_GUARD = `CREATE TRIGGER analysis_runs_frozen_update BEFORE UPDATE ON analysis_runs
   WHEN EXISTS (SELECT 1 FROM sheet_revisions s WHERE s.runId = OLD.id AND s.status IN ${FROZEN})
   BEGIN
     SELECT RAISE(ABORT, '${RUN_MSG}');
   END`;

export async function up({ context: qi }: { context: QueryInterface }) {
  const dialect = qi.sequelize.getDialect();
  if (dialect !== 'sqlite' && dialect !== 'postgres') {
    throw new Error(`Migration 0014-run-numbers sets 0007's guards aside for SQLite and PostgreSQL only; ${dialect} needs its own.`);
  }
  await qi.addColumn('analysis_runs', 'number', { type: DataTypes.INTEGER, allowNull: true });

  // One transaction (DDL is transactional on both SQLite and PostgreSQL): if the backfill fails,
  // the guard is not left set aside. One UPDATE numbers every row: its count of the rows of its
  // truss with an id up to its own (the (trussId, id) index of 0003 serves the count).
  await qi.sequelize.transaction(async (transaction) => {
    const [found] = (await qi.sequelize.query('SELECT COUNT(*) AS n FROM analysis_runs', { transaction })) as [{ n: number | string }[], unknown];
    if (Number(found[0]?.n ?? 0) === 0) return;
    if (dialect === 'sqlite') await qi.sequelize.query('DROP TRIGGER IF EXISTS analysis_runs_frozen_update', { transaction });
    else await qi.sequelize.query('ALTER TABLE analysis_runs DISABLE TRIGGER pp_analysis_runs_guard', { transaction });
    await qi.sequelize.query(
      `UPDATE analysis_runs SET number = (
         SELECT COUNT(*) FROM analysis_runs r WHERE r."trussId" = analysis_runs."trussId" AND r.id <= analysis_runs.id)`,
      { transaction },
    );
    if (dialect === 'sqlite') await qi.sequelize.query(SQLITE_RUN_UPDATE_GUARD, { transaction });
    else await qi.sequelize.query('ALTER TABLE analysis_runs ENABLE TRIGGER pp_analysis_runs_guard', { transaction });
  });
  await qi.addIndex('analysis_runs', ['trussId', 'number'], { unique: true, name: 'analysis_runs_truss_number' });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.removeIndex('analysis_runs', 'analysis_runs_truss_number');
  await qi.removeColumn('analysis_runs', 'number');
}
