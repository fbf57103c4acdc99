import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AcceptInvitationInput, SessionView } from '@shared/schemas/auth.schema';
import { api, setCsrfToken } from '@/lib/api-client';
import { SESSION_QUERY_KEY } from '@/lib/query-client';

export async function acceptInvitation(input: AcceptInvitationInput): Promise<SessionView> {
  const session = await api.post<SessionView>('/api/invitations/accept', input);
  setCsrfToken(session.csrfToken);
  return session;
}

export function useAcceptInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acceptInvitation,
    meta: { errorsShownInline: true },
    onSuccess: (session) => {
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== SESSION_QUERY_KEY[0] });
      queryClient.setQueryData(SESSION_QUERY_KEY, session);
    },
  });
}
