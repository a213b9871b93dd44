import { versionListSchema } from '@common/contracts/results';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export const getVersions = (slug: string) =>
  api(`/api/results/${encodeURIComponent(slug)}/versions`, versionListSchema);

export const versionsQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.versions(slug), queryFn: () => getVersions(slug) });

export const useVersions = (slug: string) => useQuery(versionsQueryOptions(slug));
