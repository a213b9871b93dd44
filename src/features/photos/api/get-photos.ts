import { type ListPhotosQuery, photoListSchema } from '@common/contracts/photos';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export const getPhotos = (slug: string, filters: ListPhotosQuery) =>
  api(`/api/trials/${encodeURIComponent(slug)}/photos`, photoListSchema, {
    query: { ...filters },
  });

export const photosQueryOptions = (slug: string, filters: ListPhotosQuery = {}) =>
  queryOptions({
    queryKey: trialKeys.photos(slug, filters),
    queryFn: () => getPhotos(slug, filters),
    placeholderData: keepPreviousData,
  });

export const usePhotos = (slug: string, filters: ListPhotosQuery = {}) =>
  useQuery(photosQueryOptions(slug, filters));
