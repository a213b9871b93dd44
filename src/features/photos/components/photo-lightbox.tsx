import {
  type Photo,
  photoSubjectLabels,
  type PhotoTagging,
  photoTagForm,
} from '@common/contracts/photos';
import { useEffect, useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useDeletePhoto } from '../api/delete-photo';
import { useSetCover } from '../api/set-cover';
import { useUpdatePhoto } from '../api/update-photo';
import { PhotoTagFields } from './photo-tag-fields';

/**
 * One photo at display size over the page. Left and right arrow keys or a swipe move through
 * the set, Escape closes, and focus returns to the thumbnail that opened it.
 */
export function PhotoLightbox({
  slug,
  photos,
  index,
  tagging,
  onIndex,
  onClose,
  onDeleted,
}: {
  slug: string;
  photos: Photo[];
  index: number;
  tagging: PhotoTagging;
  onIndex: (i: number) => void;
  onClose: () => void;
  onDeleted: (photo: Photo) => void;
}) {
  const photo = photos[index];
  const dialogRef = useRef<HTMLDivElement>(null);
  const swipeStart = useRef<number | null>(null);
  const [editing, setEditing] = useState(false);
  const count = photos.length;

  useEffect(() => {
    const opener = document.activeElement as HTMLElement | null;
    dialogRef.current?.focus();
    return () => opener?.focus?.();
  }, []);

  useEffect(() => setEditing(false), [index]);

  if (!photo) return null;
  const go = (delta: number) => onIndex((index + delta + count) % count);
  const entry = tagging.entries.find((e) => e.id === photo.entryId);
  const plot = tagging.plots.find((p) => p.id === photo.plotId);

  return (
    <div
      ref={dialogRef}
      role="dialog"
      aria-modal="true"
      aria-label={`Photo ${index + 1} of ${count}: ${photo.caption}`}
      tabIndex={-1}
      className="fixed inset-0 z-50 flex flex-col bg-ink/95 text-white outline-none"
      onKeyDown={(e) => {
        if (e.target instanceof HTMLInputElement || e.target instanceof HTMLSelectElement) {
          if (e.key === 'Escape') setEditing(false);
          return;
        }
        if (e.key === 'Escape') onClose();
        else if (e.key === 'ArrowRight') go(1);
        else if (e.key === 'ArrowLeft') go(-1);
        else if (e.key === 'Tab') trapFocus(e, dialogRef.current);
      }}
    >
      <div className="flex items-center justify-between gap-2 p-2">
        <p className="text-sm" aria-live="polite">
          {index + 1} / {count}
        </p>
        <Button variant="secondary" onClick={onClose} aria-label="Close photo">
          Close
        </Button>
      </div>
      <div
        className="relative flex min-h-0 flex-1 items-center justify-center px-2"
        onPointerDown={(e) => {
          swipeStart.current = e.clientX;
        }}
        onPointerUp={(e) => {
          if (swipeStart.current === null) return;
          const dx = e.clientX - swipeStart.current;
          swipeStart.current = null;
          // A deliberate sideways swipe, not a tap (common practice, no source).
          if (Math.abs(dx) > 50) go(dx < 0 ? 1 : -1);
        }}
        style={{ touchAction: 'pan-y' }}
      >
        <img
          key={photo.id}
          src={photo.urls.display}
          srcSet={`${photo.urls.thumb} ${photo.thumbWidth ?? 400}w, ${photo.urls.display} ${photo.displayWidth ?? 1600}w`}
          sizes="100vw"
          alt={photo.caption}
          draggable={false}
          className="max-h-full max-w-full select-none object-contain"
        />
        {count > 1 ? (
          <>
            <button
              type="button"
              onClick={() => go(-1)}
              aria-label="Previous photo"
              className="absolute left-1 top-1/2 min-h-11 min-w-11 -translate-y-1/2 rounded-full bg-ink/70 text-2xl"
            >
              ‹
            </button>
            <button
              type="button"
              onClick={() => go(1)}
              aria-label="Next photo"
              className="absolute right-1 top-1/2 min-h-11 min-w-11 -translate-y-1/2 rounded-full bg-ink/70 text-2xl"
            >
              ›
            </button>
          </>
        ) : null}
      </div>
      <div className="max-h-[45vh] overflow-y-auto bg-white p-3 text-ink">
        {editing ? (
          <EditTags slug={slug} photo={photo} tagging={tagging} onDone={() => setEditing(false)} />
        ) : (
          <PhotoDetails
            slug={slug}
            photo={photo}
            tagging={tagging}
            entryLabel={entry ? `${entry.code} · ${entry.name}` : 'No entry'}
            plotLabel={plot ? `${plot.siteName} · plot ${plot.plotNumber}` : null}
            onEdit={() => setEditing(true)}
            onDeleted={() => {
              onDeleted(photo);
              if (count <= 1) onClose();
              else if (index >= count - 1) onIndex(index - 1);
            }}
          />
        )}
      </div>
    </div>
  );
}

