import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ProjectUpdate, ProjectView } from '@shared/schemas/project.schema';
import { api } from '@/lib/api-client';

export function updateProject({ projectId, changes }: { projectId: number; changes: ProjectUpdate }): Promise<ProjectView> {
  return api.patch<ProjectView>(`/api/projects/${projectId}`, changes);
}

/** Pass errorsShownInline when a form shows the errors beside its fields. */
export function useUpdateProject({ errorsShownInline = false }: { errorsShownInline?: boolean } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateProject,
    meta: { errorsShownInline },
    onSuccess: (project) => {
      queryClient.setQueryData(['projects', project.id], project);
      return queryClient.invalidateQueries({ queryKey: ['projects', 'list'] });
    },
  });
}
