import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useTrial } from '@/lib/trial';
import { useCompleteness } from '../api/record-api';
import { RecordsNav } from '../components/records-nav';

const isoDaysAgo = (n: number) => {
  const d = new Date();
  d.setDate(d.getDate() - n);
  return d.toLocaleDateString('en-CA');
};

/** Plots × traits for the current round: what has been recorded, and what is still missing. */
export function Component() {
  const { slug = '' } = useParams();
  const trial = useTrial(slug);
  const [siteId, setSiteId] = useState<string>('');
  const [from, setFrom] = useState(() => isoDaysAgo(6));
  const [to, setTo] = useState(() => isoDaysAgo(0));
  const grid = useCompleteness(slug, { siteId: siteId || undefined, from, to });

  if (trial.isPending) return <Spinner />;
  if (trial.error) return <ErrorPanel error={trial.error} />;
  const data = grid.data;
  const count = (plotId: string, traitId: string) =>
    data?.cells.find((c) => c.plotId === plotId && c.traitId === traitId)?.count ?? 0;
  const harvests = (plotId: string) => data?.harvests.find((h) => h.plotId === plotId)?.count ?? 0;
  const missing = data
    ? data.plots.reduce(
        (a, p) => a + data.traits.filter((t) => count(p.plotId, t.id) === 0).length,
        0,
      )
    : 0;

  return (
    <article className="space-y-3">
      <h1 className="text-2xl font-semibold text-leaf-900">Completeness · {trial.data.title}</h1>
      <RecordsNav slug={slug} />
      <div className="flex flex-wrap items-end gap-2 rounded-lg bg-white p-3 shadow-sm">
        <label className="flex flex-col gap-1 text-sm font-medium">
          Site
          <select
            value={siteId}
            onChange={(e) => setSiteId(e.target.value)}
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
          >
            <option value="">All sites</option>
            {trial.data.sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-sm font-medium">
          Round from
          <input
            type="date"
            value={from}
            onChange={(e) => setFrom(e.target.value)}
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
          />
        </label>
        <label className="flex flex-col gap-1 text-sm font-medium">
          to
          <input
            type="date"
            value={to}
            onChange={(e) => setTo(e.target.value)}
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
          />
        </label>
        {trial.data.permissions['records.write'] ? (
          <Link
            to={`/t/${slug}/log`}
            className="inline-flex min-h-11 items-center rounded-lg bg-leaf-700 px-3 font-semibold text-white"
          >
            Open the field log
          </Link>
        ) : null}
      </div>
      {grid.isPending ? (
        <Spinner label="Counting the round…" />
      ) : grid.error ? (
        <ErrorPanel error={grid.error} />
      ) : data ? (
        <>
          <p role="status">
            {missing === 0
              ? 'Every plot has every trait recorded in this round.'
              : `${missing} plot × trait cells still missing in this round.`}
          </p>
          <div className="overflow-x-auto rounded-lg bg-white shadow-sm">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">
                Records per plot and trait between {from} and {to}
              </caption>
              <thead className="bg-leaf-50">
                <tr>
                  <th className="p-2">Plot</th>
                  <th className="p-2">Entry</th>
                  <th className="p-2">Harvests</th>
                  {data.traits.map((t) => (
                    <th key={t.id} className="p-2">
                      {t.label}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {data.plots.map((p) => (
                  <tr key={p.plotId} className="border-t border-leaf-50">
                    <th scope="row" className="p-2 font-semibold">
                      {p.siteName} {p.plotNumber}
                    </th>
                    <td className="p-2">{p.entryCode}</td>
                    <td className="p-2">{harvests(p.plotId) || '—'}</td>
                    {data.traits.map((t) => {
                      const n = count(p.plotId, t.id);
                      return (
                        <td
                          key={t.id}
                          className={`p-2 ${n ? 'bg-leaf-50 text-leaf-900' : 'bg-straw-100 font-semibold text-frost-600'}`}
                        >
                          {n ? `✓ ${n}` : 'missing'}
                        </td>
                      );
                    })}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </>
      ) : null}
    </article>
  );
}
