import { designSchema } from '@common/contracts/design';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export const getDesign = (slug: string) =>
  api(`/api/trials/${encodeURIComponent(slug)}/design`, designSchema);

export const designQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.design(slug), queryFn: () => getDesign(slug) });

export const useDesign = (slug: string) => useQuery(designQueryOptions(slug));
