import { resultSnapshotSchema } from '@common/contracts/results';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { takeEmbeddedSheet } from '@/lib/prerendered-sheet';
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

/** The sheet the server embedded in the page, when it is the one asked for. */
function embeddedSheet(slug: string, version?: number) {
  const parsed = resultSnapshotSchema.safeParse(takeEmbeddedSheet());
  if (!parsed.success || parsed.data.trial.slug !== slug) return undefined;
  return version === undefined || parsed.data.version === version ? parsed.data : undefined;
}

export const usePublishedSheet = (slug: string, version?: number) =>
  useQuery({
    ...publishedSheetQueryOptions(slug, version),
    initialData: () => embeddedSheet(slug, version),
  });
