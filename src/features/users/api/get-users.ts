import { queryOptions, useQuery } from '@tanstack/react-query';
import type { UserView } from '@shared/schemas/auth.schema';
import { api } from '@/lib/api-client';

export function getUsers(): Promise<UserView[]> {
  return api.get<UserView[]>('/api/users');
}

export function getUsersQueryOptions() {
  return queryOptions({ queryKey: ['users'], queryFn: getUsers });
}

export function useUsers() {
  return useQuery(getUsersQueryOptions());
}
