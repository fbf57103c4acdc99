import fs from 'node:fs';
import path from 'node:path';
import { Sequelize, Transaction } from 'sequelize';

const BUSY_TIMEOUT_MS = 10_000;

/** True when the target names a PostgreSQL server (DATABASE_URL=postgres://… or postgresql://…). */
export function isPostgresUrl(target: string): boolean {
  return /^postgres(ql)?:\/\//i.test(target);
}

/**
 * Opens the database: a PostgreSQL server when `target` is a postgres:// URL (DATABASE_URL),
 * else the SQLite file at that path (or ':memory:'), which is the default.
 */
export async function openDatabase(target: string): Promise<Sequelize> {
  return isPostgresUrl(target) ? openPostgres(target) : openSqlite(target);
}

/**
 * PostgreSQL through Sequelize's postgres dialect (the pg driver). Transactions are READ
 * COMMITTED (PostgreSQL's default); the few writes that must go one at a time across processes
 * (sealing the audit chain, the sign-in counts) take a transaction-scoped advisory lock through
 * `dbWriteLock`, which is what IMMEDIATE gives SQLite. A server that cannot be reached or
 * refuses the credentials fails here, with one sentence naming DATABASE_URL.
 */
async function openPostgres(url: string): Promise<Sequelize> {
  const sequelize = new Sequelize(url, {
    dialect: 'postgres',
    logging: false,
    pool: { max: 10, min: 0, idle: 10_000, acquire: 30_000 },
    dialectOptions: { connectionTimeoutMillis: 10_000, application_name: 'panelpoint' },
  });
  try {
    await sequelize.authenticate();
  } catch (err) {
    await sequelize.close().catch(() => {});
    throw new Error(`DATABASE_URL names a PostgreSQL server that could not be opened (${postgresReason(err)}, at ${redactedUrl(url)}); check the host, port, database name, user and password in DATABASE_URL.`);
  }
  return sequelize;
}

/** The driver's reason in a few words, without a stack. */
function postgresReason(err: unknown): string {
  const e = err as { parent?: { code?: string; message?: string }; original?: { code?: string; message?: string }; message?: string };
  const inner = e.original ?? e.parent;
  const text = (inner?.message || e.message || String(err)).replace(/\s+/g, ' ').trim();
  return text.replace(/\.$/, '') || (inner?.code ?? 'unknown error');
}

/** The URL with its password replaced, for messages and logs. */
export function redactedUrl(url: string): string {
  try {
    const u = new URL(url);
    if (u.password) u.password = '***';
    return u.toString();
  } catch {
    return 'an address that is not a valid URL';
  }
}

/**
 * Within an open transaction, waits until no other transaction (in any process) holds the
 * write lock of this name, and holds it until this transaction ends. On PostgreSQL a
 * transaction-scoped advisory lock; on SQLite nothing to do, because every transaction there
 * is BEGIN IMMEDIATE and already holds the one database-wide write lock.
 */
export async function dbWriteLock(sequelize: Sequelize, transaction: Transaction, name: string): Promise<void> {
  if (sequelize.getDialect() !== 'postgres') return;
  await sequelize.query('SELECT pg_advisory_xact_lock(hashtext(:name))', { replacements: { name: `panelpoint:${name}` }, transaction });
}

/**
 * Opens the SQLite database. WAL lets readers carry on while a write commits. Sequelize gives
 * every transaction a connection of its own, so the busy timeout is set on each connection as
 * it opens, not once; and transactions BEGIN IMMEDIATE, taking the write lock before their first
 * read, so two writers queue behind the busy timeout instead of one failing with SQLITE_BUSY
 * when it tries to upgrade a read lock (which no timeout can wait out).
 */
async function openSqlite(storage: string): Promise<Sequelize> {
  if (storage !== ':memory:') {
    fs.mkdirSync(path.dirname(storage), { recursive: true, mode: 0o700 });
    // The file is made (or kept) 0600 before SQLite opens it: SQLite creates the -wal and -shm
    // files with the database file's permissions, so they follow.
    fs.closeSync(fs.openSync(storage, 'a', 0o600));
    for (const file of [storage, `${storage}-wal`, `${storage}-shm`, `${storage}-journal`]) {
      if (fs.existsSync(file)) fs.chmodSync(file, 0o600);
    }
  }
  const sequelize = new Sequelize({
    dialect: 'sqlite',
    storage,
    logging: false,
    transactionType: Transaction.TYPES.IMMEDIATE,
    retry: { max: 5, match: [/SQLITE_BUSY/] },
  });
  // The SQLite connection manager opens a connection per transaction and runs no afterConnect
  // hook, so the busy timeout is put on each connection here as it is handed out.
  type Db = { configure(option: 'busyTimeout', ms: number): void; __busySet?: boolean };
  const manager = sequelize.connectionManager as unknown as { getConnection(o?: unknown): Promise<Db> };
  const getConnection = manager.getConnection.bind(manager);
  manager.getConnection = async (options?: unknown) => {
    const db = await getConnection(options);
    if (!db.__busySet) {
      db.configure('busyTimeout', BUSY_TIMEOUT_MS);
      db.__busySet = true;
    }
    return db;
  };
  await sequelize.query(`PRAGMA busy_timeout = ${BUSY_TIMEOUT_MS};`);
  if (storage !== ':memory:') await sequelize.query('PRAGMA journal_mode = WAL;');
  await sequelize.query('PRAGMA foreign_keys = ON;');
  return sequelize;
}
