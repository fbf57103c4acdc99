import type { ApiErrorBody } from '@shared/api/errors';

/**
 * An error the API answered with (or a failure to reach it at all: status 0).
 * `message` is written for a person; `fields` maps form fields to their problem.
 */
export class ApiError extends Error {
  override readonly name = 'ApiError';

  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields: Record<string, string> = {},
  ) {
    super(message);
  }
}

type Query = Record<string, string | number | boolean | undefined>;

interface RequestOptions {
  query?: Query;
  body?: unknown;
  signal?: AbortSignal;
}

// The CSRF token lives here and only here. Session responses (read, sign-in,
// accepting an invitation) hand over a fresh one through setCsrfToken.
let csrfToken: string | null = null;

/** Records the token that every later write sends as X-CSRF-Token. */
export function setCsrfToken(token: string | null): void {
  csrfToken = token;
}

export function getCsrfToken(): string | null {
  return csrfToken;
}

const SAFE_METHODS = new Set(['GET', 'HEAD']);

function buildUrl(path: string, query?: Query): string {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value !== undefined) params.set(key, String(value));
  }
  const text = params.toString();
  return text ? `${path}?${text}` : path;
}

function isErrorBody(value: unknown): value is ApiErrorBody {
  if (typeof value !== 'object' || value === null || !('error' in value)) return false;
  const error = (value as { error: unknown }).error;
  return (
    typeof error === 'object' &&
    error !== null &&
    typeof (error as { code?: unknown }).code === 'string' &&
    typeof (error as { message?: unknown }).message === 'string'
  );
}

async function readJson(response: Response): Promise<unknown> {
  const text = await response.text();
  if (!text) return undefined;
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

/** Turns a failed response into an ApiError, whatever its body looks like. */
export async function toApiError(response: Response): Promise<ApiError> {
  const body = await readJson(response);
  if (isErrorBody(body)) {
    return new ApiError(response.status, body.error.code, body.error.message, body.error.fields ?? {});
  }
  return new ApiError(
    response.status,
    'unexpected-response',
    `The server answered with status ${response.status} and no explanation. Try again in a moment; if it keeps happening, tell your admin.`,
  );
}

async function send(method: string, path: string, options: RequestOptions): Promise<Response> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (options.body !== undefined) headers['Content-Type'] = 'application/json';
  if (!SAFE_METHODS.has(method) && csrfToken) headers['X-CSRF-Token'] = csrfToken;
  try {
    return await fetch(buildUrl(path, options.query), {
      method,
      headers,
      credentials: 'same-origin',
      body: options.body === undefined ? undefined : JSON.stringify(options.body),
      signal: options.signal,
    });
  } catch (error) {
    if (error instanceof DOMException && error.name === 'AbortError') throw error;
    throw new ApiError(
      0,
      'network-error',
      'Could not reach the Panelpoint server. Check your connection and try again.',
    );
  }
}

// A write needs a token; if the page has not read the session yet, read it now.
async function ensureCsrfToken(): Promise<void> {
  if (csrfToken) return;
  const response = await send('GET', '/api/session', {});
  if (!response.ok) throw await toApiError(response);
  const session = (await readJson(response)) as { csrfToken?: unknown } | undefined;
  if (typeof session?.csrfToken === 'string') csrfToken = session.csrfToken;
}

async function request<T>(method: string, path: string, options: RequestOptions = {}): Promise<T> {
  const isWrite = !SAFE_METHODS.has(method);
  if (isWrite) await ensureCsrfToken();
  let response = await send(method, path, options);

  // A token that went stale (e.g. the server restarted) is refreshed once.
  if (isWrite && response.status === 403) {
    const error = await toApiError(response.clone());
    if (error.code.includes('csrf')) {
      csrfToken = null;
      await ensureCsrfToken();
      response = await send(method, path, options);
    }
  }

  if (!response.ok) throw await toApiError(response);
  if (response.status === 204) return undefined as T;
  return (await readJson(response)) as T;
}

/** The one way the client talks to the API: JSON in, JSON out, same-origin cookies. */
export const api = {
  get: <T>(path: string, options?: Omit<RequestOptions, 'body'>) => request<T>('GET', path, options),
  post: <T>(path: string, body?: unknown) => request<T>('POST', path, { body }),
  put: <T>(path: string, body?: unknown) => request<T>('PUT', path, { body }),
  patch: <T>(path: string, body?: unknown) => request<T>('PATCH', path, { body }),
  delete: <T = void>(path: string) => request<T>('DELETE', path),
};

/** A message fit to show a person, whatever was thrown. */
export function errorMessage(error: unknown): string {
  if (error instanceof ApiError) return error.message;
  return 'Something went wrong in the page. Reload it and try again; if it keeps happening, tell your admin.';
}
