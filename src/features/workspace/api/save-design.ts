import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { DesignSaveInput } from '@shared/schemas/model.schema';
import { api } from '@/lib/api-client';
import { getTrussModelQueryOptions } from './get-model';

export function saveDesign({ trussId, input }: { trussId: number; input: DesignSaveInput }): Promise<TrussModelView> {
  return api.put<TrussModelView>(`/api/trusses/${trussId}/design`, input);
}

/** Saves the member design as a new model version; errors are shown beside the form. */
export function useSaveDesign() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveDesign,
    meta: { errorsShownInline: true, successMessage: 'Member design saved.' },
    onSuccess: (view) => {
      queryClient.setQueryData(getTrussModelQueryOptions(view.trussId).queryKey, view);
      return queryClient.invalidateQueries({ queryKey: ['trusses', view.trussId, 'runs'] });
    },
  });
}
