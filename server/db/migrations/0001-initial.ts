import { DataTypes, type QueryInterface } from 'sequelize';

const timestamps = {
  createdAt: { type: DataTypes.DATE, allowNull: false },
  updatedAt: { type: DataTypes.DATE, allowNull: false },
};

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('users', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.STRING(16), allowNull: false },
    passwordHash: { type: DataTypes.STRING(100), allowNull: true },
    disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });
  await qi.createTable('invitations', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    tokenHash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    userId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    invitedById: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    expiresAt: { type: DataTypes.DATE, allowNull: false },
    usedAt: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  });
  await qi.createTable('outbox_messages', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    from: { type: DataTypes.STRING(320), allowNull: false },
    to: { type: DataTypes.TEXT, allowNull: false },
    subject: { type: DataTypes.STRING(400), allowNull: false },
    text: { type: DataTypes.TEXT, allowNull: false },
    raw: { type: DataTypes.TEXT, allowNull: false },
    receivedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.createTable('firms', {
    id: { type: DataTypes.INTEGER, primaryKey: true },
    name: { type: DataTypes.STRING(160), allowNull: false },
    address: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
    paperSize: { type: DataTypes.STRING(8), allowNull: false, defaultValue: 'A4' },
    ...timestamps,
  });
  await qi.createTable('projects', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(160), allowNull: false },
    jobNumber: { type: DataTypes.STRING(40), allowNull: false },
    client: { type: DataTypes.STRING(160), allowNull: false, defaultValue: '' },
    site: { type: DataTypes.STRING(240), allowNull: false, defaultValue: '' },
    designBasis: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    unitSystem: { type: DataTypes.STRING(2), allowNull: false, defaultValue: 'SI' },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    createdById: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    ...timestamps,
  });
  await qi.createTable('trusses', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    projectId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'projects', key: 'id' }, onDelete: 'CASCADE' },
    name: { type: DataTypes.STRING(160), allowNull: false },
    ...timestamps,
  });
  await qi.addIndex('trusses', ['projectId']);
  // The table connect-session-sequelize reads and writes (its default model "Session").
  await qi.createTable('Sessions', {
    sid: { type: DataTypes.STRING(36), primaryKey: true },
    expires: { type: DataTypes.DATE, allowNull: true },
    data: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps,
  });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const table of ['Sessions', 'trusses', 'projects', 'firms', 'outbox_messages', 'invitations', 'users']) {
    await qi.dropTable(table);
  }
}
