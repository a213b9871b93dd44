import { offerSchema } from '@common/contracts/seed';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

/** GET /api/seed/offers/:offerId: the offer and whether the caller may ask for a packet. */
export const getOffer = (offerId: string) => api(`/api/seed/offers/${offerId}`, offerSchema);

export const offerQueryOptions = (offerId: string) =>
  queryOptions({ queryKey: trialKeys.seedOffer(offerId), queryFn: () => getOffer(offerId) });

export const useOffer = (offerId: string) => useQuery(offerQueryOptions(offerId));
