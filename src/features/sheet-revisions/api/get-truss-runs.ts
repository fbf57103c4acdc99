import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RunSummaryView } from '@shared/schemas/run.schema';
import { api } from '@/lib/api-client';

export function getTrussRuns(trussId: number): Promise<RunSummaryView[]> {
  return api.get<RunSummaryView[]>(`/api/trusses/${trussId}/runs`);
}

// The same key as the engineer's workspace uses, so a finished run shows here too.
export function getTrussRunsQueryOptions(trussId: number) {
  return queryOptions({ queryKey: ['trusses', trussId, 'runs'], queryFn: () => getTrussRuns(trussId) });
}

/** The truss's analysis runs, newest first (to start a sheet revision from). */
export function useTrussRuns(trussId: number, options: { enabled?: boolean } = {}) {
  return useQuery({ ...getTrussRunsQueryOptions(trussId), enabled: options.enabled ?? true });
}
