import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TrussView } from '@shared/schemas/project.schema';
import { api } from '@/lib/api-client';

export function getTrusses(projectId: number): Promise<TrussView[]> {
  return api.get<TrussView[]>(`/api/projects/${projectId}/trusses`);
}

export function getTrussesQueryOptions(projectId: number) {
  return queryOptions({ queryKey: ['projects', projectId, 'trusses'], queryFn: () => getTrusses(projectId) });
}

export function useTrusses(projectId: number) {
  return useQuery(getTrussesQueryOptions(projectId));
}
