import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SessionView, SignInInput } from '@shared/schemas/auth.schema';
import { api, setCsrfToken } from '@/lib/api-client';
import { SESSION_QUERY_KEY } from '@/lib/query-client';

export async function signIn(input: SignInInput): Promise<SessionView> {
  const session = await api.post<SessionView>('/api/session', input);
  setCsrfToken(session.csrfToken);
  return session;
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    meta: { errorsShownInline: true },
    onSuccess: (session) => {
      // Whatever was cached belonged to the previous person.
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== SESSION_QUERY_KEY[0] });
      queryClient.setQueryData(SESSION_QUERY_KEY, session);
    },
  });
}
