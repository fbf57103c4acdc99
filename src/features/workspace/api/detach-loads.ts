import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { DetachLoadsInput } from '@shared/schemas/model.schema';
import { api } from '@/lib/api-client';
import { getTrussModelQueryOptions } from './get-model';

export function detachLoads({ trussId, input }: { trussId: number; input: DetachLoadsInput }): Promise<TrussModelView> {
  return api.post<TrussModelView>(`/api/trusses/${trussId}/model/detach-loads`, input);
}

/** "Detach and edit by hand": the case's roof-takeoff loads become hand loads, as a new model save. */
export function useDetachLoads() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: detachLoads,
    meta: { errorsShownInline: true, successMessage: 'Loads detached: edit them by hand now.' },
    onSuccess: (view) => {
      queryClient.setQueryData(getTrussModelQueryOptions(view.trussId).queryKey, view);
      return queryClient.invalidateQueries({ queryKey: ['trusses', view.trussId, 'runs'] });
    },
  });
}
