import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * The review e-mails each person has turned off: one row per person and kind of e-mail
 * (`submitted`, `returned`, `checked`, `issued`). No row means the person gets that e-mail,
 * so everyone keeps getting every e-mail until they choose otherwise. Password and invitation
 * e-mails are never listed here: they are always sent.
 */
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('email_opt_outs', {
    userId: {
      type: DataTypes.INTEGER,
      primaryKey: true,
      allowNull: false,
      references: { model: 'users', key: 'id' },
      onDelete: 'CASCADE',
    },
    kind: { type: DataTypes.STRING(32), primaryKey: true, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('email_opt_outs');
}
