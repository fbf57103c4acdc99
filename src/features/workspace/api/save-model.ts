import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { ModelSaveInput } from '@shared/schemas/model.schema';
import { api } from '@/lib/api-client';
import { getTrussModelQueryOptions } from './get-model';

export function saveTrussModel({ trussId, input }: { trussId: number; input: ModelSaveInput }): Promise<TrussModelView> {
  return api.put<TrussModelView>(`/api/trusses/${trussId}/model`, input);
}

/**
 * Saves the model against the version it was loaded at. A 409 'edit-conflict' means someone
 * else saved first; the editor shows it beside its own (unsaved) edits, so no notice here.
 */
export function useSaveTrussModel() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveTrussModel,
    meta: { errorsShownInline: true, successMessage: 'Model saved.' },
    onSuccess: (view) => {
      queryClient.setQueryData(getTrussModelQueryOptions(view.trussId).queryKey, view);
      // Runs compare their snapshot's version with the model's: their stale marks change.
      return queryClient.invalidateQueries({ queryKey: ['trusses', view.trussId, 'runs'] });
    },
  });
}
