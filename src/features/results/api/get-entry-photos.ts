import { photoListSchema } from '@common/contracts/photos';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

/** The trial's photos, to choose a cover per entry for the sheet. */
export const getTrialPhotos = (slug: string) =>
  api(`/api/trials/${encodeURIComponent(slug)}/photos`, photoListSchema);

export const trialPhotosQueryOptions = (slug: string) =>
  queryOptions({
    queryKey: trialKeys.sheetPhotos(slug),
    queryFn: () => getTrialPhotos(slug),
  });

export const useTrialPhotos = (slug: string) => useQuery(trialPhotosQueryOptions(slug));
