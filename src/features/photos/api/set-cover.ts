import { photoResponse } from '@common/contracts/photos';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { photoKeys } from './photo-keys';

export const setCover = (slug: string, photoId: string, cover: boolean) =>
  api(`/api/trials/${encodeURIComponent(slug)}/photos/${photoId}/cover`, photoResponse, {
    method: cover ? 'PUT' : 'DELETE',
  });

export function useSetCover(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ photoId, cover }: { photoId: string; cover: boolean }) =>
      setCover(slug, photoId, cover),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: photoKeys.all(slug) }),
  });
}
