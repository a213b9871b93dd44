import { designSchema } from '@common/contracts/design';
import { queryOptions, type QueryClient, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial';
import { designKeys } from './design-keys';

export const getDesign = (slug: string) =>
  api(`/api/trials/${encodeURIComponent(slug)}/design`, designSchema);

export const designQueryOptions = (slug: string) =>
  queryOptions({ queryKey: designKeys.detail(slug), queryFn: () => getDesign(slug) });

export const useDesign = (slug: string) => useQuery(designQueryOptions(slug));

/** After a design change: the design itself, and the trial's overview and list counts. */
export async function invalidateDesign(queryClient: QueryClient, slug: string) {
  await Promise.all([
    queryClient.invalidateQueries({ queryKey: designKeys.detail(slug) }),
    queryClient.invalidateQueries({ queryKey: trialKeys.detail(slug) }),
    queryClient.invalidateQueries({ queryKey: trialKeys.list() }),
  ]);
}
