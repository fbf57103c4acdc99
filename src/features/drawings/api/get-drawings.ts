import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DrawingSummaryView } from '@shared/schemas/drawing.schema';
import { api } from '@/lib/api-client';

/** Every drawing version of a truss, newest first. */
export function getDrawings(trussId: number): Promise<DrawingSummaryView[]> {
  return api.get<DrawingSummaryView[]>(`/api/trusses/${trussId}/drawings`);
}

export function getDrawingsQueryOptions(trussId: number) {
  return queryOptions({ queryKey: ['trusses', trussId, 'drawings'], queryFn: () => getDrawings(trussId) });
}

export function useDrawings(trussId: number) {
  return useQuery(getDrawingsQueryOptions(trussId));
}
