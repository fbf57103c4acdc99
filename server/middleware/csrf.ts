import crypto from 'node:crypto';
import type { Request, RequestHandler } from 'express';
import { AppError } from '../errors/app-error';

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
  }
}

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

/** The session's CSRF token, made on first use. */
export function csrfTokenFor(req: Request): string {
  if (!req.session.csrfToken) req.session.csrfToken = crypto.randomBytes(24).toString('base64url');
  return req.session.csrfToken;
}

/**
 * Synchroniser-token check for every cookie-authenticated write: the token lives in the
 * session and must come back in the X-CSRF-Token header, which another site cannot set.
 */
export const csrfProtection: RequestHandler = (req, _res, next) => {
  if (SAFE.has(req.method)) return next();
  const sent = req.get('x-csrf-token');
  const expected = req.session?.csrfToken;
  if (!sent || !expected || !timingSafeEqual(sent, expected)) {
    return next(
      new AppError('csrf-token-invalid', 'This request is missing its security token. Reload the page and try again.', 403),
    );
  }
  next();
};

function timingSafeEqual(a: string, b: string): boolean {
  const ab = Buffer.from(a);
  const bb = Buffer.from(b);
  return ab.length === bb.length && crypto.timingSafeEqual(ab, bb);
}
