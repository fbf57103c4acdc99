import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CompletePasswordResetInput, SessionView } from '@shared/schemas/auth.schema';
import { api, setCsrfToken } from '@/lib/api-client';
import { SESSION_QUERY_KEY } from '@/lib/query-client';

/** Sets the new password from a reset link; the person is then signed in. */
export async function completePasswordReset(input: CompletePasswordResetInput): Promise<SessionView> {
  const session = await api.post<SessionView>('/api/password-resets/complete', input);
  setCsrfToken(session.csrfToken);
  return session;
}

export function useCompletePasswordReset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: completePasswordReset,
    meta: { errorsShownInline: true },
    onSuccess: (session) => {
      // Whatever was cached belonged to whoever used this browser before.
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== SESSION_QUERY_KEY[0] });
      queryClient.setQueryData(SESSION_QUERY_KEY, session);
    },
  });
}
