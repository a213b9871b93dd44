import { type UpdatePhotoBody, photoResponse } from '@common/contracts/photos';
import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { useInvalidateTrial } from '@/lib/trial-keys';

export const updatePhoto = (slug: string, photoId: string, body: UpdatePhotoBody) =>
  api(`/api/trials/${encodeURIComponent(slug)}/photos/${photoId}`, photoResponse, {
    method: 'PATCH',
    body,
  });

export function useUpdatePhoto(slug: string) {
  const invalidate = useInvalidateTrial();
  return useMutation({
    mutationFn: ({ photoId, body }: { photoId: string; body: UpdatePhotoBody }) =>
      updatePhoto(slug, photoId, body),
    onSuccess: () => invalidate(slug, 'photos'),
  });
}
