import { Link, useParams, useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { usePhotoTagging } from '../api/get-photo-tagging';
import { usePhotos } from '../api/get-photos';
import { PhotoBrowser } from '../components/photo-browser';
import { PhotoThumb } from '../components/photo-thumb';
import { addDays, isCalendarDate, localToday, weekStartOf } from '@common/calendar-date';

const MAX_ENTRIES = 4;

export function Component() {
  const { slug = '' } = useParams();
  const [params, setParams] = useSearchParams();
  const asked = params.get('week');
  // Without a week asked for, the latest week that has photos (newest first from the server).
  const all = usePhotos(slug);
  const latest = all.data?.photos.find((p) => p.takenOn)?.takenOn ?? null;
  const from = weekStartOf(asked && isCalendarDate(asked) ? asked : (latest ?? localToday()));
  const to = addDays(from, 6);
  const chosen = (params.get('entries') ?? '').split(',').filter(Boolean).slice(0, MAX_ENTRIES);
  const tagging = usePhotoTagging(slug);
  const photos = usePhotos(slug, { from, to });

  const update = (patch: { week?: string; entries?: string[] }) => {
    const next = new URLSearchParams(params);
    if (patch.week) next.set('week', patch.week);
    if (patch.entries) next.set('entries', patch.entries.join(','));
    setParams(next, { replace: true });
  };

  if (tagging.isPending || (!asked && all.isPending)) return <Spinner label="Loading entries…" />;
  if (tagging.error) return <ErrorPanel error={tagging.error} />;
  const t = tagging.data;
  const columns = chosen
    .map((id) => t.entries.find((e) => e.id === id))
    .filter((e): e is NonNullable<typeof e> => Boolean(e));
  const weekPhotos = photos.data?.photos ?? [];
  const shown = columns.flatMap((e) => weekPhotos.filter((p) => p.entryId === e.id));

  return (
    <article>
      <p className="text-sm">
        <Link to={`/t/${slug}/photos`} className="text-leaf-700 underline">
          All photos
        </Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold text-leaf-900">Side by side</h1>
      <p className="mt-1 max-w-prose text-loam-700">
        Choose two to four entries to see their photos from the same week next to each other.
      </p>

      <fieldset className="mt-3 rounded-lg bg-white p-3 shadow-sm">
        <legend className="px-1 font-semibold">
          Entries ({chosen.length} of at most {MAX_ENTRIES})
        </legend>
        <div className="flex flex-wrap gap-x-4 gap-y-1">
          {t.entries.map((e) => {
            const on = chosen.includes(e.id);
            return (
              <label key={e.id} className="inline-flex min-h-11 items-center gap-2">
                <input
                  type="checkbox"
                  className="h-5 w-5 accent-leaf-700"
                  checked={on}
                  disabled={!on && chosen.length >= MAX_ENTRIES}
                  onChange={() =>
                    update({ entries: on ? chosen.filter((x) => x !== e.id) : [...chosen, e.id] })
                  }
                />
                {e.code} · {e.name}
              </label>
            );
          })}
        </div>
      </fieldset>

      <div className="mt-3 flex flex-wrap items-end gap-2">
        <Button variant="secondary" onClick={() => update({ week: addDays(from, -7) })}>
          ‹ Week before
        </Button>
        <div>
          <label htmlFor="compare-week" className="block text-sm font-medium">
            Week of
          </label>
          <input
            id="compare-week"
            type="date"
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
            value={from}
            onChange={(e) => e.target.value && update({ week: e.target.value })}
          />
        </div>
        <Button variant="secondary" onClick={() => update({ week: addDays(from, 7) })}>
          Week after ›
        </Button>
        <p className="text-sm text-loam-700" aria-live="polite">
          {from} to {to}
        </p>
      </div>

      {columns.length < 2 ? (
        <p className="mt-4 rounded-lg bg-white p-4 shadow-sm">Choose at least two entries.</p>
      ) : photos.error ? (
        <ErrorPanel error={photos.error} />
      ) : photos.isPending ? (
        <Spinner label="Loading photos…" />
      ) : (
        <PhotoBrowser slug={slug} photos={shown} tagging={t}>
          {(open) => (
            <div
              className="mt-4 grid gap-2"
              style={{ gridTemplateColumns: `repeat(${columns.length}, minmax(0, 1fr))` }}
            >
              {columns.map((e) => {
                const own = weekPhotos.filter((p) => p.entryId === e.id);
                return (
                  <section
                    key={e.id}
                    aria-labelledby={`col-${e.id}`}
                    className="min-w-0 rounded-lg bg-white p-2 shadow-sm"
                  >
                    <h2
                      id={`col-${e.id}`}
                      className="truncate font-semibold text-leaf-900"
                      title={e.name}
                    >
                      {e.code} · {e.name}
                    </h2>
                    {own.length === 0 ? (
                      <p className="text-sm text-loam-700">No photos this week.</p>
                    ) : (
                      <ul aria-label={`Photos of ${e.name}`} className="mt-1 space-y-2">
                        {own.map((p) => (
                          <li key={p.id}>
                            <button
                              type="button"
                              className="block w-full rounded-md focus-visible:outline-4 focus-visible:outline-pod-500"
                              aria-label={`Open photo: ${p.caption}`}
                              onClick={() => open(p)}
                            >
                              <PhotoThumb
                                photo={p}
                                sizes={`${Math.round(90 / columns.length)}vw`}
                              />
                            </button>
                            <p className="mt-0.5 text-xs text-loam-700">
                              {p.takenOn} · {p.caption}
                            </p>
                          </li>
                        ))}
                      </ul>
                    )}
                  </section>
                );
              })}
            </div>
          )}
        </PhotoBrowser>
      )}
    </article>
  );
}
