import { cautions } from '@common/cautions';
import { type Photo, type PhotoTagging, photoTagForm } from '@common/contracts/photos';
import { z } from 'zod';
import { useEffect, useRef, useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { ApiError } from '@/lib/api-client';
import { clientId } from '@/lib/client-id';
import { usePhotoTagging } from '../api/get-photo-tagging';
import { useUploadPhoto } from '../api/upload-photo';
import { emptyTags, PhotoTagFields } from '../components/photo-tag-fields';
import { useContractForm } from '@/lib/contract-form';
import { localToday } from '@common/calendar-date';

type Status = 'ready' | 'waiting' | 'sending' | 'done' | 'failed' | 'cancelled';

interface Item {
  key: string;
  /** made once per file: every retry of its upload carries it, so it is stored once */
  uploadId: string;
  file: File;
  preview: string;
  status: Status;
  sent: number;
  error?: string;
  photo?: Photo;
}

const megabytes = (bytes: number) =>
  `${(bytes / (1024 * 1024)).toLocaleString('en', { maximumFractionDigits: 1, minimumFractionDigits: 1 })} MB`;

const statusText: Record<Status, string> = {
  ready: 'Ready',
  waiting: 'Waiting',
  sending: 'Sending',
  done: 'Uploaded',
  failed: 'Failed',
  cancelled: 'Cancelled',
};

export function Component() {
  const { slug = '' } = useParams();
  const tagging = usePhotoTagging(slug);
  if (tagging.isPending) return <Spinner label="Loading the trial…" />;
  if (tagging.error) return <ErrorPanel error={tagging.error} />;
  if (!tagging.data.permissions.upload) {
    return (
      <ErrorPanel
        title="You cannot upload photos here"
        error={new Error('Your role in this trial does not include uploading photos.')}
      />
    );
  }
  return <Uploader slug={slug} tagging={tagging.data} />;
}

/** The batch is one form: each photo's tags under its upload id, checked one photo at a time. */
const batchForm = z.object({ photos: z.record(z.string(), photoTagForm) });
/** A form path for one photo's tags (an upload id is letters, digits and dashes). */
const tagsOf = (item: Item) => `photos.p${item.uploadId}` as const;

function Uploader({ slug, tagging }: { slug: string; tagging: PhotoTagging }) {
  const { uploadPhoto, finished } = useUploadPhoto(slug);
  const [items, setItems] = useState<Item[]>([]);
  // The tags for the next photos added: a form of its own that is never sent.
  const defaults = useContractForm(photoTagForm, emptyTags);
  const batch = useContractForm(batchForm, { photos: {} });
  const [running, setRunning] = useState(false);
  const controllers = useRef(new Map<string, AbortController>());
  const cancelAll = useRef(false);
  const itemsRef = useRef(items);
  itemsRef.current = items;
  const { limits } = tagging;

  // Previews are object URLs: release them when the page goes.
  useEffect(
    () => () => {
      for (const i of itemsRef.current) URL.revokeObjectURL(i.preview);
      for (const c of controllers.current.values()) c.abort();
    },
    [],
  );

  const patch = (key: string, p: Partial<Item>) =>
    setItems((list) => list.map((i) => (i.key === key ? { ...i, ...p } : i)));

  const addFiles = (files: FileList | null) => {
    if (!files) return;
    const added = [...files].map<Item>((file) => ({
      key: `${file.name}-${file.size}-${file.lastModified}-${Math.random().toString(36).slice(2)}`,
      uploadId: clientId(),
      file,
      preview: URL.createObjectURL(file),
      status: file.size > limits.maxBytes ? 'failed' : 'ready',
      sent: 0,
      error:
        file.size > limits.maxBytes
          ? `This file is ${megabytes(file.size)}; each photo can be at most ${megabytes(limits.maxBytes)}.`
          : undefined,
    }));
    for (const item of added) batch.setValue(tagsOf(item), { ...defaults.getValues() });
    setItems((list) => [...list, ...added]);
  };

  const sendOne = async (item: Item): Promise<boolean> => {
    // The contract checks this photo's tags only; its messages show beside the fields.
    if (!(await batch.trigger(tagsOf(item)))) {
      patch(item.key, { status: 'failed', error: 'Complete the tags marked below first.' });
      return false;
    }
    const tags = photoTagForm.parse(batch.getValues(tagsOf(item)));
    const controller = new AbortController();
    controllers.current.set(item.key, controller);
    patch(item.key, { status: 'sending', sent: 0, error: undefined });
    try {
      const photo = await uploadPhoto(
        slug,
        item.file,
        {
          ...tags,
          today: localToday(),
          uploadId: item.uploadId,
        },
        (p) => patch(item.key, { sent: Math.min(p.loaded, item.file.size) }),
        controller.signal,
      );
      patch(item.key, { status: 'done', sent: item.file.size, photo });
      return true;
    } catch (err) {
      const cancelled = err instanceof ApiError && err.code === 'cancelled';
      if (err instanceof ApiError)
        for (const [field, message] of Object.entries(err.fieldMessages))
          if (field in emptyTags)
            batch.setError(`${tagsOf(item)}.${field as keyof typeof emptyTags}`, { message });
      patch(item.key, {
        status: cancelled ? 'cancelled' : 'failed',
        sent: 0,
        error: cancelled ? undefined : err instanceof Error ? err.message : 'The upload failed.',
      });
      return false;
    } finally {
      controllers.current.delete(item.key);
    }
  };

  /** One at a time: on a weak link, parallel uploads only make each one slower. */
  const sendAll = async (only?: Item) => {
    const queue = only
      ? [only]
      : itemsRef.current.filter((i) => i.status === 'ready' || i.status === 'cancelled');
    if (queue.length === 0) return;
    cancelAll.current = false;
    setRunning(true);
    for (const q of queue) patch(q.key, { status: 'waiting' });
    let any = false;
    for (const q of queue) {
      if (cancelAll.current) {
        patch(q.key, { status: 'cancelled' });
        continue;
      }
      const current = itemsRef.current.find((i) => i.key === q.key) ?? q;
      if (await sendOne(current)) any = true;
    }
    setRunning(false);
    if (any) await finished();
  };

  const cancel = () => {
    cancelAll.current = true;
    for (const c of controllers.current.values()) c.abort();
  };

  const totalBytes = items
    .filter((i) => i.status !== 'failed')
    .reduce((s, i) => s + i.file.size, 0);
  const sentBytes = items.filter((i) => i.status !== 'failed').reduce((s, i) => s + i.sent, 0);
  const done = items.filter((i) => i.status === 'done').length;
  const pending = items.filter((i) => i.status === 'ready' || i.status === 'cancelled').length;
  const batchPercent = totalBytes ? Math.round((sentBytes / totalBytes) * 100) : 0;
  const spiny = cautions['spiny-crop'];

  return (
    <article>
      <p className="text-sm">
        <Link to={`/t/${slug}/photos`} className="text-leaf-700 underline">
          Back to the photos
        </Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold text-leaf-900">Upload photos</h1>
      <p className="mt-1 max-w-prose text-loam-700">
        Location and camera details are removed from every photo; only the date it was taken is
        kept. JPEG, PNG, WebP or AVIF{limits.heicReadable ? ', HEIC' : ''}, up to{' '}
        {megabytes(limits.maxBytes)} each.
        {limits.heicReadable
          ? ''
          : ' HEIC photos cannot be read here: set the phone camera to JPEG ("most compatible").'}
      </p>
      <aside
        aria-label={`Caution: ${spiny.title}`}
        className="mt-3 rounded-lg border-l-4 border-pod-500 bg-straw-100 p-3 text-sm"
      >
        <p className="font-semibold text-loam-700">{spiny.title}</p>
        <ul className="mt-1 list-disc pl-5">
          {spiny.points.map((p) => (
            <li key={p}>{p}</li>
          ))}
        </ul>
      </aside>

      <section
        className="mt-4 rounded-lg bg-white p-3 shadow-sm"
        aria-labelledby="defaults-heading"
      >
        <h2 id="defaults-heading" className="font-semibold text-leaf-900">
          Tags for the next photos you add
        </h2>
        <p className="text-sm text-loam-700">Each photo can be changed below before it is sent.</p>
        <div className="mt-2">
          <PhotoTagFields form={defaults} tagging={tagging} />
        </div>
      </section>

      <div className="mt-4 flex flex-wrap gap-2">
        <label className="inline-flex min-h-11 cursor-pointer items-center rounded-lg bg-leaf-700 px-4 font-semibold text-white has-[:focus-visible]:outline-4 has-[:focus-visible]:outline-pod-500">
          Choose photos
          <input
            type="file"
            accept="image/jpeg,image/png,image/webp,image/avif,image/heic,image/heif"
            multiple
            className="sr-only"
            onChange={(e) => {
              addFiles(e.target.files);
              e.target.value = '';
            }}
          />
        </label>
        <label className="inline-flex min-h-11 cursor-pointer items-center rounded-lg border border-leaf-700 bg-white px-4 font-semibold text-leaf-700 has-[:focus-visible]:outline-4 has-[:focus-visible]:outline-pod-500">
          Take a photo
          <input
            type="file"
            accept="image/*"
            capture="environment"
            className="sr-only"
            onChange={(e) => {
              addFiles(e.target.files);
              e.target.value = '';
            }}
          />
        </label>
      </div>

      {items.length > 0 ? (
        <section className="mt-4" aria-labelledby="batch-heading">
          <h2 id="batch-heading" className="text-xl font-semibold text-leaf-900">
            {items.length === 1 ? '1 photo' : `${items.length} photos`}
          </h2>
          <div className="mt-2 rounded-lg bg-white p-3 shadow-sm">
            <label htmlFor="batch-progress" className="text-sm font-medium">
              All photos: {done} of {items.length} uploaded · {megabytes(sentBytes)} of{' '}
              {megabytes(totalBytes)} sent
            </label>
            <progress
              id="batch-progress"
              className="mt-1 block h-3 w-full accent-leaf-700"
              max={100}
              value={batchPercent}
            >
              {batchPercent}%
            </progress>
            <div className="mt-2 flex flex-wrap gap-2">
              <Button onClick={() => void sendAll()} disabled={running || pending === 0}>
                {running
                  ? 'Uploading…'
                  : pending === 1
                    ? 'Upload 1 photo'
                    : `Upload ${pending} photos`}
              </Button>
              {running ? (
                <Button variant="secondary" onClick={cancel}>
                  Cancel
                </Button>
              ) : null}
              {done > 0 && !running ? (
                <Link
                  to={`/t/${slug}/photos`}
                  className="inline-flex min-h-11 items-center rounded-lg px-3 font-semibold text-leaf-700 underline"
                >
                  See them in the gallery
                </Link>
              ) : null}
            </div>
          </div>

          <ul className="mt-3 space-y-3">
            {items.map((item, n) => {
              const percent = Math.round((item.sent / Math.max(1, item.file.size)) * 100);
              const locked =
                item.status === 'sending' || item.status === 'waiting' || item.status === 'done';
              return (
                <li
                  key={item.key}
                  className="rounded-lg bg-white p-3 shadow-sm"
                  aria-label={`Photo ${n + 1}: ${item.file.name}`}
                >
                  <div className="flex gap-3">
                    <img
                      src={item.preview}
                      alt=""
                      className="h-20 w-20 shrink-0 rounded object-cover"
                    />
                    <div className="min-w-0 flex-1">
                      <p className="truncate font-medium">{item.file.name}</p>
                      <p className="text-sm text-loam-700">
                        {megabytes(item.file.size)} ·{' '}
                        <span data-status={item.status}>{statusText[item.status]}</span>
                      </p>
                      <progress
                        aria-label={`Upload of ${item.file.name}`}
                        className="mt-1 block h-2 w-full accent-leaf-700"
                        max={100}
                        value={item.status === 'done' ? 100 : percent}
                      >
                        {percent}%
                      </progress>
                      {item.error ? (
                        <p role="alert" className="mt-1 text-sm text-frost-600">
                          {item.error}
                        </p>
                      ) : null}
                    </div>
                  </div>
                  <div className="mt-2">
                    <PhotoTagFields
                      form={batch}
                      name={tagsOf(item)}
                      tagging={tagging}
                      disabled={locked}
                    />
                  </div>
                  <div className="mt-2 flex flex-wrap gap-2">
                    {item.status === 'failed' && item.file.size <= limits.maxBytes ? (
                      <Button
                        variant="secondary"
                        disabled={running}
                        onClick={() => void sendAll(item)}
                      >
                        Retry
                      </Button>
                    ) : null}
                    {item.status === 'sending' ? (
                      <Button
                        variant="ghost"
                        onClick={() => controllers.current.get(item.key)?.abort()}
                      >
                        Cancel this one
                      </Button>
                    ) : null}
                    {!locked ? (
                      <Button
                        variant="ghost"
                        onClick={() => {
                          URL.revokeObjectURL(item.preview);
                          batch.unregister(tagsOf(item));
                          setItems((list) => list.filter((i) => i.key !== item.key));
                        }}
                      >
                        Remove
                      </Button>
                    ) : null}
                  </div>
                </li>
              );
            })}
          </ul>
          <p className="sr-only" aria-live="polite">
            {running ? `Uploading: ${batchPercent}% sent` : `${done} of ${items.length} uploaded`}
          </p>
        </section>
      ) : null}
    </article>
  );
}
