import { type Photo, type UploadPhotoFields, uploadPhotoResponse } from '@common/contracts/photos';
import { useCallback } from 'react';
import { ApiError, apiUpload, multipartBody, type UploadProgress } from '@/lib/api-client';
import { useInvalidateTrial } from '@/lib/trial-keys';

/**
 * One photo per request, so a failed one can be sent again alone; progress as it goes. Send
 * the same `fields.uploadId` on a retry: the server then answers with the photo it stored.
 */
export async function uploadPhoto(
  slug: string,
  file: File,
  fields: UploadPhotoFields,
  onProgress: (p: UploadProgress) => void,
  signal?: AbortSignal,
): Promise<Photo> {
  const body = multipartBody(fields, { field: 'photo', blob: file, name: file.name });
  const { photos } = await apiUpload(
    `/api/trials/${encodeURIComponent(slug)}/photos`,
    uploadPhotoResponse,
    { body, onProgress, signal },
  );
  if (!photos[0])
    throw new ApiError(201, 'unexpected', 'The server sent an answer we could not read.');
  return photos[0];
}

/** Uploads, then refreshes the lists the new photo appears in. */
export function useUploadPhoto(slug: string) {
  const invalidate = useInvalidateTrial();
  const finished = useCallback(() => invalidate(slug, 'photos'), [invalidate, slug]);
  return {
    uploadPhoto: (...args: Parameters<typeof uploadPhoto>) => uploadPhoto(...args),
    finished,
  };
}
