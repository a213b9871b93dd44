import { interactionNote } from '@common/contracts/results';
import { type DisplayUnit, displayUnit } from '@common/display-units';
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
import { tooltipStyle } from '@/components/ui/chart-palette';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useUnitSystem } from '@/lib/session';
import { useTrial } from '@/lib/trial';
import { useEntrySite, useHarvestCurve, useTraitAnalyses } from '../api/comparison';
import { EntrySiteChart, HarvestCurveChart } from '../components/comparison-charts';
import { CellMeansTable } from '../components/cell-means-table';
import { ComparisonTable } from '../components/comparison-table';

export function Component() {
  const { slug = '' } = useParams();
  const units = useUnitSystem();
  const trial = useTrial(slug);
  const traitKeys = useMemo(() => trial.data?.traits.map((t) => t.key) ?? [], [trial.data]);
  const [shown, setShown] = useState<string[] | null>(null);
  const visible = shown ?? traitKeys.slice(0, 4);
  const analyses = useTraitAnalyses(slug, visible);
  const [chartTrait, setChartTrait] = useState<string | null>(null);
  const chartKey = chartTrait ?? visible[0] ?? '';
  const chartIndex = visible.indexOf(chartKey);
  const chart = chartIndex >= 0 ? analyses[chartIndex]?.data : undefined;
  const curve = useHarvestCurve(slug);
  const multisite = trial.data?.design === 'multisite';
  const entrySite = useEntrySite(slug, chartKey, Boolean(multisite && chartKey));

  const byKey = new Map(visible.map((k, i) => [k, analyses[i]?.data]));
  if (trial.isPending) return <Spinner label="Loading the trial…" />;
  if (trial.error) return <ErrorPanel error={trial.error} />;
  const loading = analyses.some((a) => a.isPending);
  const failed = analyses.find((a) => a.error);
  // The chart's axis in the same unit as the trait's column in the table.
  const chartUnit: DisplayUnit = displayUnit(
    chart?.unit ?? '',
    units,
    chart?.grandMean ?? 0,
    trial.data.traits.find((t) => t.key === chartKey)?.displayUnit,
  );
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

      <ComparisonTable
        entries={trial.data.entries}
        traits={visible.flatMap((k) => trial.data.traits.filter((t) => t.key === k))}
        analyses={byKey}
        units={units}
      />

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
              <Tooltip {...tooltipStyle} />
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

      {trial.data.factor && chart?.twoFactor ? (
        <section className="mt-6" aria-labelledby="cells-heading">
          <h2 id="cells-heading" className="text-xl font-semibold text-leaf-900">
            Entries × {trial.data.factor.name.toLowerCase()}
          </h2>
          <p className="text-sm text-loam-700">
            {trial.data.traits.find((t) => t.key === chartKey)?.label}: the trait chosen for the
            chart above. {interactionNote(chart)}
          </p>
          <CellMeansTable
            twoFactor={chart.twoFactor}
            varieties={chart.means.map((m) => m.variety)}
            traitLabel={trial.data.traits.find((t) => t.key === chartKey)?.label ?? chartKey}
            unit={chartUnit}
            decimals={chart.decimals.mean}
          />
        </section>
      ) : null}

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
