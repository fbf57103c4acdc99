import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * The head of the sheet audit log's keyed chain: one row (id 1) holding how many lines the chain
 * has, the last line's id and hash, and an HMAC of those under the audit key (a file in the data
 * folder, never in the database). Someone who can write the database but not read the key can
 * neither re-key a changed line nor move the head back after removing lines from the end.
 * Written by the records service (audit-chain.ts) in the transaction that seals the lines.
 */
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('audit_chain_heads', {
    id: { type: DataTypes.INTEGER, primaryKey: true, allowNull: false },
    lines: { type: DataTypes.INTEGER, allowNull: false },
    lastId: { type: DataTypes.INTEGER, allowNull: true },
    lastHash: { type: DataTypes.STRING(64), allowNull: false },
    mac: { type: DataTypes.STRING(64), allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('audit_chain_heads');
}
