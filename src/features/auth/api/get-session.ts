import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SessionView } from '@shared/schemas/auth.schema';
import { api, setCsrfToken } from '@/lib/api-client';
import { SESSION_QUERY_KEY } from '@/lib/query-client';

export async function getSession(): Promise<SessionView> {
  const session = await api.get<SessionView>('/api/session');
  setCsrfToken(session.csrfToken);
  return session;
}

export function getSessionQueryOptions() {
  return queryOptions({ queryKey: SESSION_QUERY_KEY, queryFn: getSession, staleTime: 5 * 60_000 });
}

/** Who is signed in (user is null when nobody is). */
export function useSession() {
  return useQuery(getSessionQueryOptions());
}
