import { photoResponse } from '@common/contracts/photos';
import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { useInvalidateTrial } from '@/lib/trial-keys';

export const setCover = (slug: string, photoId: string, cover: boolean) =>
  api(`/api/trials/${encodeURIComponent(slug)}/photos/${photoId}/cover`, photoResponse, {
    method: cover ? 'PUT' : 'DELETE',
  });

export function useSetCover(slug: string) {
  const invalidate = useInvalidateTrial();
  return useMutation({
    mutationFn: ({ photoId, cover }: { photoId: string; cover: boolean }) =>
      setCover(slug, photoId, cover),
    onSuccess: () => invalidate(slug, 'photos'),
  });
}
