import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Calc sheet PDFs made in the background (calc-sheets/print-jobs.service.ts): one row per job,
 * from the request to the stored PDF. `state` moves queued → building → printing → done, or to
 * failed with `error` (one sentence for the requester); `stage` and `percent` say where it is;
 * `fileKey` names the PDF in the print-jobs file store once done. Rows still queued, building or
 * printing when the server starts are queued again (the run they print is immutable).
 */
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('print_jobs', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    runId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'analysis_runs', key: 'id' }, onDelete: 'CASCADE' },
    requestedById: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    state: { type: DataTypes.STRING(16), allowNull: false },
    stage: { type: DataTypes.STRING(80), allowNull: false },
    percent: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    pages: { type: DataTypes.INTEGER, allowNull: true },
    htmlBytes: { type: DataTypes.INTEGER, allowNull: true },
    pdfBytes: { type: DataTypes.INTEGER, allowNull: true },
    fileKey: { type: DataTypes.STRING(120), allowNull: true },
    fileName: { type: DataTypes.STRING(200), allowNull: true },
    error: { type: DataTypes.TEXT, allowNull: true },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    startedAt: { type: DataTypes.DATE, allowNull: true },
    finishedAt: { type: DataTypes.DATE, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('print_jobs', ['state', 'id']);
  await qi.addIndex('print_jobs', ['runId', 'requestedById', 'id']);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('print_jobs');
}
