import { photoTaggingSchema } from '@common/contracts/photos';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export const getPhotoTagging = (slug: string) =>
  api(`/api/trials/${encodeURIComponent(slug)}/photos/tagging`, photoTaggingSchema);

export const photoTaggingQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.photoTagging(slug), queryFn: () => getPhotoTagging(slug) });

export const usePhotoTagging = (slug: string) => useQuery(photoTaggingQueryOptions(slug));
