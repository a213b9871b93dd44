import { seedRequestListSchema } from '@common/contracts/seed';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

/** GET /api/seed/offers/:offerId/requests (group coordinators). */
export const getSeedRequests = (offerId: string) =>
  api(`/api/seed/offers/${offerId}/requests`, seedRequestListSchema);

export const seedRequestsQueryOptions = (offerId: string) =>
  queryOptions({
    queryKey: trialKeys.seedRequests(offerId),
    queryFn: () => getSeedRequests(offerId),
  });

export const useSeedRequests = (offerId: string) => useQuery(seedRequestsQueryOptions(offerId));
