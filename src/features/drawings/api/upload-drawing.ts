import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DrawingView } from '@shared/schemas/drawing.schema';
import type { DxfImportOptions } from '@shared/dxf-import';
import { api, ApiError, getCsrfToken, setCsrfToken, toApiError } from '@/lib/api-client';

export interface UploadDrawingInput {
  trussId: number;
  file: File;
  options?: DxfImportOptions;
  /** Called as bytes leave: fraction sent, 0 … 1. */
  onProgress?: (fraction: number) => void;
  signal?: AbortSignal;
}

/** The multipart body the upload route reads: the file plus the options as text fields. */
export function uploadFormData(file: File, options: DxfImportOptions = {}): FormData {
  const form = new FormData();
  if (options.layers) form.append('layers', JSON.stringify(options.layers));
  if (options.units) form.append('units', options.units);
  if (options.tolerance !== undefined) form.append('tolerance', String(options.tolerance));
  // The file goes last so the fields are read before the bytes arrive.
  form.append('file', file, file.name);
  return form;
}

interface XhrAnswer {
  status: number;
  text: string;
}

// XMLHttpRequest rather than fetch: only it reports upload progress.
function sendForm(url: string, form: FormData, csrf: string | null, onProgress?: (f: number) => void, signal?: AbortSignal): Promise<XhrAnswer> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', url);
    xhr.withCredentials = true;
    xhr.setRequestHeader('Accept', 'application/json');
    if (csrf) xhr.setRequestHeader('X-CSRF-Token', csrf);
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable && event.total > 0) onProgress?.(event.loaded / event.total);
    };
    xhr.onload = () => resolve({ status: xhr.status, text: xhr.responseText });
    xhr.onerror = () =>
      reject(new ApiError(0, 'network-error', 'The upload did not reach the Panelpoint server. Check your connection and try again.'));
    xhr.onabort = () => reject(new DOMException('The upload was cancelled.', 'AbortError'));
    signal?.addEventListener('abort', () => xhr.abort(), { once: true });
    xhr.send(form);
  });
}

/** Reads an answer the upload route gave: the new version, or the API's one-sentence error. */
export async function readUploadAnswer(answer: XhrAnswer): Promise<DrawingView> {
  if (answer.status >= 200 && answer.status < 300) return JSON.parse(answer.text) as DrawingView;
  if (answer.status === 413 && !answer.text.trim().startsWith('{')) {
    // A proxy in front of the server may refuse a large body before the API can explain.
    throw new ApiError(413, 'file-too-large', 'The file is larger than the server accepts. Purge unused blocks and layers from the drawing and upload it again.');
  }
  throw await toApiError(new Response(answer.text, { status: answer.status }));
}

/**
 * Sends a DXF as the truss's next drawing version. Resolves with the new version (also when
 * its import failed and it waits for options); rejects with an ApiError when the file was
 * refused and nothing was stored.
 */
export async function uploadDrawing({ trussId, file, options, onProgress, signal }: UploadDrawingInput): Promise<DrawingView> {
  const url = `/api/trusses/${trussId}/drawings`;
  if (!getCsrfToken()) await refreshCsrfToken();
  let answer = await sendForm(url, uploadFormData(file, options), getCsrfToken(), onProgress, signal);
  if (answer.status === 403 && answer.text.includes('csrf')) {
    // The token went stale (the server restarted): fetch a fresh one and send once more.
    await refreshCsrfToken();
    answer = await sendForm(url, uploadFormData(file, options), getCsrfToken(), onProgress, signal);
  }
  return readUploadAnswer(answer);
}

async function refreshCsrfToken(): Promise<void> {
  const session = await api.get<{ csrfToken?: string }>('/api/session');
  if (typeof session?.csrfToken === 'string') setCsrfToken(session.csrfToken);
}

export function useUploadDrawing() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: uploadDrawing,
    meta: { errorsShownInline: true },
    onSuccess: (drawing) => {
      queryClient.setQueryData(['drawings', drawing.id], drawing);
      // A drafter's My work lists drawings whose newest version failed or has warnings.
      void queryClient.invalidateQueries({ queryKey: ['me', 'work'] });
      return queryClient.invalidateQueries({
        predicate: (q) => q.queryKey[0] === 'trusses' && q.queryKey[1] === drawing.trussId && q.queryKey.length > 2,
      });
    },
  });
}
