import { MutationCache, QueryCache, QueryClient, QueryClientProvider } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { ApiRequestError, isUnauthorized } from '../lib/api-client';
import { meQueryKey } from '../features/auth/api/get-me';

/** The app's query client: no retries on answers the server gave on purpose, and a 401 anywhere ends the session view. */
export function createQueryClient(): QueryClient {
  const queryClient: QueryClient = new QueryClient({
    queryCache: new QueryCache({
      onError: (error) => {
        // The session expired while the app was open: forget the user, and the guard sends them to sign in.
        if (isUnauthorized(error)) queryClient.setQueryData(meQueryKey, null);
      },
    }),
    mutationCache: new MutationCache({
      onError: (error, _variables, _context, mutation) => {
        // Sign-in answers 401 for a wrong password; only other calls mean the session is gone.
        if (isUnauthorized(error) && mutation.options.mutationKey?.[0] !== 'auth') {
          queryClient.setQueryData(meQueryKey, null);
        }
      },
    }),
    defaultOptions: {
      queries: {
        staleTime: 15_000,
        refetchOnWindowFocus: false,
        retry: (failureCount, error) =>
          failureCount < 2 &&
          !(error instanceof ApiRequestError && error.status >= 400 && error.status < 500),
      },
    },
  });
  return queryClient;
}

/** Wraps the app in the query client. */
export function AppProviders({ queryClient, children }: { queryClient: QueryClient; children: ReactNode }) {
  return <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>;
}
