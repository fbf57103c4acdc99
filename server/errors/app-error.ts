/**
 * An error meant for the person using the API: a stable code, a sentence that says what is
 * wrong and what to do, and the HTTP status. Anything else reaching the error handler is a
 * defect and is answered with a generic 500.
 */
export class AppError extends Error {
  constructor(
    readonly code: string,
    message: string,
    readonly status: number,
    readonly fields?: Record<string, string>,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const notFound = (what: string) =>
  new AppError('not-found', `${what} was not found. Check the link, or ask whoever sent it.`, 404);

export const conflict = (code: string, message: string) => new AppError(code, message, 409);
