import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SheetRevisionSummaryView } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function getTrussSheets(trussId: number): Promise<SheetRevisionSummaryView[]> {
  return api.get<SheetRevisionSummaryView[]>(`/api/trusses/${trussId}/sheets`);
}

export function getTrussSheetsQueryOptions(trussId: number) {
  return queryOptions({ queryKey: ['trusses', trussId, 'sheets'], queryFn: () => getTrussSheets(trussId) });
}

/** The truss's calc-sheet revisions, newest first. */
export function useTrussSheets(trussId: number) {
  return useQuery(getTrussSheetsQueryOptions(trussId));
}
