import type { TrialAnalysis } from '@common/contracts/analysis';
import { type DisplayUnit, displayUnit, formatInUnit, formatNumber } from '@common/display-units';
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getSortedRowModel,
  type SortingState,
  useReactTable,
} from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import {
  Bar,
  CartesianGrid,
  ComposedChart,
  ErrorBar,
  ResponsiveContainer,
  Scatter,
  Tooltip,
  XAxis,
  YAxis,
} from 'recharts';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useUnitSystem } from '@/lib/session';
import { useTrial } from '@/lib/trial';
import { directionSign, directionWords, type TraitDirection } from '@common/ranking';
import { useEntrySite, useHarvestCurve, useTraitAnalyses } from '../api/comparison';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { EntrySiteChart, HarvestCurveChart } from '../components/comparison-charts';

type Row = {
  variety: string;
  code: string;
  cells: Record<string, TrialAnalysis['means'][number] | undefined>;
};
const column = createColumnHelper<Row>();

/** Trait columns sort best first on the first press; a trait with no direction, highest first. */
function sortText(direction: TraitDirection, sorted: false | 'asc' | 'desc') {
  if (!sorted) return '';
  if (direction === 'none') return sorted === 'desc' ? ' ▼' : ' ▲';
  return sorted === 'desc' ? ' (best first)' : ' (worst first)';
}

/** aria-sort describes the shown means, which run opposite to "best" when lower is better. */
function ariaSort(direction: TraitDirection | undefined, sorted: false | 'asc' | 'desc') {
  if (!sorted) return 'none' as const;
  const flip = direction === 'lower';
  return (sorted === 'desc') !== flip ? ('descending' as const) : ('ascending' as const);
}

