import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('drawings', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    trussId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'trusses', key: 'id' }, onDelete: 'CASCADE' },
    version: { type: DataTypes.INTEGER, allowNull: false },
    originalName: { type: DataTypes.STRING(255), allowNull: false },
    storedName: { type: DataTypes.STRING(80), allowNull: false },
    size: { type: DataTypes.INTEGER, allowNull: false },
    sha256: { type: DataTypes.STRING(64), allowNull: false },
    status: { type: DataTypes.STRING(16), allowNull: false },
    options: { type: DataTypes.TEXT, allowNull: false },
    layers: { type: DataTypes.TEXT, allowNull: false },
    result: { type: DataTypes.TEXT, allowNull: true },
    error: { type: DataTypes.TEXT, allowNull: true },
    uploadedById: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    importedAt: { type: DataTypes.DATE, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('drawings', ['trussId', 'version'], { unique: true });
  // The engineer's working model of a truss: geometry from the drawing plus supports, loads,
  // properties and takeoff. `version` guards against two people saving over each other.
  await qi.createTable('truss_models', {
    trussId: { type: DataTypes.INTEGER, primaryKey: true, references: { model: 'trusses', key: 'id' }, onDelete: 'CASCADE' },
    drawingId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'drawings', key: 'id' } },
    model: { type: DataTypes.TEXT, allowNull: false },
    takeoff: { type: DataTypes.TEXT, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    updatedById: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('truss_models');
  await qi.dropTable('drawings');
}
