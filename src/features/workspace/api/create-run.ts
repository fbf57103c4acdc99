import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RunCreateInput, RunSummaryView } from '@shared/schemas/run.schema';
import { api } from '@/lib/api-client';

export function createRun({ trussId, input }: { trussId: number; input: RunCreateInput }): Promise<RunSummaryView> {
  return api.post<RunSummaryView>(`/api/trusses/${trussId}/runs`, input);
}

/** Starts an analysis run of the saved model (202: queued; the run is polled from there). */
export function useCreateRun() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createRun,
    onSuccess: (run) => queryClient.invalidateQueries({ queryKey: ['trusses', run.trussId, 'runs'] }),
  });
}
