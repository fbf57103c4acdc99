import { QueryTypes, type Sequelize } from 'sequelize';

/**
 * Plain rows of a hand-written SELECT, for the reads every request makes (the session row, the
 * signed-in user, the project list, a truss's model, the archive).
 *
 * On PostgreSQL this is `sequelize.query` as before. On SQLite it asks the SQLite driver's
 * connection directly: Sequelize's query path costs some 130–170 µs of CPU per query on top of
 * the driver's own work (it builds an Error and formats its stack trace on every query, makes a
 * query id, scans the SQL for table names, copies each row), about a sixth of a signed-in
 * request's CPU (bench:api). Outside a transaction Sequelize uses this same connection, so the
 * rows are the ones `sequelize.query` would give, with the driver's types.
 *
 * `:name` in the SQL stands for `replacements.name` (an array for `IN (:name)`), as with
 * Sequelize's replacements but bound as parameters. Reads only: never in a transaction (pass
 * those through Sequelize with `{ transaction }`).
 */
export async function readRows<T extends object>(sequelize: Sequelize, sql: string, replacements: Record<string, unknown> = {}): Promise<T[]> {
  if (sequelize.getDialect() !== 'sqlite') {
    return sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements, raw: true });
  }
  const { text, values } = bound(sql, replacements);
  const db = await sqliteConnection(sequelize);
  // Serialised, as Sequelize runs every statement on this connection (conn.serialize): in the
  // driver's parallel mode fifty overlapping reads kept the thread pool busy on the connection's
  // lock and two engineers' model saves fell from some 3 a second to 0.4 (bench:api, writers).

  try {
    return await new Promise<T[]>((resolve, reject) => db.serialize(() => db.all(text, values, (err, rows) => (err ? reject(err) : resolve(rows as T[])))));
  } catch (err) {
    // A busy database (a checkpoint, a recovery) is retried by Sequelize's own path, which
    // waits and tries again (sequelize.ts: retry on SQLITE_BUSY).
    if ((err as { code?: string }).code === 'SQLITE_BUSY') return sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements, raw: true });
    throw err;
  }
}

interface SqliteDb {
  serialize(fn: () => void): void;
  all(sql: string, params: unknown[], cb: (err: Error | null, rows: unknown[]) => void): void;
}

const connections = new WeakMap<Sequelize, Promise<SqliteDb>>();

/** The connection Sequelize's SQLite dialect uses outside transactions ('default'), opened once. */
function sqliteConnection(sequelize: Sequelize): Promise<SqliteDb> {
  let db = connections.get(sequelize);
  if (!db) {
    const manager = sequelize.connectionManager as unknown as { getConnection(o: object): Promise<SqliteDb> };
    db = manager.getConnection({});
    db.catch(() => connections.delete(sequelize));
    connections.set(sequelize, db);
  }
  return db;
}

const PARAM = /:([A-Za-z_][A-Za-z0-9_]*)/g;
const cache = new Map<string, { parts: string[]; names: string[] }>();

/** The SQL with each `:name` as `?` (one per element of an array) and the values in order. */
function bound(sql: string, replacements: Record<string, unknown>): { text: string; values: unknown[] } {
  let split = cache.get(sql);
  if (!split) {
    const parts: string[] = [];
    const names: string[] = [];
    let last = 0;
    for (const m of sql.matchAll(PARAM)) {
      // Not a PostgreSQL cast (::text); the hot queries hold none, but be safe.
      if (m.index! > 0 && sql[m.index! - 1] === ':') continue;
      parts.push(sql.slice(last, m.index));
      names.push(m[1]);
      last = m.index! + m[0].length;
    }
    parts.push(sql.slice(last));
    split = { parts, names };
    if (cache.size < 200) cache.set(sql, split);
  }
  const values: unknown[] = [];
  let text = split.parts[0];
  split.names.forEach((name, i) => {
    if (!(name in replacements)) throw new Error(`readRows: no value for :${name}.`);
    const v = replacements[name];
    if (Array.isArray(v)) {
      // Sequelize writes an empty list as NULL on SQLite (IN (NULL) matches nothing); so does this.
      text += v.length === 0 ? 'NULL' : v.map(() => '?').join(', ');
      values.push(...v.map(sqliteValue));
    } else {
      text += '?';
      values.push(sqliteValue(v));
    }
    text += split!.parts[i + 1];
  });
  return { text, values };
}

/** Booleans as 0/1, as Sequelize writes them on SQLite; numbers, text and null as they are. */
function sqliteValue(v: unknown): unknown {
  if (typeof v === 'boolean') return v ? 1 : 0;
  if (v === null || typeof v === 'number' || typeof v === 'string') return v;
  throw new Error(`readRows: a replacement of type ${typeof v} is not supported; pass numbers, text, booleans or null.`);
}
