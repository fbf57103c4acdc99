import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * The checker a preparer chose when submitting a sheet revision (`sheet_revisions.checkerId`).
 * Only that person may return the revision or mark it checked, and only they get the
 * "submitted" e-mail.
 *
 * Nullable, and existing rows keep null: revisions submitted before this release went to every
 * reviewer, and any reviewer but the preparer may still check those (the rule they were
 * submitted under). Issued rows are frozen by 0004/0007's guards, so nothing is filled in for
 * them; adding a column changes no existing row's values, which those guards allow.
 */
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.addColumn('sheet_revisions', 'checkerId', {
    type: DataTypes.INTEGER,
    allowNull: true,
    references: { model: 'users', key: 'id' },
  });
  // "What waits for me to check": in-check revisions of one checker.
  await qi.addIndex('sheet_revisions', ['checkerId', 'status'], { name: 'sheet_revisions_checker_status' });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.removeIndex('sheet_revisions', 'sheet_revisions_checker_status');
  await qi.removeColumn('sheet_revisions', 'checkerId');
}
