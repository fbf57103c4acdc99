import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { ApiError, errorMessage } from './api-client';
import { notify } from './notices';

declare module '@tanstack/react-query' {
  interface Register {
    defaultError: Error;
    mutationMeta: {
      /** The form shows this mutation's errors beside its fields; no notice needed. */
      errorsShownInline?: boolean;
      /** A notice to show when the mutation succeeds. */
      successMessage?: string;
    };
  }
}

export const SESSION_QUERY_KEY = ['session'] as const;

/** A signed-out answer means the session ended: drop it so the guard sends the person to sign in. */
function handleSignedOut(client: QueryClient, error: unknown): boolean {
  // A wrong password is a 401 too, but it is the sign-in form's business.
  if (error instanceof ApiError && error.status === 401 && error.code !== 'bad-credentials') {
    void client.invalidateQueries({ queryKey: SESSION_QUERY_KEY });
    return true;
  }
  return false;
}

export function createQueryClient(): QueryClient {
  const client: QueryClient = new QueryClient({
    queryCache: new QueryCache({
      onError: (error) => {
        handleSignedOut(client, error);
      },
    }),
    mutationCache: new MutationCache({
      onSuccess: (_data, _variables, _context, mutation) => {
        const message = mutation.meta?.successMessage;
        if (message) notify('success', message);
      },
      onError: (error, _variables, _context, mutation) => {
        if (handleSignedOut(client, error)) {
          notify('error', 'Your session has ended. Sign in again to go on.');
          return;
        }
        if (!mutation.meta?.errorsShownInline) notify('error', errorMessage(error));
      },
    }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        refetchOnWindowFocus: false,
        // Client errors (not found, forbidden) won't change on a retry; network blips might.
        retry: (failureCount, error) =>
          !(error instanceof ApiError && error.status >= 400 && error.status < 500) && failureCount < 2,
      },
    },
  });
  return client;
}
