import { varietySeedSchema } from '@common/contracts/seed';
import { queryOptions, useQuery, useQueryClient } from '@tanstack/react-query';
import { useCallback } from 'react';
import { api } from '@/lib/api-client';
import { invalidateSeed, trialKeys } from '@/lib/trial-keys';

/** GET /api/varieties/:slug/seed: lots, tests, the stand of plots sown from each, offers. */
export const getVarietySeed = (slug: string) =>
  api(`/api/varieties/${encodeURIComponent(slug)}/seed`, varietySeedSchema);

export const varietySeedQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.varietySeed(slug), queryFn: () => getVarietySeed(slug) });

export const useVarietySeed = (slug: string) => useQuery(varietySeedQueryOptions(slug));

/**
 * After any seed write: every variety's seed, every offer (with its requests), and in each trial
 * the entries' lots and the sheet's offers read again (`invalidateSeed`).
 */
export function useSeedChanged() {
  const queryClient = useQueryClient();
  return useCallback(() => invalidateSeed(queryClient), [queryClient]);
}
