import type { Request, Response, NextFunction } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { PassportInstance } from './passport';
import { acceptInvitationSchema, signInSchema, type SessionView } from '@shared/schemas/auth.schema';
import { ApiRoutes, type RouteSpec } from '../../middleware/access';
import { validateBody } from '../../middleware/validate';
import { AppError } from '../../errors/app-error';
import type { User } from '../../db/models';
import { toUserView } from '../users/users.views';
import { acceptInvitation, getInvitation } from './auth.service';
import type { Config } from '../../config';

function sessionView(req: Request, csrfTokenFor: (req: Request) => string): SessionView {
  const user = req.user as User | undefined;
  return { user: user ? toUserView(user) : null, csrfToken: csrfTokenFor(req) };
}

/** req.login regenerates the session (passport ≥ 0.6), so a fresh CSRF token follows. */
function logIn(req: Request, user: User): Promise<void> {
  return new Promise((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
}

export function authRoutes(registry: RouteSpec[], passport: PassportInstance, config: Config, csrfTokenFor: (req: Request) => string) {
  const routes = new ApiRoutes('/api', registry);

  const signInLimiter = rateLimit({
    windowMs: config.signInRateWindowMs,
    limit: config.signInRateLimit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    // Only failed attempts count, so a busy office behind one address is not locked out.
    skipSuccessfulRequests: true,
    // A forwarded address without TRUST_PROXY is ignored on purpose (see app.ts), not a mistake.
    validate: { xForwardedForHeader: false },
    handler: (_req, _res, next) =>
      next(new AppError('too-many-attempts', 'Too many sign-in attempts from here. Wait a few minutes and try again.', 429)),
  });

  routes.add('get', '/session', 'public', (req, res) => {
    res.json(sessionView(req, csrfTokenFor));
  });

  routes.add('post', '/session', 'public', signInLimiter, validateBody(signInSchema), (req: Request, res: Response, next: NextFunction) => {
    passport.authenticate('local', async (err: unknown, user: User | false, info?: { message?: string }) => {
      try {
        if (err) throw err;
        if (!user) {
          if (info?.message === 'account-disabled') {
            throw new AppError('account-disabled', 'This account has been disabled. Ask your admin if you need access again.', 403);
          }
          throw new AppError('bad-credentials', 'That e-mail and password do not match an account. Check both and try again.', 401);
        }
        await logIn(req, user);
        res.json(sessionView(req, csrfTokenFor));
      } catch (e) {
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
    const user = await acceptInvitation(req.body, config.bcryptRounds);
    await logIn(req, user);
    res.json(sessionView(req, csrfTokenFor));
  });

  return routes.router;
}
