import { QueryClient } from '@tanstack/react-query';
import { ApiError } from './api-client';

/** How long what was read stays usable on the device without a connection. */
export const CACHE_MAX_AGE_MS = 7 * 24 * 60 * 60 * 1000;

/** Where the on-device copy of the cache lives (localStorage). */
export const CACHE_STORAGE_KEY = 'rowtally-cache';

/**
 * Drops the on-device copy at once. The copy is written at most once a second, so right after
 * a sign-in or sign-out it can still hold the previous account's answers, and a reload within
 * that second would show them as fresh (a just-signed-in visitor shown as signed out, or the
 * last person's trials on a shared phone). The next write stores the new account's cache.
 */
export function forgetStoredCache() {
  window.localStorage.removeItem(CACHE_STORAGE_KEY);
}

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
