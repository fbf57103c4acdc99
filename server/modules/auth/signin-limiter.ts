import net from 'node:net';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { dbWriteLock } from '../../db/sequelize';

/**
 * Failed sign-ins counted per account and per network address in the `signin_limits` table
 * (migration 0006), so that the counts survive a restart and hold for every server process
 * sharing the database file.
 *
 * - Per account (default 5 failures in 15 minutes): the account is then locked for the window,
 *   and each further lock before a successful sign-in doubles, up to `maxLockMs` (backoff).
 *   While an account is locked every attempt on it is refused, the right password included
 *   (the conservative reading: a guesser who hits the right password during the lock learns
 *   nothing). Attempts from other addresses are refused too, since the lock is the account's.
 * - Per address (default 50 in 15 minutes, high so that an office behind one NAT is not
 *   locked out by one person's mistakes): stops one address trying many accounts. It never
 *   touches attempts from any other address, so someone guessing at other accounts cannot
 *   keep account X's owner out from X's own network. Its locks back off like an account's;
 *   a success does not reset them, a day without attempts (pruning) does.
 * - A success clears the account's count and its backoff. It does not clear the address's
 *   count (only the attempt itself is taken back): otherwise a guesser with one account of
 *   their own could sign into it between guesses and never reach the address limit.
 *
 * Each attempt is counted before the password is checked (inside one IMMEDIATE transaction),
 * so a burst of parallel requests cannot all slip in under the limit; a success or an attempt
 * that proved nothing (a disabled account, a server error) takes its reservation back.
 */
export interface SignInLimits {
  /** Failed attempts per account in one window before the account is locked. */
  accountLimit: number;
  /** Failed attempts per address in one window before the address is locked. */
  addressLimit: number;
  windowMs: number;
  /** Longest lock after repeated locks; default 16 windows (4 hours at the default window). */
  maxLockMs?: number;
  /** Milliseconds since the epoch; tests move it on. */
  now?: () => number;
}

export type Refusal = {
  refused: true;
  kind: 'account' | 'address';
  /** When the next attempt is allowed (ms since the epoch). */
  retryAt: number;
  /** Whole seconds to wait, as the Retry-After header says it. */
  retryAfterSeconds: number;
};

export type Attempt = {
  refused: false;
  /** The password was wrong (or the account unknown): the reservation stays as a failure. */
  failed(): Promise<void>;
  /** Signed in: the account's count and backoff are cleared, the address's reservation released. */
  succeeded(): Promise<void>;
  /** The attempt proved nothing (disabled account, error): both reservations are released. */
  release(): Promise<void>;
};

export interface SignInLimiter {
  begin(email: string, address: string | undefined): Promise<Refusal | Attempt>;
  /** Deletes rows idle for a day and not locked; returns how many went. */
  prune(): Promise<number>;
}

interface Row {
  key: string;
  failures: number;
  windowStartedAt: number;
  lockedUntil: number | null;
  locks: number;
  updatedAt: number;
}

/** Rows untouched this long (and not locked) are deleted; their backoff is forgotten with them. */
export const PRUNE_IDLE_MS = 24 * 3600 * 1000;
const PRUNE_EVERY_MS = 10 * 60 * 1000;

export function accountKey(email: string): string {
  return `account:${email.trim().toLowerCase()}`;
}

/**
 * The address a limit is counted on. IPv4 (and IPv4-mapped IPv6) as is; other IPv6 addresses by
 * their /64 prefix, since one subscriber usually holds a whole /64 and could otherwise take a
 * fresh address for every guess (common practice, no source).
 */
export function addressKey(address: string | undefined): string {
  const ip = (address ?? '').trim();
  if (!ip) return 'address:unknown';
  const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(ip);
  if (mapped) return `address:${mapped[1]}`;
  if (net.isIPv6(ip)) return `address:${ipv6Prefix64(ip)}::/64`;
  return `address:${ip}`;
}

