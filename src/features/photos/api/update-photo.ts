import { type UpdatePhotoBody, photoResponse } from '@common/contracts/photos';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { photoKeys } from './photo-keys';

export const updatePhoto = (slug: string, photoId: string, body: UpdatePhotoBody) =>
  api(`/api/trials/${encodeURIComponent(slug)}/photos/${photoId}`, photoResponse, {
    method: 'PATCH',
    body,
  });

export function useUpdatePhoto(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ photoId, body }: { photoId: string; body: UpdatePhotoBody }) =>
      updatePhoto(slug, photoId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: photoKeys.lists(slug) }),
  });
}
