import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import { api } from '@/lib/api-client';
import { getTrussModelQueryOptions } from './get-model';

/** The job file's address: GET downloads the truss's model as a job file, POST imports one. */
export const jobFilePath = (trussId: number) => `/api/trusses/${trussId}/job-file`;

export function importJobFile({ trussId, job }: { trussId: number; job: unknown }): Promise<TrussModelView> {
  return api.post<TrussModelView>(jobFilePath(trussId), job);
}

/** Imports a job file as the next model version; a refusal (422) is one sentence shown beside the button. */
export function useImportJobFile() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: importJobFile,
    meta: { errorsShownInline: true, successMessage: 'Job file imported as a new model save.' },
    onSuccess: (view) => {
      queryClient.setQueryData(getTrussModelQueryOptions(view.trussId).queryKey, view);
      return queryClient.invalidateQueries({ queryKey: ['trusses', view.trussId, 'runs'] });
    },
  });
}
