import type { Photo, PhotoTagging } from '@common/contracts/photos';
import { useCallback, useState } from 'react';
import { useRestorePhoto } from '../api/delete-photo';
import { PhotoLightbox } from './photo-lightbox';
import { UndoToast } from './undo-toast';

/**
 * The lightbox and the undo toast around any set of photos: `children` renders the grid and
 * calls `open` with a photo of `photos`.
 */
export function PhotoBrowser({
  slug,
  photos,
  tagging,
  children,
}: {
  slug: string;
  photos: Photo[];
  tagging: PhotoTagging;
  children: (open: (photo: Photo) => void) => React.ReactNode;
}) {
  const [openId, setOpenId] = useState<string | null>(null);
  const [deleted, setDeleted] = useState<Photo | null>(null);
  const restore = useRestorePhoto(slug);
  const index = openId ? photos.findIndex((p) => p.id === openId) : -1;
  const dismiss = useCallback(() => setDeleted(null), []);
  return (
    <>
      {children((p) => setOpenId(p.id))}
      {index >= 0 ? (
        <PhotoLightbox
          slug={slug}
          photos={photos}
          index={index}
          tagging={tagging}
          onIndex={(i) => setOpenId(photos[i]?.id ?? null)}
          onClose={() => setOpenId(null)}
          onDeleted={(p) => setDeleted(p)}
        />
      ) : null}
      {deleted ? (
        <UndoToast
          message={`Deleted “${deleted.caption}”.`}
          busy={restore.isPending}
          onUndo={() => restore.mutate(deleted.id, { onSuccess: dismiss })}
          onDismiss={dismiss}
        />
      ) : null}
      {restore.error ? (
        <p role="alert" className="mt-2 text-sm text-frost-600">
          {restore.error.message}
        </p>
      ) : null}
    </>
  );
}
