import { queryOptions, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';
import type { RunView } from '@shared/schemas/run.schema';
import { api } from '@/lib/api-client';

export function getRun(runId: number): Promise<RunView> {
  return api.get<RunView>(`/api/runs/${runId}`);
}

const POLL_MS = 600;

export function getRunQueryOptions(runId: number) {
  return queryOptions({
    queryKey: ['runs', runId],
    queryFn: () => getRun(runId),
    refetchInterval: (query) => {
      const status = query.state.data?.status;
      return status === 'queued' || status === 'running' ? POLL_MS : false;
    },
  });
}

/** One run with its snapshot and results; polled until it is solved, unstable or failed. */
export function useRun(runId: number) {
  const queryClient = useQueryClient();
  const query = useQuery(getRunQueryOptions(runId));
  const status = query.data?.status;
  const trussId = query.data?.trussId;
  // When the run finishes, the list's row changes too.
  useEffect(() => {
    if (trussId !== undefined && status !== 'queued' && status !== 'running') {
      void queryClient.invalidateQueries({ queryKey: ['trusses', trussId, 'runs'] });
    }
  }, [queryClient, status, trussId]);
  return query;
}
