import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PublicSheetView } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function getPublicSheet(sheetId: number): Promise<PublicSheetView> {
  return api.get<PublicSheetView>(`/api/public/verify/${sheetId}`);
}

export function getPublicSheetQueryOptions(sheetId: number) {
  return queryOptions({ queryKey: ['public-sheet', sheetId], queryFn: () => getPublicSheet(sheetId), retry: false });
}

/** What an issued sheet prints about itself, for anyone holding it (no sign-in). */
export function usePublicSheet(sheetId: number) {
  return useQuery({ ...getPublicSheetQueryOptions(sheetId), enabled: Number.isSafeInteger(sheetId) && sheetId > 0 });
}
