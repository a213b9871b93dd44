import { trialOffersSchema } from '@common/contracts/seed';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

/** GET /api/seed/offers?trial=<slug>: open offers of seed of a published trial's varieties. */
export const getTrialOffers = (slug: string) =>
  api('/api/seed/offers', trialOffersSchema, { query: { trial: slug } });

export const trialOffersQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.trialOffers(slug), queryFn: () => getTrialOffers(slug) });

export const useTrialOffers = (slug: string) => useQuery(trialOffersQueryOptions(slug));
