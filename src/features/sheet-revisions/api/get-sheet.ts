import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SheetRevisionView } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function getSheet(sheetId: number): Promise<SheetRevisionView> {
  return api.get<SheetRevisionView>(`/api/sheets/${sheetId}`);
}

export function getSheetQueryOptions(sheetId: number) {
  return queryOptions({ queryKey: ['sheets', sheetId], queryFn: () => getSheet(sheetId) });
}

/** One revision with its audit log and every comment thread up to it. */
export function useSheet(sheetId: number) {
  return useQuery(getSheetQueryOptions(sheetId));
}

/** Where the revision's calc sheet is served as HTML (the same document as its PDF). */
export function sheetPreviewUrl(sheetId: number): string {
  return `/api/sheets/${sheetId}/preview`;
}

