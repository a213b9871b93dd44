import { QueryClient } from '@tanstack/react-query';
import { ApiError } from './api-client';

/** How long what was read stays usable on the device without a connection. */
export const CACHE_MAX_AGE_MS = 7 * 24 * 60 * 60 * 1000;

export function createQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        // Kept as long as the on-device copy, so a reload with no signal still has it.
        gcTime: CACHE_MAX_AGE_MS,
        // A 4xx will not change by asking again; a dropped connection might.
        retry: (count, error) =>
          count < 2 && !(error instanceof ApiError && error.status >= 400 && error.status < 500),
      },
    },
  });
}
