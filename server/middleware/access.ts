import { Router, type RequestHandler } from 'express';
import type { Role } from '@shared/schemas/auth.schema';
import { AppError } from '../errors/app-error';
import type { User } from '../db/models';

/** Who may call a route: anyone, anyone signed in, or the listed roles. */
export type Access = 'public' | 'signed-in' | readonly Role[];
export type HttpMethod = 'get' | 'post' | 'put' | 'patch' | 'delete';

export interface RouteSpec {
  method: HttpMethod;
  path: string;
  access: Access;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport puts our model instance here
    interface User {
      id: number;
      role: Role;
      name: string;
      email: string;
    }
  }
}

export function requireAccess(access: Access): RequestHandler {
  return (req, _res, next) => {
    if (access === 'public') return next();
    const user = req.user as User | undefined;
    if (!user) return next(new AppError('not-signed-in', 'Sign in to do this.', 401));
    if (access === 'signed-in' || access.includes(user.role)) return next();
    next(
      new AppError(
        'forbidden',
        `Your role (${user.role}) cannot do this; it takes ${access.join(' or ')}. Ask an admin if you need it.`,
        403,
      ),
    );
  };
}

/**
 * A router that states who may call each route and records it, so the role-matrix test can
 * check every route the app has.
 */
export class ApiRoutes {
  readonly router = Router();
  constructor(
    private readonly prefix: string,
    private readonly registry: RouteSpec[],
  ) {}

  add(method: HttpMethod, path: string, access: Access, ...handlers: RequestHandler[]): this {
    this.registry.push({ method, path: `${this.prefix}${path}`, access });
    this.router[method](path, requireAccess(access), ...handlers);
    return this;
  }
}

/** Reads and writes that every role in the firm may do. */
export const ANY_ROLE: readonly Role[] = ['drafter', 'engineer', 'reviewer', 'admin'];
