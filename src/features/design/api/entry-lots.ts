import { entryLotsSchema, type SetEntryLotBody } from '@common/contracts/seed';
import { queryOptions, useQuery, useQueryClient } from '@tanstack/react-query';
import { useCallback } from 'react';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

/** GET /api/trials/:slug/entry-lots: the lot each entry was sown from, and its variety's lots. */
export const getEntryLots = (slug: string) =>
  api(`/api/trials/${encodeURIComponent(slug)}/entry-lots`, entryLotsSchema);

export const entryLotsQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.entryLots(slug), queryFn: () => getEntryLots(slug) });

export const useEntryLots = (slug: string) => useQuery(entryLotsQueryOptions(slug));

/** PUT /api/trials/:slug/entry-lots/:entryId (trial leads); the lots' pages read again after. */
export function useSetEntryLot(slug: string) {
  const queryClient = useQueryClient();
  return useCallback(
    async (entryId: string, body: SetEntryLotBody) => {
      await api(`/api/trials/${encodeURIComponent(slug)}/entry-lots/${entryId}`, null, {
        method: 'PUT',
        body,
      });
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: trialKeys.entryLots(slug) }),
        queryClient.invalidateQueries({ queryKey: trialKeys.varietySeeds() }),
      ]);
    },
    [queryClient, slug],
  );
}
