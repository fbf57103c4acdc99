import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PasswordResetView } from '@shared/schemas/auth.schema';
import { api } from '@/lib/api-client';

export function getPasswordReset(token: string): Promise<PasswordResetView> {
  return api.get<PasswordResetView>(`/api/password-resets/${encodeURIComponent(token)}`);
}

export function getPasswordResetQueryOptions(token: string) {
  return queryOptions({ queryKey: ['password-resets', token], queryFn: () => getPasswordReset(token), staleTime: Infinity, retry: false });
}

export function usePasswordReset(token: string) {
  return useQuery(getPasswordResetQueryOptions(token));
}
