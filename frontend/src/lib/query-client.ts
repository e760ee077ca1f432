import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { ApiError } from './api-client';

const ME_KEY = ['auth', 'me'];

/** A 401 anywhere means the session has ended: forget who was signed in, and the guarded page sends them to sign in. */
const onError = (client: () => QueryClient) => (error: unknown) => {
  if (error instanceof ApiError && error.status === 401) client().setQueryData(ME_KEY, null);
};

export function createQueryClient(): QueryClient {
  const client: QueryClient = new QueryClient({
    queryCache: new QueryCache({ onError: onError(() => client) }),
    mutationCache: new MutationCache({ onError: onError(() => client) }),
    defaultOptions: {
      queries: {
        staleTime: 10_000,
        // A 4xx will not change by asking again; network trouble and 5xx might.
        retry: (count, error) => count < 2 && !(error instanceof ApiError && error.status >= 400 && error.status < 500),
        refetchOnWindowFocus: false,
      },
    },
  });
  return client;
}
