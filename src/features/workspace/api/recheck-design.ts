import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DesignRecheckInput, RunSummaryView } from '@shared/schemas/run.schema';
import { api } from '@/lib/api-client';

export function recheckDesign({ runId, input }: { runId: number; input: DesignRecheckInput }): Promise<RunSummaryView> {
  return api.post<RunSummaryView>(`/api/runs/${runId}/design`, input);
}

/** Re-checks a run's members with the saved sections on its stored forces (no new analysis). */
export function useRecheckDesign() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: recheckDesign,
    meta: { errorsShownInline: true, successMessage: 'Members re-checked with the saved sections.' },
    onSuccess: (run) =>
      Promise.all([queryClient.invalidateQueries({ queryKey: ['runs', run.id] }), queryClient.invalidateQueries({ queryKey: ['trusses', run.trussId, 'runs'] })]),
  });
}
