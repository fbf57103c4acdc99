import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CheckerView } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function getCheckers(): Promise<CheckerView[]> {
  return api.get<CheckerView[]>('/api/checkers');
}

export function getCheckersQueryOptions() {
  return queryOptions({ queryKey: ['checkers'], queryFn: getCheckers });
}

/** The reviewers who may be chosen as a revision's checker (active accounts, never the one asking). */
export function useCheckers(enabled = true) {
  return useQuery({ ...getCheckersQueryOptions(), enabled });
}
