import fs from 'node:fs';
import path from 'node:path';
import { Sequelize } from 'sequelize';

/**
 * Opens the SQLite database. WAL lets readers carry on while a write commits; the busy
 * timeout makes a second writer wait instead of failing at once.
 */
export async function openDatabase(storage: string): Promise<Sequelize> {
  if (storage !== ':memory:') fs.mkdirSync(path.dirname(storage), { recursive: true });
  const sequelize = new Sequelize({ dialect: 'sqlite', storage, logging: false });
  await sequelize.query('PRAGMA busy_timeout = 5000;');
  if (storage !== ':memory:') await sequelize.query('PRAGMA journal_mode = WAL;');
  await sequelize.query('PRAGMA foreign_keys = ON;');
  return sequelize;
}
