import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { isApiError } from './api-client';

/**
 * The app's QueryClient. `onUnauthorized` runs when any request answers 401 (the session ended), so the
 * app can send the user back to sign-in; the HTTP client itself never redirects.
 */
export function createQueryClient(onUnauthorized?: () => void) {
  const on401 = (error: unknown) => {
    if (isApiError(error) && error.status === 401) onUnauthorized?.();
  };
  return new QueryClient({
    queryCache: new QueryCache({ onError: on401 }),
    mutationCache: new MutationCache({ onError: on401 }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        refetchOnWindowFocus: true,
        retry: (count, error) => {
          if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
          return count < 2;
        },
      },
    },
  });
}
