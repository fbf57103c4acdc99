import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Failed sign-ins, counted per account and per network address, in the database so that the
 * counts survive a restart and hold for every server process on the same file.
 *
 * One row per counted key: `account:<e-mail>` or `address:<ip>`. Times are milliseconds since
 * the epoch (integers), so the limiter compares them without date parsing.
 *  - `failures`: failed attempts in the window that began at `windowStartedAt`;
 *  - `lockedUntil`: while later than now, every attempt on the key is refused (429);
 *  - `locks`: how many times the key has been locked since its last success, which doubles the
 *    next lock (backoff);
 *  - `updatedAt`: last change; rows idle for a day and not locked are pruned.
 */
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('signin_limits', {
    key: { type: DataTypes.STRING(320), primaryKey: true, allowNull: false },
    failures: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    windowStartedAt: { type: DataTypes.BIGINT, allowNull: false },
    lockedUntil: { type: DataTypes.BIGINT, allowNull: true },
    locks: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    updatedAt: { type: DataTypes.BIGINT, allowNull: false },
  });
  await qi.addIndex('signin_limits', ['updatedAt']);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('signin_limits');
}
