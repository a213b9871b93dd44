import { entryLotsSchema, type SetEntryLotBody } from '@common/contracts/seed';
import { queryOptions, useQuery, useQueryClient } from '@tanstack/react-query';
import { useCallback } from 'react';
import { api } from '@/lib/api-client';
import { invalidateSeed, trialKeys } from '@/lib/trial-keys';

/** GET /api/trials/:slug/entry-lots: the lot each entry was sown from, and its variety's lots. */
export const getEntryLots = (slug: string) =>
  api(`/api/trials/${encodeURIComponent(slug)}/entry-lots`, entryLotsSchema);

export const entryLotsQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.entryLots(slug), queryFn: () => getEntryLots(slug) });

export const useEntryLots = (slug: string) => useQuery(entryLotsQueryOptions(slug));

/** PUT /api/trials/:slug/entry-lots/:entryId (trial leads); then the seed views read again. */
export function useSetEntryLot(slug: string) {
  const queryClient = useQueryClient();
  return useCallback(
    async (entryId: string, body: SetEntryLotBody) => {
      await api(`/api/trials/${encodeURIComponent(slug)}/entry-lots/${entryId}`, null, {
        method: 'PUT',
        body,
      });
      // A lot's sowings are seed facts: the variety's seed page lists them beside its stands.
      await invalidateSeed(queryClient);
    },
    [queryClient, slug],
  );
}
