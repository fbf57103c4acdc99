import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TrussInput, TrussView } from '@shared/schemas/project.schema';
import { api } from '@/lib/api-client';

export function createTruss({ projectId, input }: { projectId: number; input: TrussInput }): Promise<TrussView> {
  return api.post<TrussView>(`/api/projects/${projectId}/trusses`, input);
}

export function useCreateTruss() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createTruss,
    meta: { errorsShownInline: true },
    onSuccess: (truss) => {
      queryClient.setQueryData(['trusses', truss.id], truss);
      // The project's truss list and every project row's truss count.
      return queryClient.invalidateQueries({ queryKey: ['projects'] });
    },
  });
}
