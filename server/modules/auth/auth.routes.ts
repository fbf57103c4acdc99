import type { Request, Response, NextFunction } from 'express';
import type { PassportInstance } from './passport';
import {
  acceptInvitationSchema,
  changePasswordSchema,
  completePasswordResetSchema,
  requestPasswordResetSchema,
  signInSchema,
  type PasswordResetRequested,
  type SessionView,
} from '@shared/schemas/auth.schema';
import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { validateBody } from '../../middleware/validate';
import { AppError } from '../../errors/app-error';
import type { User } from '../../db/models';
import { toUserView } from '../users/users.views';
import { acceptInvitation, getInvitation } from './auth.service';
import type { Config } from '../../config';
import { refusalMessage, type SignInLimiter } from './signin-limiter';
import type { Mailer } from '../../mail/mailer';
import { getFirm } from '../firm/firm.service';
import { changePassword, completePasswordReset, getPasswordReset, requestPasswordReset, RESET_REQUESTED_MESSAGE } from './passwords.service';

function sessionView(req: Request, csrfTokenFor: (req: Request) => string): SessionView {
  const user = req.user as User | undefined;
  return { user: user ? toUserView(user) : null, csrfToken: csrfTokenFor(req) };
}

/** req.login regenerates the session (passport ≥ 0.6), so a fresh CSRF token follows. */
function logIn(req: Request, user: User): Promise<void> {
  return new Promise((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
}

export interface AuthRoutesDeps {
  mailer: Mailer;
  publicUrl: () => string;
  log: (msg: string, err?: unknown) => void;
}

export function authRoutes(
  registry: RouteSpec[],
  passport: PassportInstance,
  config: Config,
  csrfTokenFor: (req: Request) => string,
  limiter: SignInLimiter,
  deps: AuthRoutesDeps,
) {
  const routes = new ApiRoutes('/api', registry);

  routes.add('get', '/session', 'public', (req, res) => {
    res.json(sessionView(req, csrfTokenFor));
  });

  // Failed sign-ins are counted per account and per address in the database (signin-limiter.ts).
  // req.ip is the socket's address unless TRUST_PROXY names a proxy (app.ts), so a made-up
  // X-Forwarded-For buys no fresh attempts.
  routes.add('post', '/session', 'public', validateBody(signInSchema), async (req: Request, res: Response, next: NextFunction) => {
    const attempt = await limiter.begin(req.body.email, req.ip);
    if (attempt.refused) {
      res.set('Retry-After', String(attempt.retryAfterSeconds));
      throw new AppError('too-many-attempts', refusalMessage(attempt), 429);
    }
    passport.authenticate('local', async (err: unknown, user: User | false, info?: { message?: string }) => {
      try {
        if (err) throw err;
        if (!user) {
          if (info?.message === 'account-disabled') {
            await attempt.release();
            throw new AppError('account-disabled', 'This account has been disabled. Ask your admin if you need access again.', 403);
          }
          await attempt.failed();
          throw new AppError('bad-credentials', 'That e-mail and password do not match an account. Check both and try again.', 401);
        }
        await logIn(req, user);
        await attempt.succeeded();
        res.json(sessionView(req, csrfTokenFor));
      } catch (e) {
        await attempt.release().catch(() => {});
        next(e);
      }
    })(req, res, next);
  });

  routes.add('delete', '/session', 'public', (req, res, next) => {
    req.logout((err) => {
      if (err) return next(err);
      req.session.destroy((destroyErr) => {
        if (destroyErr) return next(destroyErr);
        res.clearCookie('panelpoint.sid');
        res.status(204).end();
      });
    });
  });

  routes.add('get', '/invitations/:token', 'public', async (req, res) => {
    res.json(await getInvitation(String(req.params.token)));
  });

  routes.add('post', '/invitations/accept', 'public', validateBody(acceptInvitationSchema), async (req, res) => {
    const user = await acceptInvitation(req.body, config.bcryptRounds, (await getFirm()).name);
    await logIn(req, user);
    res.json(sessionView(req, csrfTokenFor));
  });

  // Changing one's own password signs out every other session of the user; this tab is
  // signed in again into a fresh session, so the answer carries a new CSRF token.
  routes.add('post', '/account/password', ANY_ROLE, validateBody(changePasswordSchema), async (req, res) => {
    const user = await changePassword((req.user as User).id, req.body, config.bcryptRounds, (await getFirm()).name);
    await logIn(req, user);
    res.json(sessionView(req, csrfTokenFor));
  });

  // "Forgot password": the same answer, at once, whether or not the address has an account;
  // the lookup and the e-mail run after the answer so its timing tells nothing either.
  routes.add('post', '/password-resets', 'public', validateBody(requestPasswordResetSchema), async (req, res) => {
    const email = (req.body as { email: string }).email;
    const firmName = (await getFirm()).name;
    requestPasswordReset(email, { mailer: deps.mailer, publicUrl: deps.publicUrl(), firmName }).catch((err) =>
      deps.log('Sending a password-reset e-mail failed', err),
    );
    res.status(202).json({ message: RESET_REQUESTED_MESSAGE } satisfies PasswordResetRequested);
  });

  routes.add('get', '/password-resets/:token', 'public', async (req, res) => {
    res.json(await getPasswordReset(String(req.params.token)));
  });

  // Choosing the new password from the link signs the person in (every older session of theirs
  // is signed out), as accepting an invitation does.
  routes.add('post', '/password-resets/complete', 'public', validateBody(completePasswordResetSchema), async (req, res) => {
    const user = await completePasswordReset(req.body, config.bcryptRounds, (await getFirm()).name);
    await logIn(req, user);
    res.json(sessionView(req, csrfTokenFor));
  });

  return routes.router;
}
