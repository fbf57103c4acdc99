import bcrypt from 'bcryptjs';
import passportModule from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { User } from '../../db/models';
import { sessionUserCache } from './session-user';

/** A hash to compare against when the e-mail is unknown, so both paths take the same time. */
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', 10);

interface SessionUser {
  id: number;
  epoch: number;
}

export type PassportInstance = InstanceType<typeof passportModule.Passport>;

/** One passport instance per app, so tests can mount several apps side by side. */
export function createPassport(): PassportInstance {
  const passport = new passportModule.Passport();
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, async (email, password, done) => {
      try {
        const user = await User.findOne({ where: { email: email.trim().toLowerCase() } });
        const ok = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
        if (!user || !user.passwordHash || !ok) return done(null, false, { message: 'bad-credentials' });
        if (user.disabled) return done(null, false, { message: 'account-disabled' });
        return done(null, user);
      } catch (err) {
        return done(err);
      }
    }),
  );
  // A session holds the user's id and session epoch at sign-in; a password change or reset
  // raises the epoch, which signs out every session made before it.
  passport.serializeUser((user, done) => done(null, { id: (user as User).id, epoch: (user as User).sessionEpoch ?? 0 } satisfies SessionUser));
  // Every signed-in request needs its user: read through a short per-process cache (see
  // SESSION_USER_TTL_MS for why that is safe) instead of a model read per request.
  const users = sessionUserCache();
  passport.deserializeUser(async (stored: SessionUser | number, done) => {
    try {
      // Sessions made before epochs existed hold the bare id, which counts as epoch 0.
      const { id, epoch } = typeof stored === 'number' ? { id: stored, epoch: 0 } : stored;
      const accepts = (u: Awaited<ReturnType<typeof users.get>>) => Boolean(u && !u.disabled && u.hasPassword && u.sessionEpoch === epoch);
      let user = await users.get(id);
      // A refusal is never made on a cached row: the row may be older than the session (a
      // password changed through another server process signs that person in again there with
      // the next epoch, which this process's cached row does not know yet), so before saying no
      // the row is read again from the database. Only an acceptance may be up to the cache's
      // age old.
      if (!accepts(user)) user = await users.get(id, { fresh: true });
      // A disabled or removed user's existing sessions stop working (at once in this process,
      // within the cache's time in another), and so do sessions from before the user's last
      // password change.
      done(null, accepts(user) ? user : false);
    } catch (err) {
      done(err);
    }
  });
  return passport;
}
