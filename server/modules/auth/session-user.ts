import { readRows } from '../../db/read-rows';
import type { Role } from '@shared/schemas/auth.schema';
import { User } from '../../db/models';

/**
 * The signed-in user of a request, as passport's deserializeUser hands it on (req.user): a
 * frozen plain row, never a model instance, and without the password hash (a signed-in user
 * always has one; toUserView reads its absence as "not pending").
 */
export interface SessionUserRow {
  readonly id: number;
  readonly email: string;
  readonly name: string;
  readonly role: Role;
  readonly disabled: boolean;
  readonly sessionEpoch: number;
  /** False for an invited user who has not chosen a password yet (such a user cannot be signed in). */
  readonly hasPassword: boolean;
  readonly createdAt: Date;
  readonly updatedAt: Date;
}

/**
 * How long a user row read for one request answers for the next ones in this process. Every
 * write to the users table through the models (disable, role change, password change or reset,
 * which raises the session epoch) clears the cache of this process at once, so here revocation
 * is immediate. Another server process sharing the database (several processes behind one
 * address) learns of the change when its entry expires: a disabled user, or a session signed
 * out by a password change, keeps access there for at most this long. Two seconds is the bound
 * we accept for that; it saves one database read on nearly every request. The cache only ever
 * errs towards letting a request through for that long, never towards refusing one: passport.ts
 * reads the row again before it refuses a session (a session newer than the cached row, made
 * by a password change through another process, would otherwise be signed out).
 */
export const SESSION_USER_TTL_MS = 2000;

const USER_HOOKS = ['afterCreate', 'afterUpdate', 'afterSave', 'afterUpsert', 'afterDestroy', 'afterRestore', 'afterBulkCreate', 'afterBulkUpdate', 'afterBulkDestroy', 'afterBulkRestore'] as const;

/** Raised by every write to users; an entry read under an older generation is not used. */
let generation = 0;
/** The hooks object of the User model we last hooked into (User.init, run per start, replaces it). */
let hookedOn: unknown;

function invalidate(): void {
  generation++;
}

/**
 * Hooks into the User model's writes once per model initialisation. A write inside a
 * transaction invalidates when it runs and again when the transaction commits, so a read made
 * in between (which still sees the old row) is not kept.
 */
function ensureHooks(): void {
  const hooks = (User as unknown as { options: { hooks: unknown } }).options.hooks;
  if (hooks === hookedOn) return;
  for (const type of USER_HOOKS) {
    User.addHook(type, 'session-user-cache', (...args: unknown[]) => {
      invalidate();
      for (const a of args) {
        const t = (a as { transaction?: { afterCommit?: (fn: () => void) => void } } | null)?.transaction;
        if (t?.afterCommit) {
          t.afterCommit(invalidate);
          break;
        }
      }
    });
  }
  hookedOn = (User as unknown as { options: { hooks: unknown } }).options.hooks;
}

interface UserDbRow {
  id: number;
  email: string;
  name: string;
  role: Role;
  disabled: number | boolean;
  sessionEpoch: number;
  hasPassword: number | boolean;
  createdAt: string | Date;
  updatedAt: string | Date;
}

/** A cache of user rows per process for passport's deserializeUser; see SESSION_USER_TTL_MS. */
export function sessionUserCache(options: { ttlMs?: number; now?: () => number } = {}) {
  const ttlMs = options.ttlMs ?? SESSION_USER_TTL_MS;
  const now = options.now ?? Date.now;
  const entries = new Map<number, { row: SessionUserRow | null; at: number; generation: number }>();

  async function read(id: number): Promise<SessionUserRow | null> {
    // One plain read of the columns needed (no model instance, no query building).
    const rows = await readRows<UserDbRow>(
      User.sequelize!,
      'SELECT "id", "email", "name", "role", "disabled", "sessionEpoch", "passwordHash" IS NOT NULL AS "hasPassword", "createdAt", "updatedAt" FROM "users" WHERE "id" = :id',
      { id },
    );
    const r = rows[0];
    if (!r) return null;
    return Object.freeze({
      id: r.id,
      email: r.email,
      name: r.name,
      role: r.role,
      disabled: Boolean(r.disabled),
      sessionEpoch: Number(r.sessionEpoch),
      hasPassword: Boolean(r.hasPassword),
      createdAt: new Date(r.createdAt),
      updatedAt: new Date(r.updatedAt),
    });
  }

  return {
    /** The row, from the cache when young enough; `fresh` reads the database whatever the cache holds. */
    async get(id: number, options: { fresh?: boolean } = {}): Promise<SessionUserRow | null> {
      ensureHooks();
      const hit = entries.get(id);
      const t = now();
      if (!options.fresh && hit && hit.generation === generation && t - hit.at < ttlMs) return hit.row;
      const startedUnder = generation;
      const row = await read(id);
      // A write that landed while this read was in flight may not be in it: keep it only if none did.
      if (startedUnder === generation) {
        if (entries.size > 10_000) entries.clear();
        entries.set(id, { row, at: t, generation: startedUnder });
      }
      return row;
    },
  };
}
