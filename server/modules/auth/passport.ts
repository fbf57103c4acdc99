import bcrypt from 'bcryptjs';
import passportModule from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { User } from '../../db/models';

/** A hash to compare against when the e-mail is unknown, so both paths take the same time. */
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', 10);

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
  passport.serializeUser((user, done) => done(null, (user as User).id));
  passport.deserializeUser(async (id: number, done) => {
    try {
      const user = await User.findByPk(id);
      // A disabled or removed user's existing sessions stop working at once.
      done(null, user && !user.disabled && user.passwordHash ? user : false);
    } catch (err) {
      done(err);
    }
  });
  return passport;
}