function ipv6Prefix64(ip: string): string {
  const withoutZone = ip.split('%')[0];
  const [head, tail] = withoutZone.includes('::') ? withoutZone.split('::') : [withoutZone, undefined];
  const headParts = head ? head.split(':') : [];
  const tailParts = tail ? tail.split(':') : [];
  // A dotted IPv4 tail counts as two groups.
  const groups = (parts: string[]) => parts.reduce((n, p) => n + (p.includes('.') ? 2 : 1), 0);
  const missing = tail === undefined ? 0 : 8 - groups(headParts) - groups(tailParts);
  const all = [...headParts, ...Array(Math.max(0, missing)).fill('0'), ...tailParts];
  return all
    .slice(0, 4)
    .map((g) => (parseInt(g, 16) || 0).toString(16))
    .join(':');
}

export function signInLimiterCreate(sequelize: Sequelize, limits: SignInLimits): SignInLimiter {
  const now = limits.now ?? Date.now;
  const windowMs = limits.windowMs;
  const maxLockMs = limits.maxLockMs ?? 16 * windowMs;
  let lastPrune = 0;

  // One limiter transaction at a time in this process. SQLite lets one writer in at a time anyway,
  // and a waiting node-sqlite3 connection holds a libuv worker thread while it waits: a burst
  // of parallel sign-ins could take every worker and leave none to COMMIT the writer they wait
  // for. Other processes on the file wait behind the busy timeout with threads of their own.
  let queue: Promise<unknown> = Promise.resolve();
  const serial = <T>(job: () => Promise<T>): Promise<T> => {
    const next = queue.then(job, job);
    queue = next.catch(() => {});
    return next;
  };

  const lockMs = (locks: number) => Math.min(windowMs * 2 ** Math.max(0, locks - 1), maxLockMs);

  async function read(keys: string[], transaction: Transaction): Promise<Map<string, Row>> {
    const rows = await sequelize.query<Row>(`SELECT * FROM signin_limits WHERE key IN (${keys.map(() => '?').join(',')})`, {
      replacements: keys,
      type: QueryTypes.SELECT,
      transaction,
    });
    return new Map(rows.map((r) => [r.key, { ...r, failures: Number(r.failures), windowStartedAt: Number(r.windowStartedAt), lockedUntil: r.lockedUntil === null ? null : Number(r.lockedUntil), locks: Number(r.locks), updatedAt: Number(r.updatedAt) }]));
  }

  async function write(row: Row, transaction: Transaction): Promise<void> {
    await sequelize.query(
      // Camel-case columns quoted: PostgreSQL folds unquoted names to lower case (SQLite takes both).
      `INSERT INTO signin_limits (key, failures, "windowStartedAt", "lockedUntil", locks, "updatedAt") VALUES (?, ?, ?, ?, ?, ?)
       ON CONFLICT(key) DO UPDATE SET failures = excluded.failures, "windowStartedAt" = excluded."windowStartedAt",
         "lockedUntil" = excluded."lockedUntil", locks = excluded.locks, "updatedAt" = excluded."updatedAt"`,
      { replacements: [row.key, row.failures, row.windowStartedAt, row.lockedUntil, row.locks, row.updatedAt], transaction },
    );
  }

  /** The row as it stands at time t: an ended lock or an ended window starts a new count. */
  function current(key: string, row: Row | undefined, t: number): Row {
    if (!row) return { key, failures: 0, windowStartedAt: t, lockedUntil: null, locks: 0, updatedAt: t };
    if (row.lockedUntil !== null && row.lockedUntil <= t) return { ...row, failures: 0, windowStartedAt: t, lockedUntil: null };
    if (row.lockedUntil === null && t - row.windowStartedAt >= windowMs) return { ...row, failures: 0, windowStartedAt: t };
    return row;
  }

  /** When a key blocks attempts, or null when it does not. */
  function blockedUntil(row: Row, limit: number, t: number): number | null {
    if (row.lockedUntil !== null && row.lockedUntil > t) return row.lockedUntil;
    // At the limit without a lock: the last allowed attempts are still being checked.
    if (row.failures >= limit) return row.windowStartedAt + windowMs;
    return null;
  }

  async function settle(keys: { key: string; limit: number }[], outcome: 'failed' | 'succeeded' | 'release'): Promise<void> {
    await serial(() => sequelize.transaction(async (transaction) => {
      await dbWriteLock(sequelize, transaction, 'signin_limits');
      const t = now();
      const rows = await read(keys.map((k) => k.key), transaction);
      for (const { key, limit } of keys) {
        const row = rows.get(key);
        if (!row) continue;
        if (outcome === 'failed') {
          if (row.failures >= limit && !(row.lockedUntil !== null && row.lockedUntil > t)) {
            const locks = row.locks + 1;
            await write({ ...row, locks, lockedUntil: t + lockMs(locks), updatedAt: t }, transaction);
          } else {
            await write({ ...row, updatedAt: t }, transaction);
          }
        } else if (outcome === 'succeeded' && key.startsWith('account:')) {
          await sequelize.query('DELETE FROM signin_limits WHERE key = ?', { replacements: [key], transaction });
        } else {
          await write({ ...row, failures: Math.max(0, row.failures - 1), updatedAt: t }, transaction);
        }
      }
    }));
  }

  async function prune(): Promise<number> {
    const t = now();
    lastPrune = t;
    const removed = await serial(() =>
      sequelize.query('DELETE FROM signin_limits WHERE "updatedAt" < ? AND ("lockedUntil" IS NULL OR "lockedUntil" <= ?)', {
        replacements: [t - PRUNE_IDLE_MS, t],
        type: QueryTypes.BULKDELETE,
      }),
    );
    return Number(removed);
  }

  return {
    prune,
    async begin(email, address) {
      if (now() - lastPrune > PRUNE_EVERY_MS) await prune();
      const keys = [
        { key: addressKey(address), limit: limits.addressLimit, kind: 'address' as const },
        { key: accountKey(email), limit: limits.accountLimit, kind: 'account' as const },
      ];
      const refusal = await serial(() => sequelize.transaction(async (transaction): Promise<Refusal | null> => {
        // Read, decide and write as one step across processes (SQLite: the IMMEDIATE transaction).
        await dbWriteLock(sequelize, transaction, 'signin_limits');
        const t = now();
        const rows = await read(keys.map((k) => k.key), transaction);
        const states = keys.map((k) => ({ ...k, row: current(k.key, rows.get(k.key), t) }));
        const blocked = states
          .map((s) => ({ kind: s.kind, until: blockedUntil(s.row, s.limit, t) }))
          .filter((b): b is { kind: 'account' | 'address'; until: number } => b.until !== null)
          .sort((a, b) => b.until - a.until);
        if (blocked.length) {
          const { kind, until } = blocked[0];
          return { refused: true, kind, retryAt: until, retryAfterSeconds: Math.max(1, Math.ceil((until - t) / 1000)) };
        }
        for (const s of states) await write({ ...s.row, failures: s.row.failures + 1, updatedAt: t }, transaction);
        return null;
      }));
      if (refusal) return refusal;
      let settled = false;
      const once = (outcome: 'failed' | 'succeeded' | 'release') => async () => {
        if (settled) return;
        settled = true;
        await settle(keys, outcome);
      };
      return { refused: false, failed: once('failed'), succeeded: once('succeeded'), release: once('release') };
    },
  };
}

/** One sentence for a refused sign-in: what is locked and when to try again. */
export function refusalMessage(refusal: Refusal): string {
  const wait = refusal.retryAfterSeconds;
  const inWords =
    wait < 90 ? `${wait} second${wait === 1 ? '' : 's'}` : wait < 90 * 60 ? `${Math.ceil(wait / 60)} minutes` : `${Math.round((wait / 3600) * 10) / 10} hours`;
  // Rounded up to the minute, so the time named is never before the lock ends.
  const at = new Date(Math.ceil(refusal.retryAt / 60_000) * 60_000).toISOString().slice(0, 16).replace('T', ' ');
  return refusal.kind === 'account'
    ? `Too many failed sign-ins for this account: try again in ${inWords} (after ${at} UTC), or ask your admin if you have forgotten the password.`
    : `Too many failed sign-ins from your network address: try again in ${inWords} (after ${at} UTC).`;
}
