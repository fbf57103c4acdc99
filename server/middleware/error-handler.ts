import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { AppError } from '../errors/app-error';
import type { ApiErrorBody } from '@shared/api/errors';

export function zodFieldMessages(error: ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.join('.') || '(body)';
    fields[key] ??= issue.message;
  }
  return fields;
}

/** A ZodError from request input becomes a 400 naming each field. */
export function validationError(error: ZodError): AppError {
  const fields = zodFieldMessages(error);
  const list = Object.entries(fields)
    .slice(0, 3)
    .map(([field, message]) => `${field}: ${message}`)
    .join('; ');
  return new AppError('validation-failed', `Some fields need attention — ${list}`, 400, fields);
}

export const notFoundHandler: RequestHandler = (req, _res, next) => {
  next(new AppError('route-not-found', `There is no API route ${req.method} ${req.path}. Check the address.`, 404));
};

/** One place that turns every failure into `{ error: { code, message } }`, never a stack trace. */
export function errorHandler(log: (msg: string, err: unknown) => void): ErrorRequestHandler {
  return (err, req, res, _next) => {
    const known = toAppError(err);
    if (!known) log(`Unexpected error on ${req.method} ${req.originalUrl}`, err);
    const appError =
      known ?? new AppError('internal-error', 'Something went wrong on the server. Try again; if it keeps happening, tell your admin.', 500);
    const body: ApiErrorBody = { error: { code: appError.code, message: appError.message } };
    if (appError.fields) body.error.fields = appError.fields;
    if (res.headersSent) return;
    res.status(appError.status).json(body);
  };
}

function toAppError(err: unknown): AppError | null {
  if (err instanceof AppError) return err;
  if (err instanceof ZodError) return validationError(err);
  const e = err as { type?: string; status?: number; code?: string; field?: string; message?: string };
  // body-parser failures
  if (e?.type === 'entity.parse.failed') {
    return new AppError('malformed-json', 'The request body is not valid JSON. Send a JSON object.', 400);
  }
  if (e?.type === 'entity.too.large') {
    return new AppError('body-too-large', 'The request body is too large. Send less data at once.', 413);
  }
  if (e?.type === 'encoding.unsupported' || e?.type === 'charset.unsupported') {
    return new AppError('unsupported-encoding', 'The request body uses an encoding the server does not read. Send UTF-8 JSON.', 415);
  }
  // calc-sheet printing
  if (e && (e as Error).name === 'SheetPrintError') {
    const status = e.code === 'print-timeout' ? 504 : e.code === 'print-queue-full' ? 429 : 503;
    return new AppError(e.code as string, (e as Error).message, status);
  }
  // the file store (local folder or object store)
  if (e && (e as Error).name === 'FileStoreUnavailableError') {
    return new AppError(
      'file-store-unavailable',
      `${(e as Error).message.replace(/\.$/, '')}, so nothing was read or stored; try again in a minute, and tell your admin if it keeps happening.`,
      503,
    );
  }
  if (e && (e as Error).name === 'StoredFileMissingError') {
    return new AppError('stored-file-missing', 'A stored file this request needs is missing; ask your admin to restore it from backup.', 409);
  }
  // multer failures
  if (e?.code === 'LIMIT_FILE_SIZE') {
    return new AppError('file-too-large', 'The file is larger than the upload limit. Send a smaller file or ask your admin to raise MAX_UPLOAD_MB.', 413);
  }
  if (typeof e?.code === 'string' && e.code.startsWith('LIMIT_')) {
    return new AppError('upload-refused', `The upload was refused (${e.message ?? e.code}). Send one file in the field named "file".`, 400);
  }
  return null;
}
