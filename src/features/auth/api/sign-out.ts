import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SessionView } from '@shared/schemas/auth.schema';
import { api, setCsrfToken } from '@/lib/api-client';
import { SESSION_QUERY_KEY } from '@/lib/query-client';

export async function signOut(): Promise<void> {
  await api.delete('/api/session');
  setCsrfToken(null);
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: () => {
      // Say "nobody" at once (the guard then leaves the signed-in pages), drop the
      // previous person's data, and fetch the fresh session's token.
      queryClient.setQueryData<SessionView>(SESSION_QUERY_KEY, (s) => ({ user: null, csrfToken: s?.csrfToken ?? '' }));
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== SESSION_QUERY_KEY[0] });
      void queryClient.invalidateQueries({ queryKey: SESSION_QUERY_KEY });
    },
  });
}
