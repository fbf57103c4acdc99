import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RunSummaryView } from '@shared/schemas/run.schema';
import { api } from '@/lib/api-client';

export function getRuns(trussId: number): Promise<RunSummaryView[]> {
  return api.get<RunSummaryView[]>(`/api/trusses/${trussId}/runs`);
}

const POLL_MS = 800;

export function getRunsQueryOptions(trussId: number) {
  return queryOptions({
    queryKey: ['trusses', trussId, 'runs'],
    queryFn: () => getRuns(trussId),
    // While a run is queued or solving, the list follows it.
    refetchInterval: (query) =>
      query.state.data?.some((r) => r.status === 'queued' || r.status === 'running') ? POLL_MS : false,
  });
}

/** The truss's analysis runs, newest first. */
export function useRuns(trussId: number) {
  return useQuery(getRunsQueryOptions(trussId));
}
