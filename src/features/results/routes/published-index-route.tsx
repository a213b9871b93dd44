import { utcDateOf } from '@common/calendar-date';
import { useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { usePublishedSheets } from '../api/get-published-sheets';

/** Every published results sheet, newest first, searchable by crop or variety; open to anyone. */
export function Component() {
  const [params, setParams] = useSearchParams();
  const q = params.get('q') ?? '';
  const page = Math.max(1, Number(params.get('page')) || 1);
  const [typed, setTyped] = useState(q);
  const { data, isPending, error, isPlaceholderData } = usePublishedSheets({ q, page });
  const pages = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;
  const go = (next: { q?: string; page?: number }) => {
    const p = new URLSearchParams();
    const nq = next.q ?? q;
    if (nq) p.set('q', nq);
    if ((next.page ?? 1) > 1) p.set('page', String(next.page));
    setParams(p);
  };

  return (
    <section className="space-y-4">
      <h1 className="text-3xl font-semibold text-leaf-900">Published results sheets</h1>
      <p className="max-w-prose text-loam-700">
        Ranked results from finished trials, open to everyone to read, print and download.
      </p>
      <form
        role="search"
        className="flex max-w-xl flex-col gap-2 sm:flex-row sm:items-end"
        onSubmit={(e) => {
          e.preventDefault();
          go({ q: typed.trim(), page: 1 });
        }}
      >
        <label className="flex flex-1 flex-col text-sm font-medium">
          Crop or variety
          <input
            type="search"
            value={typed}
            maxLength={100}
            onChange={(e) => setTyped(e.target.value)}
            className="mt-1 min-h-11 rounded-lg border border-leaf-300 bg-white px-3"
          />
        </label>
        <Button type="submit">Search</Button>
      </form>
      {isPending ? (
        <Spinner label="Loading the published sheets…" />
      ) : error ? (
        <ErrorPanel error={error} />
      ) : (
        <>
          <p role="status" className="text-sm text-loam-700">
            {data.total === 0
              ? q
                ? `No published sheet matches “${q}”.`
                : 'Nothing is published yet.'
              : `${data.total} ${data.total === 1 ? 'sheet' : 'sheets'}${q ? ` matching “${q}”` : ''} · page ${page} of ${pages}`}
          </p>
          <ul
            className={`grid gap-3 sm:grid-cols-2 ${isPlaceholderData ? 'opacity-60' : ''}`}
            aria-busy={isPlaceholderData}
          >
            {data.sheets.map((s) => (
              <li key={s.slug}>
                <Link
                  to={`/r/${s.slug}`}
                  className="block rounded-xl border border-leaf-100 bg-white p-4 shadow-sm transition hover:border-leaf-500"
                >
                  <p className="text-sm uppercase tracking-wide text-loam-700">
                    {s.crop} · {s.season}
                  </p>
                  <h2 className="mt-1 text-xl font-semibold text-leaf-900">{s.title}</h2>
                  <p className="mt-2 text-sm">
                    {s.entryCount} {s.entryCount === 1 ? 'entry' : 'entries'} · version {s.version}{' '}
                    · published {utcDateOf(s.publishedAt)}
                  </p>
                </Link>
              </li>
            ))}
          </ul>
          {pages > 1 ? (
            <nav aria-label="Pages" className="flex items-center gap-2">
              <Button
                type="button"
                variant="secondary"
                disabled={page <= 1}
                onClick={() => go({ page: page - 1 })}
              >
                Newer sheets
              </Button>
              <Button
                type="button"
                variant="secondary"
                disabled={page >= pages}
                onClick={() => go({ page: page + 1 })}
              >
                Older sheets
              </Button>
            </nav>
          ) : null}
        </>
      )}
    </section>
  );
}
