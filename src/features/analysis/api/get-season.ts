import { seasonSchema } from '@common/contracts/weather';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { analysisKeys } from './analysis-keys';

export const getSeason = (slug: string) =>
  api(`/api/trials/${encodeURIComponent(slug)}/season`, seasonSchema);

export const seasonQueryOptions = (slug: string) =>
  queryOptions({ queryKey: analysisKeys.season(slug), queryFn: () => getSeason(slug) });

export const useSeason = (slug: string) => useQuery(seasonQueryOptions(slug));
