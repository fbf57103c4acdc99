import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RevisionCompareView } from '@shared/schemas/revision-compare.schema';
import { api } from '@/lib/api-client';

export function getSheetCompare(sheetId: number, withId?: number): Promise<RevisionCompareView> {
  return api.get<RevisionCompareView>(`/api/sheets/${sheetId}/compare${withId !== undefined ? `?with=${withId}` : ''}`);
}

export function getSheetCompareQueryOptions(sheetId: number, withId?: number) {
  // The runs behind revisions are frozen, so a comparison never goes stale.
  return queryOptions({ queryKey: ['sheets', sheetId, 'compare', withId ?? 'previous'], queryFn: () => getSheetCompare(sheetId, withId), staleTime: Infinity });
}

/** What changed since the revision before (or since `withId`); off for a first revision. */
export function useSheetCompare(sheetId: number, options: { enabled: boolean; withId?: number }) {
  return useQuery({ ...getSheetCompareQueryOptions(sheetId, options.withId), enabled: options.enabled });
}
