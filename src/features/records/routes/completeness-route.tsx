import { addDays, localToday } from '@common/calendar-date';
import { createColumnHelper } from '@tanstack/react-table';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { DataTable } from '@/components/ui/data-table';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useTrial } from '@/lib/trial';
import { useCompleteness } from '../api/record-api';
import { FilterBar, FilterInput, SiteFilter } from '../components/record-log';
import { RecordsNav } from '../components/records-nav';
import { ScrollRegion } from '@/components/ui/scroll-region';

interface Row {
  plotId: string;
  plot: string;
  entry: string;
  harvests: number;
  /** trait id -> records in the round */
  counts: Record<string, number>;
}
const col = createColumnHelper<Row>();

/** The round is the last seven days on this device's calendar. */
const isoDaysAgo = (n: number) => addDays(localToday(), -n);

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
  const rows: Row[] = (data?.plots ?? []).map((p) => ({
    plotId: p.plotId,
    plot: `${p.siteName} ${p.plotNumber}`,
    entry: p.entryCode,
    harvests: harvests(p.plotId),
    counts: Object.fromEntries((data?.traits ?? []).map((t) => [t.id, count(p.plotId, t.id)])),
  }));
  const columns = [
    col.accessor('plot', {
      header: 'Plot',
      // Numbers sort as numbers: plot 9 before plot 10.
      sortingFn: (a, b) =>
        a.original.plot.localeCompare(b.original.plot, undefined, { numeric: true }),
    }),
    col.accessor('entry', { header: 'Entry' }),
    col.accessor('harvests', { header: 'Harvests', cell: (c) => c.getValue() || '—' }),
    ...(data?.traits ?? []).map((t) =>
      col.accessor((r) => r.counts[t.id] ?? 0, {
        id: t.id,
        header: t.label,
        cell: (c) => (c.getValue() ? `✓ ${c.getValue()}` : 'missing'),
        meta: {
          cellClassName: (r: Row) =>
            r.counts[t.id]
              ? 'bg-leaf-50 text-leaf-900'
              : 'bg-straw-100 font-semibold text-frost-600',
        },
      }),
    ),
  ];
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
      <FilterBar>
        <SiteFilter sites={trial.data.sites} value={siteId} onChange={setSiteId} />
        <FilterInput label="Round from" type="date" value={from} onChange={setFrom} />
        <FilterInput label="to" type="date" value={to} onChange={setTo} />
        {trial.data.permissions['records.write'] ? (
          <Link
            to={`/t/${slug}/log`}
            className="inline-flex min-h-11 items-center rounded-lg bg-leaf-700 px-3 font-semibold text-white"
          >
            Open the field log
          </Link>
        ) : null}
      </FilterBar>
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
          <ScrollRegion
            label="Records per plot and trait"
            className="rounded-lg bg-white shadow-sm"
          >
            <DataTable
              caption={`Records per plot and trait between ${from} and ${to}`}
              data={rows}
              columns={columns}
              rowId={(r) => r.plotId}
              rowHeader="plot"
              chooseColumns
            />
          </ScrollRegion>
        </>
      ) : null}
    </article>
  );
}
