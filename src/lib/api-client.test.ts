// @vitest-environment jsdom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { api, ApiError, setCsrfToken } from './api-client';

// The error body shape checked here is the API contract in shared/api/errors.ts.

function jsonResponse(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}

const fetchMock = vi.fn<typeof fetch>();

beforeEach(() => {
  fetchMock.mockReset();
  vi.stubGlobal('fetch', fetchMock);
  setCsrfToken(null);
});

afterEach(() => {
  vi.unstubAllGlobals();
});

async function caught(promise: Promise<unknown>): Promise<ApiError> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof ApiError) return error;
    throw error;
  }
  throw new Error('expected the request to fail');
}

describe('api client', () => {
  it('when the API answers 422 with field errors, then an ApiError carries status, code, message and fields', async () => {
    setCsrfToken('token-1');
    fetchMock.mockResolvedValueOnce(
      jsonResponse(422, {
        error: { code: 'validation-failed', message: 'Some fields need attention.', fields: { jobNumber: 'Enter the job number.' } },
      }),
    );

    const error = await caught(api.post('/api/projects', { name: 'Depot roof' }));

    expect(error.status).toBe(422);
    expect(error.code).toBe('validation-failed');
    expect(error.message).toBe('Some fields need attention.');
    expect(error.fields).toEqual({ jobNumber: 'Enter the job number.' });
  });

  it('when the body is not the error shape (a proxy page), then the code is unexpected-response and the message names the status', async () => {
    fetchMock.mockResolvedValueOnce(new Response('<html>Bad gateway</html>', { status: 502 }));

    const error = await caught(api.get('/api/projects'));

    expect(error.status).toBe(502);
    expect(error.code).toBe('unexpected-response');
    expect(error.message).toContain('502');
    expect(error.fields).toEqual({});
  });

  it('when the network fails, then an ApiError with status 0 and code network-error is thrown', async () => {
    fetchMock.mockRejectedValueOnce(new TypeError('Failed to fetch'));

    const error = await caught(api.get('/api/projects'));

    expect(error.status).toBe(0);
    expect(error.code).toBe('network-error');
  });

  it('when no token is known before a write, then the session is read first and its token is sent as X-CSRF-Token', async () => {
    fetchMock
      .mockResolvedValueOnce(jsonResponse(200, { user: null, csrfToken: 'from-session' }))
      .mockResolvedValueOnce(jsonResponse(201, { id: 7 }));

    const created = await api.post<{ id: number }>('/api/projects', { name: 'Hall' });

    expect(created).toEqual({ id: 7 });
    expect(fetchMock).toHaveBeenCalledTimes(2);
    expect(fetchMock.mock.calls[0][0]).toBe('/api/session');
    const [url, init] = fetchMock.mock.calls[1];
    expect(url).toBe('/api/projects');
    expect(init?.method).toBe('POST');
    expect(init?.credentials).toBe('same-origin');
    expect((init?.headers as Record<string, string>)['X-CSRF-Token']).toBe('from-session');
    expect(init?.body).toBe(JSON.stringify({ name: 'Hall' }));
  });

  it('when reading, then no CSRF header is sent and query values are put in the URL', async () => {
    setCsrfToken('token-2');
    fetchMock.mockResolvedValueOnce(jsonResponse(200, []));

    await api.get('/api/projects', { query: { archived: 'include', skip: undefined } });

    const [url, init] = fetchMock.mock.calls[0];
    expect(url).toBe('/api/projects?archived=include');
    expect((init?.headers as Record<string, string>)['X-CSRF-Token']).toBeUndefined();
  });

  it('when a write answers 204, then the call resolves to undefined', async () => {
    setCsrfToken('token-3');
    fetchMock.mockResolvedValueOnce(new Response(null, { status: 204 }));

    await expect(api.delete('/api/session')).resolves.toBeUndefined();
  });
});
