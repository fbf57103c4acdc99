import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: qi }: { context: QueryInterface }) {
  // One analysis run: an immutable snapshot of the model (takeoff applied) and, once the
  // worker is done, its results. Only status, progress, times and results are ever updated.
  await qi.createTable('analysis_runs', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    trussId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'trusses', key: 'id' }, onDelete: 'CASCADE' },
    modelVersion: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.STRING(16), allowNull: false },
    progress: { type: DataTypes.TEXT, allowNull: false },
    model: { type: DataTypes.TEXT, allowNull: false },
    takeoff: { type: DataTypes.TEXT, allowNull: true },
    analysis: { type: DataTypes.TEXT, allowNull: true },
    summary: { type: DataTypes.TEXT, allowNull: true },
    error: { type: DataTypes.TEXT, allowNull: true },
    ranById: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    startedAt: { type: DataTypes.DATE, allowNull: true },
    finishedAt: { type: DataTypes.DATE, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('analysis_runs', ['trussId', 'id']);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('analysis_runs');
}
