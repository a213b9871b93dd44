import type { Photo, PhotoTagging } from '@common/contracts/photos';
import { Link, useParams, useSearchParams } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { usePhotoTagging } from '../api/get-photo-tagging';
import { usePhotos } from '../api/get-photos';
import { PhotoBrowser } from '../components/photo-browser';
import { PhotoGrid } from '../components/photo-grid';

const views = [
  ['entry', 'By entry'],
  ['plot', 'By plot'],
  ['date', 'By date'],
] as const;
type View = (typeof views)[number][0];

interface Group {
  key: string;
  title: string;
  photos: Photo[];
}

function groupPhotos(photos: Photo[], view: View, tagging: PhotoTagging): Group[] {
  const groups = new Map<string, Group>();
  const add = (key: string, title: string, p: Photo) => {
    const g = groups.get(key) ?? { key, title, photos: [] };
    g.photos.push(p);
    groups.set(key, g);
  };
  for (const p of photos) {
    if (view === 'entry') {
      const e = tagging.entries.find((x) => x.id === p.entryId);
      add(p.entryId ?? 'none', e ? `${e.code} · ${e.name}` : 'No entry', p);
    } else if (view === 'plot') {
      const pl = tagging.plots.find((x) => x.id === p.plotId);
      add(p.plotId ?? 'none', pl ? `${pl.siteName} · plot ${pl.plotNumber}` : 'No plot', p);
    } else {
      add(p.takenOn ?? 'none', p.takenOn ?? 'No date', p);
    }
  }
  const order =
    view === 'entry'
      ? tagging.entries.map((e) => e.id)
      : view === 'plot'
        ? tagging.plots.map((p) => p.id)
        : [...groups.keys()].sort().reverse();
  return [...groups.values()].sort((a, b) => {
    const ia = order.indexOf(a.key);
    const ib = order.indexOf(b.key);
    return (ia < 0 ? 1e9 : ia) - (ib < 0 ? 1e9 : ib);
  });
}

export function Component() {
  const { slug = '' } = useParams();
  const [params, setParams] = useSearchParams();
  const view = (views.find(([v]) => v === params.get('view'))?.[0] ?? 'entry') as View;
  const entryId = params.get('entry') ?? undefined;
  const tagging = usePhotoTagging(slug);
  const photos = usePhotos(slug, entryId ? { entryId } : {});
  if (tagging.isPending || photos.isPending) return <Spinner label="Loading photos…" />;
  if (tagging.error) return <ErrorPanel error={tagging.error} />;
  if (photos.error) return <ErrorPanel error={photos.error} />;
  const t = tagging.data;
  const list = photos.data.photos;
  const groups = groupPhotos(list, view, t);
  const setParam = (k: string, v: string | undefined) => {
    const next = new URLSearchParams(params);
    if (v) next.set(k, v);
    else next.delete(k);
    setParams(next, { replace: true });
  };

  return (
    <article>
      <p className="text-sm">
        <Link to={`/t/${slug}`} className="text-leaf-700 underline">
          Back to the trial
        </Link>
      </p>
      <div className="mt-1 flex flex-wrap items-center justify-between gap-2">
        <h1 className="text-3xl font-semibold text-leaf-900">Photos</h1>
        <div className="flex flex-wrap gap-2">
          <Link
            to={`/t/${slug}/photos/compare`}
            className="inline-flex min-h-11 items-center rounded-lg border border-leaf-700 bg-white px-4 font-semibold text-leaf-700"
          >
            Side by side
          </Link>
          {t.permissions.upload ? (
            <Link
              to={`/t/${slug}/photos/upload`}
              className="inline-flex min-h-11 items-center rounded-lg bg-leaf-700 px-4 font-semibold text-white"
            >
              Upload photos
            </Link>
          ) : null}
        </div>
      </div>

      <div className="mt-3 flex flex-wrap items-end gap-3">
        <fieldset className="flex flex-wrap gap-1" aria-label="Group photos">
          <legend className="sr-only">Group photos</legend>
          {views.map(([v, label]) => (
            <label
              key={v}
              className={`inline-flex min-h-11 cursor-pointer items-center rounded-lg px-3 font-medium has-[:focus-visible]:outline-4 has-[:focus-visible]:outline-pod-500 ${view === v ? 'bg-leaf-100 text-leaf-900' : 'bg-white text-leaf-700'}`}
            >
              <input
                type="radio"
                name="view"
                value={v}
                checked={view === v}
                onChange={() => setParam('view', v === 'entry' ? undefined : v)}
                className="sr-only"
              />
              {label}
            </label>
          ))}
        </fieldset>
        <div>
          <label htmlFor="gallery-entry" className="block text-sm font-medium">
            Entry
          </label>
          <select
            id="gallery-entry"
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
            value={entryId ?? ''}
            onChange={(e) => setParam('entry', e.target.value || undefined)}
          >
            <option value="">All entries</option>
            {t.entries.map((e) => (
              <option key={e.id} value={e.id}>
                {e.code} · {e.name}
              </option>
            ))}
          </select>
        </div>
      </div>

      <p className="mt-2 text-sm text-loam-700" aria-live="polite">
        {list.length === 1 ? '1 photo' : `${list.length} photos`}
      </p>

      <PhotoBrowser slug={slug} photos={groups.flatMap((g) => g.photos)} tagging={t}>
        {(open) =>
          groups.length === 0 ? (
            <p className="mt-4 rounded-lg bg-white p-4 shadow-sm">
              No photos yet.{' '}
              {t.permissions.upload ? (
                <Link to={`/t/${slug}/photos/upload`} className="text-leaf-700 underline">
                  Upload the first ones
                </Link>
              ) : null}
            </p>
          ) : (
            groups.map((g) => (
              <section key={g.key} className="mt-5" aria-labelledby={`group-${g.key}`}>
                <h2 id={`group-${g.key}`} className="mb-2 text-xl font-semibold text-leaf-900">
                  {g.title}{' '}
                  <span className="text-base font-normal text-loam-700">({g.photos.length})</span>
                </h2>
                <PhotoGrid photos={g.photos} onOpen={open} label={`Photos: ${g.title}`} />
              </section>
            ))
          )
        }
      </PhotoBrowser>
    </article>
  );
}