export function Component() {
  const { slug = '' } = useParams();
  const units = useUnitSystem();
  const trial = useTrial(slug);
  const traitKeys = useMemo(() => trial.data?.traits.map((t) => t.key) ?? [], [trial.data]);
  const [shown, setShown] = useState<string[] | null>(null);
  const visible = shown ?? traitKeys.slice(0, 4);
  const analyses = useTraitAnalyses(slug, visible);
  const [sorting, setSorting] = useState<SortingState>([]);
  const [chartTrait, setChartTrait] = useState<string | null>(null);
  const chartKey = chartTrait ?? visible[0] ?? '';
  const chartIndex = visible.indexOf(chartKey);
  const chart = chartIndex >= 0 ? analyses[chartIndex]?.data : undefined;
  const curve = useHarvestCurve(slug);
  const multisite = trial.data?.design === 'multisite';
  const entrySite = useEntrySite(slug, chartKey, Boolean(multisite && chartKey));

  const byKey = new Map(visible.map((k, i) => [k, analyses[i]?.data]));
  const rows: Row[] = useMemo(() => {
    const entries = trial.data?.entries ?? [];
    return entries.map((e) => ({
      variety: e.name,
      code: e.code,
      cells: Object.fromEntries(
        visible.map((k) => [k, byKey.get(k)?.means.find((m) => m.variety === e.name)]),
      ),
    }));
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [trial.data, visible.join(','), analyses.map((a) => a.dataUpdatedAt).join(',')]);

  const columns = useMemo(
    () => [
      column.accessor('variety', {
        header: 'Variety',
        cell: (c) => <span className="font-medium">{c.getValue()}</span>,
      }),
      ...visible.map((k) => {
        const trait = trial.data?.traits.find((t) => t.key === k);
        const label = trait?.label ?? k;
        const direction = trait?.direction ?? 'none';
        const analysis = byKey.get(k);
        const du = displayUnit(analysis?.unit ?? '', units, analysis?.grandMean ?? 0);
        // Sorted by how good the mean is, so "descending" always puts the best entry first.
        const goodness = directionSign(direction) || 1;
        return column.accessor((r) => (r.cells[k] ? goodness * r.cells[k].mean : null), {
          id: k,
          header: label,
          sortDescFirst: true,
          sortUndefined: 'last',
          cell: (c) => {
            const m = c.row.original.cells[k];
            if (!m) return '—';
            return (
              <span className="tabular-nums">
                {formatInUnit(m.mean, du)} ± {formatNumber(m.se === null ? null : m.se * du.factor)}{' '}
                <span className="font-mono text-leaf-700">{m.group}</span>
                {m.rank === null ? null : <span className="text-xs text-loam-700"> #{m.rank}</span>}
              </span>
            );
          },
        });
      }),
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [visible.join(','), units, trial.data, analyses.map((a) => a.dataUpdatedAt).join(',')],
  );
  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });

  const directionOf = (key: string) => trial.data?.traits.find((t) => t.key === key)?.direction;
  if (trial.isPending) return <Spinner label="Loading the trial…" />;
  if (trial.error) return <ErrorPanel error={trial.error} />;
  const loading = analyses.some((a) => a.isPending);
  const failed = analyses.find((a) => a.error);
  const chartUnit: DisplayUnit = displayUnit(chart?.unit ?? '', units, chart?.grandMean ?? 0);
  const conv = (v: number) => v * chartUnit.factor;
  const meansData =
    chart?.means.map((m) => ({
      variety: m.variety,
      mean: conv(m.mean),
      se: m.se === null ? 0 : conv(m.se),
    })) ?? [];
  const dots = chart?.plotValues.map((p) => ({ variety: p.entry, value: conv(p.value) })) ?? [];
  const curveMax = Math.max(
    0,
    ...(curve.data?.entries.flatMap((e) => e.points.map((p) => p.cumulativeMassG)) ?? []),
  );
  const massUnit = displayUnit('g', units, curveMax);
  const siteUnit = displayUnit(
    entrySite.data?.unit ?? '',
    units,
    entrySite.data?.cells[0]?.mean ?? 0,
  );

  return (
    <div>
      <p className="text-sm text-loam-700">
        <Link to={`/t/${slug}`} className="underline">
          {trial.data.title}
        </Link>
      </p>
      <h1 className="text-3xl font-semibold text-leaf-900">Compare entries</h1>

      <fieldset className="mt-3 rounded-lg bg-white p-3 shadow-sm">
        <legend className="px-1 text-sm font-semibold">Traits in the table</legend>
        <div className="flex flex-wrap gap-3">
          {trial.data.traits.map((t) => (
            <label key={t.key} className="flex min-h-11 items-center gap-2 text-sm">
              <input
                type="checkbox"
                className="h-5 w-5"
                checked={visible.includes(t.key)}
                onChange={(e) =>
                  setShown(
                    e.target.checked ? [...visible, t.key] : visible.filter((k) => k !== t.key),
                  )
                }
              />
              {t.label}
            </label>
          ))}
        </div>
      </fieldset>

      {failed?.error ? (
        <div className="mt-3">
          <ErrorPanel error={failed.error} title="A trait could not be analysed" />
        </div>
      ) : null}
      {loading ? <Spinner label="Analysing the chosen traits…" /> : null}

      <ScrollRegion label="Entries compared" className="mt-3 rounded-lg bg-white shadow-sm">
        <table className="w-full min-w-[28rem] text-left text-sm">
          <caption className="p-2 text-left text-xs text-loam-700">
            Mean ± SE, letter group (same letter: not significantly different, Tukey's HSD at α =
            0.05) and rank (#1 = best in the trait's direction; traits with no preferred direction
            are not ranked). Select a header to sort, best first.
          </caption>
          <thead className="bg-leaf-50">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => (
                  <th
                    key={h.id}
                    scope="col"
                    className="p-2"
                    aria-sort={ariaSort(directionOf(h.column.id), h.column.getIsSorted())}
                  >
                    <button
                      type="button"
                      className="min-h-11 text-left font-semibold"
                      onClick={h.column.getToggleSortingHandler()}
                    >
                      {flexRender(h.column.columnDef.header, h.getContext())}
                      {directionOf(h.column.id) ? (
                        <span className="block text-xs font-normal text-loam-700">
                          {directionWords[directionOf(h.column.id)!]}
                        </span>
                      ) : null}
                      {sortText(directionOf(h.column.id) ?? 'none', h.column.getIsSorted())}
                    </button>
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((r) => (
              <tr key={r.id} className="border-t border-leaf-50">
                {r.getVisibleCells().map((c) => (
                  <td key={c.id} className="p-2">
                    {flexRender(c.column.columnDef.cell, c.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>

      <section className="mt-6" aria-labelledby="chart-heading">
        <div className="flex flex-wrap items-end gap-3">
          <h2 id="chart-heading" className="text-xl font-semibold text-leaf-900">
            Entry means and plot values
          </h2>
          <label className="text-sm">
            Trait{' '}
            <select
              className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
              value={chartKey}
              onChange={(e) => setChartTrait(e.target.value)}
            >
              {visible.map((k) => (
                <option key={k} value={k}>
                  {trial.data.traits.find((t) => t.key === k)?.label ?? k}
                </option>
              ))}
            </select>
          </label>
        </div>
        <figure className="mt-2 h-80 rounded-lg bg-white p-2 shadow-sm">
          <ResponsiveContainer width="100%" height="100%">
            <ComposedChart data={meansData} margin={{ left: 8, right: 8, bottom: 40 }}>
              <CartesianGrid strokeDasharray="3 3" />
              <XAxis
                dataKey="variety"
                type="category"
                allowDuplicatedCategory={false}
                angle={-30}
                textAnchor="end"
                interval={0}
                height={60}
              />
              <YAxis label={{ value: chartUnit.label, angle: -90, position: 'insideLeft' }} />
              <Tooltip />
              <Bar dataKey="mean" name={`Mean (${chartUnit.label})`} fill="#8fbf98">
                <ErrorBar dataKey="se" width={6} stroke="#1b3822" />
              </Bar>
              <Scatter data={dots} dataKey="value" name="Plot values" fill="#a8631a" />
            </ComposedChart>
          </ResponsiveContainer>
          <figcaption className="sr-only">
            Bars: entry means with ± 1 standard error; dots: the plot values behind them.
          </figcaption>
        </figure>
      </section>

      <section className="mt-6" aria-labelledby="curve-heading">
        <h2 id="curve-heading" className="text-xl font-semibold text-leaf-900">
          Cumulative marketable harvest per plot
        </h2>
        {curve.isPending ? (
          <Spinner />
        ) : curve.error ? (
          <ErrorPanel error={curve.error} />
        ) : (
          <figure className="mt-2 h-80 rounded-lg bg-white p-2 shadow-sm">
            <HarvestCurveChart curve={curve.data} unit={massUnit} />
            <figcaption className="sr-only">
              Mean marketable mass harvested per plot up to each date, one line per entry.
            </figcaption>
          </figure>
        )}
      </section>

      {multisite ? (
        <section className="mt-6" aria-labelledby="sites-heading">
          <h2 id="sites-heading" className="text-xl font-semibold text-leaf-900">
            Entries at each site
          </h2>
          {entrySite.isPending ? (
            <Spinner />
          ) : entrySite.error ? (
            <ErrorPanel error={entrySite.error} />
          ) : (
            <figure className="mt-2 h-80 rounded-lg bg-white p-2 shadow-sm">
              <EntrySiteChart data={entrySite.data} unit={siteUnit} />
              <figcaption className="sr-only">
                Entry means at each site; crossing lines show entries that rank differently by site.
              </figcaption>
            </figure>
          )}
        </section>
      ) : null}
    </div>
  );
}
