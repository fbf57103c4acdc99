import { queryOptions, useQuery } from '@tanstack/react-query';
import type { InvitationView } from '@shared/schemas/auth.schema';
import { api } from '@/lib/api-client';

export function getInvitation(token: string): Promise<InvitationView> {
  return api.get<InvitationView>(`/api/invitations/${encodeURIComponent(token)}`);
}

export function getInvitationQueryOptions(token: string) {
  return queryOptions({ queryKey: ['invitations', token], queryFn: () => getInvitation(token), staleTime: Infinity });
}

export function useInvitation(token: string) {
  return useQuery(getInvitationQueryOptions(token));
}
