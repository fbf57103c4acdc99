import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ProjectView } from '@shared/schemas/project.schema';
import { api } from '@/lib/api-client';

export function getProject(projectId: number): Promise<ProjectView> {
  return api.get<ProjectView>(`/api/projects/${projectId}`);
}

export function getProjectQueryOptions(projectId: number) {
  return queryOptions({ queryKey: ['projects', projectId], queryFn: () => getProject(projectId) });
}

export function useProject(projectId: number, { enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...getProjectQueryOptions(projectId), enabled });
}
