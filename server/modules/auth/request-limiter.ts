import { QueryTypes, type Sequelize } from 'sequelize';
import type { RequestHandler } from 'express';
import { AppError } from '../../errors/app-error';
import { dbWriteLock } from '../../db/sequelize';
import { addressKey } from './signin-limiter';

/**
 * Requests per network address in a fixed window, counted in the `signin_limits` table
 * (migration 0006) under their own key prefix, so the count holds across a restart and for every
 * server process on the same database, as the sign-in limits do; the sign-in limiter's pruning
 * removes rows idle for a day. Every request counts (nothing here is a "failure"); the
 * `limit`-plus-first request in a window is refused with 429, Retry-After and one sentence.
 * IPv6 addresses count by their /64 (addressKey).
 */
export interface AddressLimit {
  /** Key prefix, e.g. 'verify'. */
  prefix: string;
  limit: number;
  windowMs: number;
  /** What the refused person was doing, for the sentence: "verify requests". */
  what: string;
  now?: () => number;
}

export interface AddressLimiter {
  /** Counts one request; a refusal names the seconds to wait. */
  take(address: string | undefined): Promise<{ refused: false } | { refused: true; retryAfterSeconds: number }>;
  middleware: RequestHandler;
}

export function addressLimiterCreate(sequelize: Sequelize, options: AddressLimit): AddressLimiter {
  const now = options.now ?? Date.now;
  // One transaction at a time in this process (see signin-limiter.ts on SQLite's single writer).
  let queue: Promise<unknown> = Promise.resolve();
  const serial = <T>(job: () => Promise<T>): Promise<T> => {
    const next = queue.then(job, job);
    queue = next.catch(() => {});
    return next;
  };

  async function take(address: string | undefined) {
    const key = `${options.prefix}:${addressKey(address)}`;
    return serial(() =>
      sequelize.transaction(async (transaction) => {
        // Read, decide, write: on PostgreSQL (READ COMMITTED) two processes could both read a
        // count of n and both write n + 1, letting a request past the limit; the advisory lock
        // makes them take turns, as BEGIN IMMEDIATE does on SQLite.
        await dbWriteLock(sequelize, transaction, 'signin_limits');
        const t = now();
        const [row] = await sequelize.query<{ failures: number; windowStartedAt: number }>(
          'SELECT failures, "windowStartedAt" FROM signin_limits WHERE key = ?',
          { replacements: [key], type: QueryTypes.SELECT, transaction },
        );
        let count = row ? Number(row.failures) : 0;
        let start = row ? Number(row.windowStartedAt) : t;
        if (t - start >= options.windowMs) {
          count = 0;
          start = t;
        }
        if (count >= options.limit) {
          return { refused: true as const, retryAfterSeconds: Math.max(1, Math.ceil((start + options.windowMs - t) / 1000)) };
        }
        await sequelize.query(
          `INSERT INTO signin_limits (key, failures, "windowStartedAt", "lockedUntil", locks, "updatedAt") VALUES (?, ?, ?, NULL, 0, ?)
           ON CONFLICT(key) DO UPDATE SET failures = excluded.failures, "windowStartedAt" = excluded."windowStartedAt", "updatedAt" = excluded."updatedAt"`,
          { replacements: [key, count + 1, start, t], transaction },
        );
        return { refused: false as const };
      }),
    );
  }

  const middleware: RequestHandler = (req, res, next) => {
    take(req.ip).then(
      (r) => {
        if (!r.refused) return next();
        res.set('Retry-After', String(r.retryAfterSeconds));
        const wait = r.retryAfterSeconds < 90 ? `${r.retryAfterSeconds} seconds` : `${Math.ceil(r.retryAfterSeconds / 60)} minutes`;
        next(new AppError('too-many-requests', `Too many ${options.what} from your network address: try again in ${wait}.`, 429));
      },
      next,
    );
  };

  return { take, middleware };
}
