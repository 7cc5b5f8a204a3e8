import { QueryClient } from '@tanstack/react-query';
import { ApiRequestError } from '@/lib/api-client';

/**
 * One QueryClient for the app. 4xx answers are final (retrying a 403 or a 404
 * cannot help, and a 401 has already ended the session); network errors and 5xx
 * are retried twice with TanStack's backoff.
 */
export const queryClient = new QueryClient({
  defaultOptions: {
    queries: {
      staleTime: 30_000,
      retry: (failureCount, error) => {
        if (error instanceof ApiRequestError && error.isClientError) return false;
        return failureCount < 2;
      },
    },
    mutations: {
      retry: false,
    },
  },
});
