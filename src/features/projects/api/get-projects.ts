import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ProjectView } from '@shared/schemas/project.schema';
import { api } from '@/lib/api-client';

export function getProjects({ includeArchived }: { includeArchived: boolean }): Promise<ProjectView[]> {
  return api.get<ProjectView[]>('/api/projects', { query: { archived: includeArchived ? 'include' : undefined } });
}

export function getProjectsQueryOptions({ includeArchived }: { includeArchived: boolean }) {
  return queryOptions({
    queryKey: ['projects', 'list', { includeArchived }],
    queryFn: () => getProjects({ includeArchived }),
  });
}

export function useProjects({ includeArchived }: { includeArchived: boolean }) {
  return useQuery({ ...getProjectsQueryOptions({ includeArchived }), placeholderData: (previous) => previous });
}
