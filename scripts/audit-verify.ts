/**
 * `npm run -s audit:verify`: checks the sheet audit log's hash chain in the database of
 * DATA_DIR (default `data`), or of DATABASE_URL when that names a PostgreSQL server, line by line from the first, without changing anything.
 *
 * The keyed lines are checked with the audit key in DATA_DIR (audit-chain-key.json); lines from
 * before keying with their plain SHA-256.
 *
 * Prints "OK: …" and exits 0 when every line follows the one before it and the chain head
 * matches; prints the first break and why and exits 1 when not; exits 2 with one line on stderr
 * when there is no database to check, or the log is keyed and the key file is not there.
 */
import fs from 'node:fs';
import { loadConfig } from '../server/config';
import { openDatabase } from '../server/db/sequelize';
import { initModels } from '../server/db/models';
import path from 'node:path';
import { AUDIT_KEY_FILE, auditChainVerify, auditKeyLoad, auditKeyUse } from '../server/modules/records/audit-chain';

async function main(): Promise<number> {
  const config = loadConfig(process.env);
  const where = config.databaseUrl ? 'the database of DATABASE_URL' : config.databaseStorage;
  if (!config.databaseUrl && !fs.existsSync(config.databaseStorage)) {
    console.error(`No database at ${config.databaseStorage}; set DATA_DIR to the data folder of the Panelpoint install to check.`);
    return 2;
  }
  let sequelize;
  try {
    sequelize = await openDatabase(config.databaseUrl ?? config.databaseStorage);
  } catch (err) {
    console.error(err instanceof Error ? err.message : String(err));
    return 2;
  }
  try {
    initModels(sequelize);
    // Sequelize's own check (SQLite's sqlite_master, PostgreSQL's information_schema).
    if (!(await sequelize.getQueryInterface().tableExists('sheet_revision_events'))) {
      console.error(`${where} has no sheet audit log; start Panelpoint once so its migrations run, then check again.`);
      return 2;
    }
    const key = auditKeyLoad(path.join(config.dataDir, AUDIT_KEY_FILE));
    if (key) auditKeyUse(sequelize, key);
    const result = await auditChainVerify();
    if (!result.ok && !result.broken) {
      // Keyed, but no key here: nothing could be checked.
      console.error(result.message);
      return 2;
    }
    console.log(result.ok ? result.message : `BROKEN: ${result.message}`);
    return result.ok ? 0 : 1;
  } finally {
    await sequelize.close();
  }
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(`audit:verify failed: ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  },
);
