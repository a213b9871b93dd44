import type { Photo } from '@common/contracts/photos';

/** A lazily loaded thumbnail that switches to the display size on wide or dense screens. */
export function PhotoThumb({
  photo,
  sizes = '(min-width: 1024px) 14rem, (min-width: 640px) 30vw, 45vw',
  className = '',
}: {
  photo: Photo;
  sizes?: string;
  className?: string;
}) {
  return (
    <img
      src={photo.urls.thumb}
      srcSet={`${photo.urls.thumb} ${photo.thumbWidth ?? 400}w, ${photo.urls.display} ${photo.displayWidth ?? 1600}w`}
      sizes={sizes}
      width={photo.thumbWidth ?? undefined}
      height={photo.thumbHeight ?? undefined}
      loading="lazy"
      decoding="async"
      alt={photo.caption}
      className={`aspect-[4/3] w-full rounded-md bg-straw-200 object-cover ${className}`}
    />
  );
}
