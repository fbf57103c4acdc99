import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ProjectInput, ProjectView } from '@shared/schemas/project.schema';
import { api } from '@/lib/api-client';

export function createProject(input: ProjectInput): Promise<ProjectView> {
  return api.post<ProjectView>('/api/projects', input);
}

export function useCreateProject() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createProject,
    meta: { errorsShownInline: true },
    onSuccess: (project) => {
      queryClient.setQueryData(['projects', project.id], project);
      return queryClient.invalidateQueries({ queryKey: ['projects', 'list'] });
    },
  });
}
