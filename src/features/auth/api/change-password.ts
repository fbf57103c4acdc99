import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ChangePasswordInput, SessionView } from '@shared/schemas/auth.schema';
import { api, setCsrfToken } from '@/lib/api-client';
import { SESSION_QUERY_KEY } from '@/lib/query-client';

/** Changes the signed-in person's password; the server signs this tab in again (new CSRF token). */
export async function changePassword(input: ChangePasswordInput): Promise<SessionView> {
  const session = await api.post<SessionView>('/api/account/password', input);
  setCsrfToken(session.csrfToken);
  return session;
}

export function useChangePassword() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: changePassword,
    meta: { errorsShownInline: true },
    onSuccess: (session) => queryClient.setQueryData(SESSION_QUERY_KEY, session),
  });
}
