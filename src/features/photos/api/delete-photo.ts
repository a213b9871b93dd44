import { deletePhotoResponse, photoResponse } from '@common/contracts/photos';
import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { useInvalidateTrial } from '@/lib/trial-keys';

const photoUrl = (slug: string, photoId: string) =>
  `/api/trials/${encodeURIComponent(slug)}/photos/${photoId}`;

export const deletePhoto = (slug: string, photoId: string) =>
  api(photoUrl(slug, photoId), deletePhotoResponse, { method: 'DELETE' });

export const restorePhoto = (slug: string, photoId: string) =>
  api(`${photoUrl(slug, photoId)}/restore`, photoResponse, { method: 'POST' });

/** Deleting may change an entry's cover, so the tagging data is refreshed too. */
export function useDeletePhoto(slug: string) {
  const invalidate = useInvalidateTrial();
  return useMutation({
    mutationFn: (photoId: string) => deletePhoto(slug, photoId),
    onSuccess: () => invalidate(slug, 'photos'),
  });
}

export function useRestorePhoto(slug: string) {
  const invalidate = useInvalidateTrial();
  return useMutation({
    mutationFn: (photoId: string) => restorePhoto(slug, photoId),
    onSuccess: () => invalidate(slug, 'photos'),
  });
}
