import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Password resets by e-mailed one-time link, and a way to end a user's other sessions.
 *
 *  - `password_resets`: one row per link sent. Only the SHA-256 of the link's token is kept,
 *    so a copy of the database does not hand out working links. A link works once
 *    (`usedAt`), until `expiresAt`, and is deleted when a newer link is sent for the same user.
 *  - `users.sessionEpoch`: stored in every session at sign-in; raising it (on a password change
 *    or reset) makes every session that carries the old value sign out on its next request.
 */
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('password_resets', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    tokenHash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    userId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    /** The admin who sent the link; null when the user asked for it themself. */
    requestedById: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    expiresAt: { type: DataTypes.DATE, allowNull: false },
    usedAt: { type: DataTypes.DATE, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('password_resets', ['userId']);
  await qi.addColumn('users', 'sessionEpoch', { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.removeColumn('users', 'sessionEpoch');
  await qi.dropTable('password_resets');
}
