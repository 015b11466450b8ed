import { QueryClient } from '@tanstack/react-query';
import { isApiError } from '../lib/api-error';

/** One client for the whole app: route loaders prefetch into it, components read from it. */
export const queryClient = new QueryClient({
  defaultOptions: {
    queries: {
      staleTime: 30_000,
      refetchOnWindowFocus: false,
      // A 4xx will not get better by asking again (sign-in, role, validation); a network blip may.
      retry: (count, error) => count < 1 && !(isApiError(error) && error.status >= 400 && error.status < 500),
    },
  },
});
