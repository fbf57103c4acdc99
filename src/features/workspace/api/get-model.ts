import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import { api } from '@/lib/api-client';

export function getTrussModel(trussId: number): Promise<TrussModelView> {
  return api.get<TrussModelView>(`/api/trusses/${trussId}/model`);
}

export function getTrussModelQueryOptions(trussId: number) {
  return queryOptions({ queryKey: ['trusses', trussId, 'model'], queryFn: () => getTrussModel(trussId) });
}

/** The engineer's working model: geometry from the drawing, supports, loads and properties. */
export function useTrussModel(trussId: number) {
  return useQuery(getTrussModelQueryOptions(trussId));
}
