import fs from 'node:fs';
import path from 'node:path';
import { Sequelize, Transaction } from 'sequelize';

const BUSY_TIMEOUT_MS = 10_000;

/**
 * Opens the SQLite database. WAL lets readers carry on while a write commits. Sequelize gives
 * every transaction a connection of its own, so the busy timeout is set on each connection as
 * it opens, not once; and transactions BEGIN IMMEDIATE, taking the write lock before their first
 * read, so two writers queue behind the busy timeout instead of one failing with SQLITE_BUSY
 * when it tries to upgrade a read lock (which no timeout can wait out).
 */
export async function openDatabase(storage: string): Promise<Sequelize> {
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
