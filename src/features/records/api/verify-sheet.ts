import { useMutation } from '@tanstack/react-query';
import type { SheetVerifyView } from '@shared/schemas/review.schema';
import { ApiError, getCsrfToken, setCsrfToken, toApiError } from '@/lib/api-client';

async function csrfToken(): Promise<string | null> {
  const token = getCsrfToken();
  if (token) return token;
  const response = await fetch('/api/session', { credentials: 'same-origin', headers: { Accept: 'application/json' } });
  if (!response.ok) throw await toApiError(response);
  const session = (await response.json()) as { csrfToken?: string };
  setCsrfToken(session.csrfToken ?? null);
  return session.csrfToken ?? null;
}

/**
 * Sends a PDF to be matched against the archive by its SHA-256. The file is a multipart upload
 * (field "file"), which the JSON client does not carry; errors come back as the same ApiError.
 */
export async function verifySheet(file: File): Promise<SheetVerifyView> {
  const body = new FormData();
  body.append('file', file);
  const token = await csrfToken();
  let response: Response;
  try {
    response = await fetch('/api/archive/verify', {
      method: 'POST',
      credentials: 'same-origin',
      headers: { Accept: 'application/json', ...(token ? { 'X-CSRF-Token': token } : {}) },
      body,
    });
  } catch {
    throw new ApiError(0, 'network-error', 'Could not reach the Panelpoint server. Check your connection and try again.');
  }
  if (!response.ok) throw await toApiError(response);
  return (await response.json()) as SheetVerifyView;
}

export function useVerifySheet() {
  return useMutation({ mutationFn: verifySheet, meta: { errorsShownInline: true } });
}
