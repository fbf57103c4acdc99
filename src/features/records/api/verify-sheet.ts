import { useMutation } from '@tanstack/react-query';
import type { PublicVerifyView, SheetVerifyView } from '@shared/schemas/review.schema';
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
export function verifySheet(file: File): Promise<SheetVerifyView> {
  return uploadPdf<SheetVerifyView>('/api/archive/verify', file);
}

/** The same check on the public verify page, for someone not signed in (a visitor's CSRF token). */
export function verifySheetPublic(file: File): Promise<PublicVerifyView> {
  return uploadPdf<PublicVerifyView>('/api/public/verify', file);
}

async function uploadPdf<T>(url: string, file: File): Promise<T> {
  const body = new FormData();
  body.append('file', file);
  const token = await csrfToken();
  let response: Response;
  try {
    response = await fetch(url, {
      method: 'POST',
      credentials: 'same-origin',
      headers: { Accept: 'application/json', ...(token ? { 'X-CSRF-Token': token } : {}) },
      body,
    });
  } catch {
    throw new ApiError(0, 'network-error', 'Could not reach the Panelpoint server. Check your connection and try again.');
  }
  if (!response.ok) throw await toApiError(response);
  return (await response.json()) as T;
}

export function useVerifySheet() {
  return useMutation({ mutationFn: verifySheet, meta: { errorsShownInline: true } });
}

export function useVerifySheetPublic() {
  return useMutation({ mutationFn: verifySheetPublic, meta: { errorsShownInline: true } });
}
