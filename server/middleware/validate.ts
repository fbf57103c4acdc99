import type { RequestHandler } from 'express';
import type { ZodType } from 'zod';
import { validationError } from './error-handler';
import { notFound } from '../errors/app-error';

/** Parses the JSON body with a shared zod schema; the handler then sees the parsed value. */
export function validateBody(schema: ZodType): RequestHandler {
  return (req, _res, next) => {
    if (req.body === undefined || req.body === null || typeof req.body !== 'object' || Array.isArray(req.body)) {
      req.body = req.body ?? {};
    }
    const parsed = schema.safeParse(req.body);
    if (!parsed.success) return next(validationError(parsed.error));
    req.body = parsed.data;
    next();
  };
}

/** Parses a numeric id from the path; anything else is a 404 without touching the database. */
export function idParam(value: unknown, what: string): number {
  const id = Number(value);
  if (!Number.isSafeInteger(id) || id <= 0) throw notFound(what);
  return id;
}
