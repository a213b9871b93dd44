import { memberListSchema } from '@common/contracts/members';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export const getMembers = (slug: string) =>
  api(`/api/trials/${encodeURIComponent(slug)}/members`, memberListSchema);

export const membersQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.members(slug), queryFn: () => getMembers(slug) });

export const useMembers = (slug: string) => useQuery(membersQueryOptions(slug));
