import type { Photo } from '@common/contracts/photos';
import { PhotoThumb } from './photo-thumb';

/** Thumbnails as buttons: each opens the lightbox at that photo. */
export function PhotoGrid({
  photos,
  onOpen,
  label,
}: {
  photos: Photo[];
  onOpen: (photo: Photo) => void;
  label: string;
}) {
  if (photos.length === 0) return <p className="text-sm text-loam-700">No photos yet.</p>;
  return (
    <ul aria-label={label} className="grid grid-cols-2 gap-2 sm:grid-cols-3 lg:grid-cols-4">
      {photos.map((p) => (
        <li key={p.id} className="relative">
          <button
            type="button"
            onClick={() => onOpen(p)}
            className="block w-full rounded-md focus-visible:outline-4 focus-visible:outline-pod-500"
            aria-label={`Open photo: ${p.caption}`}
          >
            <PhotoThumb photo={p} />
          </button>
          {p.isCover ? (
            <span className="absolute left-1 top-1 rounded bg-pod-500 px-1.5 py-0.5 text-xs font-semibold text-ink">
              Cover
            </span>
          ) : null}
          <p className="mt-1 line-clamp-2 text-xs text-loam-700">
            {p.takenOn ?? ''} · {p.caption}
          </p>
        </li>
      ))}
    </ul>
  );
}
