import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TrussView } from '@shared/schemas/project.schema';
import { api } from '@/lib/api-client';

export function getTruss(trussId: number): Promise<TrussView> {
  return api.get<TrussView>(`/api/trusses/${trussId}`);
}

export function getTrussQueryOptions(trussId: number) {
  return queryOptions({ queryKey: ['trusses', trussId], queryFn: () => getTruss(trussId) });
}

export function useTruss(trussId: number) {
  return useQuery(getTrussQueryOptions(trussId));
}
