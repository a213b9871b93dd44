/** The signed-in user, shared by every feature (units preference, names, the user menu). */
import { sessionSchema, type UnitSystem } from '@common/contracts/me';
import { queryOptions, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from './api-client';
import { forgetStoredCache } from './query-client';

export const sessionKeys = { me: ['session', 'me'] as const };

/** The signed-in user, or null when signed out. */
export async function getMe() {
  return (await api('/api/session', sessionSchema)).user;
}

export const meQueryOptions = () =>
  queryOptions({ queryKey: sessionKeys.me, queryFn: getMe, staleTime: 60_000 });

export const useMe = () => useQuery(meQueryOptions());

/** The reader's units: their choice when signed in, metric otherwise. */
export function useUnitSystem(): UnitSystem {
  const { data } = useMe();
  return data?.unitSystem ?? 'metric';
}

/**
 * After signing in or out everything cached belonged to someone else: drop it and read the
 * new session before moving on.
 */
export function useSessionChanged() {
  const queryClient = useQueryClient();
  return async () => {
    queryClient.removeQueries();
    forgetStoredCache();
    await queryClient.fetchQuery(meQueryOptions());
  };
}
