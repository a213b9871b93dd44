import { seasonSchema } from '@common/contracts/weather';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export const getSeason = (slug: string) =>
  api(`/api/trials/${encodeURIComponent(slug)}/season`, seasonSchema);

export const seasonQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.season(slug), queryFn: () => getSeason(slug) });

export const useSeason = (slug: string) => useQuery(seasonQueryOptions(slug));
