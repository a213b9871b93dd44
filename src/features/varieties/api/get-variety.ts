import { varietyRecordSchema } from '@common/contracts/varieties';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

/** GET /api/varieties/:slug: the variety and its record across trials. */
export const getVariety = (slug: string) =>
  api(`/api/varieties/${encodeURIComponent(slug)}`, varietyRecordSchema);

export const varietyQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.variety(slug), queryFn: () => getVariety(slug) });

export const useVariety = (slug: string) => useQuery(varietyQueryOptions(slug));
