import { resultSnapshotSchema } from '@common/contracts/results';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export const getPublishedSheet = (slug: string, version?: number) =>
  api(
    `/api/results/${encodeURIComponent(slug)}${version ? `/v/${version}` : ''}`,
    resultSnapshotSchema,
  );

export const publishedSheetQueryOptions = (slug: string, version?: number) =>
  queryOptions({
    queryKey: trialKeys.publishedSheet(slug, version ?? 'latest'),
    queryFn: () => getPublishedSheet(slug, version),
    // A published version never changes.
    staleTime: version ? Infinity : 60_000,
  });

export const usePublishedSheet = (slug: string, version?: number) =>
  useQuery(publishedSheetQueryOptions(slug, version));
