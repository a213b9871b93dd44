import { apiErrorBodySchema } from '@common/api-error';
import { type Photo, type UploadPhotoFields, uploadPhotoResponse } from '@common/contracts/photos';
import { useCallback } from 'react';
import { ApiError } from '@/lib/api-client';
import { useInvalidateTrial } from '@/lib/trial-keys';

export interface UploadProgress {
  loaded: number;
  total: number;
}

/**
 * One photo per request, so a failed one can be sent again alone. XMLHttpRequest, because
 * fetch reports no upload progress.
 */
export function uploadPhoto(
  slug: string,
  file: File,
  fields: UploadPhotoFields,
  onProgress: (p: UploadProgress) => void,
  signal?: AbortSignal,
): Promise<Photo> {
  return new Promise((resolve, reject) => {
    const form = new FormData();
    for (const [k, v] of Object.entries(fields))
      if (v !== undefined && v !== null) form.append(k, String(v));
    form.append('photo', file, file.name);
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api/trials/${encodeURIComponent(slug)}/photos`);
    xhr.withCredentials = true;
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress({ loaded: e.loaded, total: e.total });
    };
    xhr.onload = () => {
      let payload: unknown = null;
      try {
        payload = JSON.parse(xhr.responseText);
      } catch {
        // answered with something other than JSON; reported below
      }
      if (xhr.status === 201) {
        const parsed = uploadPhotoResponse.safeParse(payload);
        if (parsed.success && parsed.data.photos[0]) return resolve(parsed.data.photos[0]);
        return reject(
          new ApiError(xhr.status, 'unexpected', 'The server sent an answer we could not read.'),
        );
      }
      const err = apiErrorBodySchema.safeParse(payload);
      reject(
        err.success
          ? new ApiError(
              xhr.status,
              err.data.error.code,
              err.data.error.message,
              err.data.error.details,
            )
          : new ApiError(xhr.status, 'unexpected', `The server answered ${xhr.status}.`),
      );
    };
    xhr.onerror = () =>
      reject(new ApiError(0, 'network', 'The connection dropped. Check the signal and retry.'));
    xhr.onabort = () => reject(new ApiError(0, 'cancelled', 'Cancelled.'));
    if (signal) {
      if (signal.aborted) return xhr.abort();
      signal.addEventListener('abort', () => xhr.abort(), { once: true });
    }
    xhr.send(form);
  });
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