function trapFocus(e: React.KeyboardEvent, root: HTMLElement | null) {
  if (!root) return;
  const items = [
    ...root.querySelectorAll<HTMLElement>('button, a[href], input, select, [tabindex="0"]'),
  ].filter((el) => !el.hasAttribute('disabled'));
  if (items.length === 0) return;
  const first = items[0]!;
  const last = items[items.length - 1]!;
  if (e.shiftKey && (document.activeElement === first || document.activeElement === root)) {
    e.preventDefault();
    last.focus();
  } else if (!e.shiftKey && document.activeElement === last) {
    e.preventDefault();
    first.focus();
  }
}

function PhotoDetails({
  slug,
  photo,
  tagging,
  entryLabel,
  plotLabel,
  onEdit,
  onDeleted,
}: {
  slug: string;
  photo: Photo;
  tagging: PhotoTagging;
  entryLabel: string;
  plotLabel: string | null;
  onEdit: () => void;
  onDeleted: () => void;
}) {
  const remove = useDeletePhoto(slug);
  const cover = useSetCover(slug);
  const error = remove.error ?? cover.error;
  return (
    <div>
      <p className="font-semibold">{photo.caption}</p>
      <p className="text-sm text-loam-700">
        {entryLabel}
        {plotLabel ? ` · ${plotLabel}` : ''} · {photo.takenOn ?? 'no date'}
        {photo.subject ? ` · ${photoSubjectLabels[photo.subject]}` : ''}
        {photo.uploadedBy ? ` · by ${photo.uploadedBy.name}` : ''}
      </p>
      <div className="mt-2 flex flex-wrap gap-2">
        {photo.canEdit ? (
          <Button variant="secondary" onClick={onEdit}>
            Edit tags
          </Button>
        ) : null}
        {tagging.permissions.chooseCover && photo.entryId ? (
          <Button
            variant="secondary"
            disabled={cover.isPending}
            aria-pressed={photo.isCover}
            onClick={() => cover.mutate({ photoId: photo.id, cover: !photo.isCover })}
          >
            {photo.isCover ? 'Cover of this entry ✓' : 'Make entry cover'}
          </Button>
        ) : null}
        {photo.urls.original ? (
          <a
            href={photo.urls.original}
            className="inline-flex min-h-11 items-center rounded-lg px-3 font-semibold text-leaf-700 underline"
          >
            Full-size original
            {photo.width && photo.height ? ` (${photo.width} × ${photo.height} px)` : ''}
          </a>
        ) : null}
        {photo.canEdit ? (
          <Button
            variant="danger"
            disabled={remove.isPending}
            onClick={() => remove.mutate(photo.id, { onSuccess: onDeleted })}
          >
            Delete
          </Button>
        ) : null}
      </div>
      {error ? (
        <p role="alert" className="mt-2 text-sm text-frost-600">
          {error.message}
        </p>
      ) : null}
    </div>
  );
}

export function EditTags({
  slug,
  photo,
  tagging,
  onDone,
}: {
  slug: string;
  photo: Photo;
  tagging: PhotoTagging;
  onDone: () => void;
}) {
  const update = useUpdatePhoto(slug);
  const form = useContractForm(photoTagForm, {
    caption: photo.caption,
    entryId: photo.entryId ?? '',
    plotId: photo.plotId ?? '',
    takenOn: photo.takenOn ?? '',
    subject: photo.subject ?? '',
  });
  const onSubmit = submitTo(form, async (body) => {
    await update.mutateAsync({ photoId: photo.id, body });
    onDone();
  });
  const refusal = formRefusal(form);
  return (
    <form noValidate aria-label="Photo tags" onSubmit={onSubmit}>
      <PhotoTagFields form={form} tagging={tagging} dateHint="The day the photo was taken." />
      {refusal ? (
        <p role="alert" className="mt-2 text-sm text-frost-600">
          {refusal}
        </p>
      ) : null}
      <div className="mt-2 flex gap-2">
        <Button type="submit" disabled={form.formState.isSubmitting}>
          Save tags
        </Button>
        <Button type="button" variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
