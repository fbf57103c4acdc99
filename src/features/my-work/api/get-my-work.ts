import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MyWorkView } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function getMyWork(): Promise<MyWorkView> {
  return api.get<MyWorkView>('/api/me/work');
}

/** Other people's moves (a sheet sent to me, returned to me) arrive without my doing: look again every minute. */
export const MY_WORK_REFRESH_MS = 60_000;

export function getMyWorkQueryOptions() {
  return queryOptions({ queryKey: ['me', 'work'], queryFn: getMyWork, refetchInterval: MY_WORK_REFRESH_MS, refetchOnWindowFocus: true });
}

/** What waits for the signed-in person: to check, returned to me, ready to issue, drawings to fix. */
export function useMyWork() {
  return useQuery(getMyWorkQueryOptions());
}
