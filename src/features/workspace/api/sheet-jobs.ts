import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { printJobFinished, type PrintJobView } from '@shared/schemas/print-job.schema';
import { api } from '@/lib/api-client';

/** The caller's print jobs (calc sheet PDFs made in the background) for a run, newest first. */
export function getRunSheetJobs(runId: number): Promise<PrintJobView[]> {
  return api.get<PrintJobView[]>(`/api/runs/${runId}/sheet-jobs`);
}

const POLL_MS = 1_000;

export function runSheetJobsQueryOptions(runId: number) {
  return queryOptions({
    queryKey: ['runs', runId, 'sheet-jobs'],
    queryFn: () => getRunSheetJobs(runId),
    // Polled while the newest job is unfinished; quiet otherwise.
    refetchInterval: (query) => {
      const newest = query.state.data?.[0];
      return newest && !printJobFinished(newest.state) ? POLL_MS : false;
    },
  });
}

export function useRunSheetJobs(runId: number) {
  return useQuery(runSheetJobsQueryOptions(runId));
}

/** Asks for the run's draft PDF as a print job (202: queued; the list above follows it). */
export function useRequestSheetJob(runId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api.post<PrintJobView>(`/api/runs/${runId}/sheet-jobs`, {}),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['runs', runId, 'sheet-jobs'] }),
  });
}
