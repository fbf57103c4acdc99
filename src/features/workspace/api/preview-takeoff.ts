import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { TakeoffInput, TakeoffPreviewView } from '@shared/schemas/run.schema';
import { api } from '@/lib/api-client';

export function previewTakeoff(trussId: number, input: TakeoffInput): Promise<TakeoffPreviewView> {
  return api.post<TakeoffPreviewView>(`/api/trusses/${trussId}/takeoff/preview`, input);
}

// The preview writes nothing, so it is read like a query keyed by its whole input.
export function getTakeoffPreviewQueryOptions(trussId: number, input: TakeoffInput) {
  return queryOptions({
    queryKey: ['trusses', trussId, 'takeoff-preview', input],
    queryFn: () => previewTakeoff(trussId, input),
    staleTime: Infinity,
    retry: false,
  });
}

/** The server's takeoff for an input that passed the form's checks; null input: nothing to ask. */
export function useTakeoffPreview(trussId: number, input: TakeoffInput | null) {
  return useQuery({
    ...getTakeoffPreviewQueryOptions(trussId, input ?? ({} as TakeoffInput)),
    enabled: input !== null,
    placeholderData: keepPreviousData,
  });
}
