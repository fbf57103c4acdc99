import crypto from 'node:crypto';
import type { Request, RequestHandler } from 'express';
import { AppError } from '../errors/app-error';

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
  }
}

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);
/** A random value for a visitor not signed in; their token is derived from it, so no session row is stored. */
const VISITOR_COOKIE = 'panelpoint.visitor';

const signedIn = (req: Request) => Boolean((req.session as { passport?: { user?: unknown } } | undefined)?.passport?.user);

function visitorToken(secret: string, nonce: string): string {
  return crypto.createHmac('sha256', secret).update(`csrf:${nonce}`).digest('base64url');
}

function cookieValue(req: Request, name: string): string | undefined {
  const header = req.headers.cookie;
  if (!header) return undefined;
  for (const part of header.split(';')) {
    const eq = part.indexOf('=');
    if (eq > 0 && part.slice(0, eq).trim() === name) return decodeURIComponent(part.slice(eq + 1).trim());
  }
  return undefined;
}

/**
 * Synchroniser-token CSRF protection for every cookie-authenticated write; the token must come
 * back in the X-CSRF-Token header, which another site cannot set. A signed-in session keeps its
 * token in the session. A visitor who is not signed in (the sign-in and invitation pages) gets
 * a token derived by HMAC from a random cookie of their own instead, so looking at the sign-in
 * page stores no session row.
 *
 * Nothing here lives in one process's memory: a signed-in token is in the session row (the
 * database), a visitor's is derived from their cookie and `secret`, which is the session
 * secret every process behind one address shares (SESSION_SECRET or DATA_DIR/session-secret,
 * bootstrap.ts), so a token handed out by one process is accepted by another
 * (tests/api/two-apps.test.ts).
 */
export function createCsrf(secret: string, secureCookie: boolean) {
  const tokenFor = (req: Request): string => {
    if (req.session && (signedIn(req) || req.session.csrfToken)) {
      if (!req.session.csrfToken) req.session.csrfToken = crypto.randomBytes(24).toString('base64url');
      return req.session.csrfToken;
    }
    let nonce = cookieValue(req, VISITOR_COOKIE);
    if (!nonce || !/^[\w-]{16,64}$/.test(nonce)) {
      nonce = crypto.randomBytes(24).toString('base64url');
      req.res?.cookie(VISITOR_COOKIE, nonce, { httpOnly: true, sameSite: 'lax', secure: secureCookie, path: '/api' });
    }
    return visitorToken(secret, nonce);
  };

  const protection: RequestHandler = (req, _res, next) => {
    if (SAFE.has(req.method)) return next();
    const sent = req.get('x-csrf-token');
    let expected = req.session?.csrfToken;
    if (!expected) {
      const nonce = cookieValue(req, VISITOR_COOKIE);
      if (nonce) expected = visitorToken(secret, nonce);
    }
    if (!sent || !expected || !timingSafeEqual(sent, expected)) {
      return next(
        new AppError('csrf-token-invalid', 'This request is missing its security token. Reload the page and try again.', 403),
      );
    }
    next();
  };

  return { tokenFor, protection };
}

function timingSafeEqual(a: string, b: string): boolean {
  const ab = Buffer.from(a);
  const bb = Buffer.from(b);
  return ab.length === bb.length && crypto.timingSafeEqual(ab, bb);
}
