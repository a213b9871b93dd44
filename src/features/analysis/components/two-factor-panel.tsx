/**
 * A two-factor trial (treatment × variety): the strata in words, the interaction plot (the
 * treatment on the x axis, one line per variety) with its table alternative, the treatment
 * means and the simple effects of the treatment within each variety.
 */
import { type TrialAnalysis, type TwoFactor, twoFactorNote } from '@common/contracts/analysis';
import { type DisplayUnit, formatNumber, formatP } from '@common/display-units';
import {
  CartesianGrid,
  Legend,
  Line,
  LineChart,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from 'recharts';
import { createColumnHelper } from '@tanstack/react-table';
import { seriesColour, tooltipStyle } from '@/components/ui/chart-palette';
import { DataTable } from '@/components/ui/data-table';
import { ScrollRegion } from '@/components/ui/scroll-region';

type Mean = { mean: number; se: number };
/** A row of the cell means table: a variety's cells and its mean, or the treatment means. */
type MeanRow = {
  id: string;
  kind: 'variety' | 'margin';
  name: string;
  cells: (Mean | undefined)[];
  margin?: Mean;
};
const meanCol = createColumnHelper<MeanRow>();
const effectCol = createColumnHelper<TwoFactor['treatmentWithinVariety'][number]>();

/** One row per treatment level, one column per variety (keys v0, v1 …: names may hold dots). */
export function interactionTable(t: TwoFactor, factor: number) {
  const varieties = [...new Set(t.cellMeans.map((c) => c.variety))];
  const rows = t.levels.map((level) => {
    const row: Record<string, string | number | null> = { treatment: level };
    varieties.forEach((v, i) => {
      const cell = t.cellMeans.find((c) => c.variety === v && c.treatment === level);
      row[`v${i}`] = cell ? cell.mean * factor : null;
    });
    return row;
  });
  return { rows, series: varieties.map((name, i) => ({ key: `v${i}`, name })) };
}

export function TwoFactorPanel({
  result,
  unit,
  size,
}: {
  result: TrialAnalysis;
  unit: DisplayUnit;
  /** A fixed chart size for tests (jsdom has no layout); the page fills its box. */
  size?: { width: number; height: number };
}) {
  const t = result.twoFactor;
  if (!t) return null;
  const f = unit.factor;
  const inUnit = unit.label ? ` (${unit.label})` : '';
  const factor = t.factor.toLowerCase();
  const meanText = (m: Mean | undefined) =>
    m ? `${formatNumber(m.mean * f)} ± ${formatNumber(m.se * f, 3)}` : '—';
  const { rows, series } = interactionTable(t, f);
  const varieties = series.map((s) => s.name);
  const meanRows: MeanRow[] = [
    ...varieties.map((v, i) => ({
      id: `v${i}`,
      kind: 'variety' as const,
      name: v,
      cells: t.levels.map((l) => t.cellMeans.find((c) => c.variety === v && c.treatment === l)),
      margin: t.varietyMeans.find((m) => m.variety === v),
    })),
    {
      id: 'margin',
      kind: 'margin',
      name: `${t.factor} mean`,
      cells: t.levels.map((l) => t.treatmentMeans.find((m) => m.treatment === l)),
    },
  ];
  const chart = (
    <LineChart data={rows} margin={{ left: 8, right: 8 }} {...(size ?? {})}>
      <CartesianGrid strokeDasharray="3 3" />
      <XAxis dataKey="treatment" type="category" interval={0} padding={{ left: 40, right: 40 }} />
      {/* The means' own range, not from zero: the slopes are what the plot is for. */}
      <YAxis
        domain={['auto', 'auto']}
        label={{ value: unit.label, angle: -90, position: 'insideLeft' }}
      />
      <Tooltip {...tooltipStyle} />
      <Legend />
      {series.map((s, i) => (
        <Line
          key={s.key}
          dataKey={s.key}
          name={s.name}
          stroke={seriesColour(i)}
          isAnimationActive={false}
        />
      ))}
    </LineChart>
  );
  return (
    <section aria-labelledby="two-factor-heading" className="mt-4 space-y-3">
      <h3 id="two-factor-heading" className="text-xl font-semibold text-leaf-900">
        {t.factor} × variety
      </h3>
      <p className="rounded-lg bg-white p-3 text-sm shadow-sm" data-strata={t.layout}>
        {twoFactorNote(t, result.model)}
      </p>

      <figure className="rounded-lg bg-white p-3 shadow-sm">
        <figcaption className="font-semibold text-leaf-900">
          Interaction plot: {result.traitLabel} by {factor}, one line per variety
          <span className="block text-xs font-normal text-loam-700">
            Lines that are not parallel show varieties answering the {factor} differently. The same
            numbers are in the table below.
          </span>
        </figcaption>
        <div
          className="mt-2 h-72 w-full"
          role="img"
          aria-label={`Interaction plot of ${result.traitLabel}: ${t.factor} on the horizontal axis, one line per variety; the cell means table below holds the same values.`}
          data-testid="interaction-plot"
        >
          {size ? (
            chart
          ) : (
            <ResponsiveContainer width="100%" height="100%">
              {chart}
            </ResponsiveContainer>
          )}
        </div>
      </figure>

      <ScrollRegion label="Cell means" className="rounded-lg bg-white shadow-sm">
        <DataTable
          showCaption
          sortable={false}
          className="min-w-[28rem]"
          caption={
            <>
              Cell means: variety × {factor} (± SE)
              <span className="block text-xs font-normal text-loam-700">
                Least-squares means averaged over blocks; the last row and column are the {factor}{' '}
                and variety means.
              </span>
            </>
          }
          data={meanRows}
          rowId={(r) => r.id}
          rowHeader="name"
          rowClassName={(r) => (r.kind === 'margin' ? 'border-t-2 border-leaf-100' : '')}
          columns={[
            meanCol.accessor('name', { header: 'Variety' }),
            ...t.levels.map((l, i) =>
              meanCol.display({
                id: `level${i}`,
                header: `${l}${inUnit}`,
                cell: ({ row: { original: r } }) => meanText(r.cells[i]),
                meta: {
                  align: 'right',
                  cellProps: (r) => ({ 'data-mean': r.cells[i]?.mean ?? '' }),
                },
              }),
            ),
            meanCol.display({
              id: 'varietyMean',
              header: `Variety mean${inUnit}`,
              cell: ({ row: { original: r } }) => (r.kind === 'margin' ? '' : meanText(r.margin)),
              meta: { align: 'right' },
            }),
          ]}
        />
      </ScrollRegion>

      <ScrollRegion
        label={`${t.factor} within each variety`}
        className="rounded-lg bg-white shadow-sm"
      >
        <DataTable
          showCaption
          className="min-w-[32rem]"
          caption={
            <>
              {t.factor} within each variety (simple effects)
              <span className="block text-xs font-normal text-loam-700">
                {t.layout === 'split-plot'
                  ? 'Two levels compared within a variety lie on different main plots: the SE carries both errors, on Satterthwaite’s df.'
                  : 'Every comparison is on the residual error.'}
              </span>
            </>
          }
          data={t.treatmentWithinVariety}
          rowId={(e) => `${e.within}|${e.a}|${e.b}`}
          rowHeader="within"
          columns={[
            effectCol.accessor('within', { header: 'Variety' }),
            effectCol.accessor((e) => `${e.a} − ${e.b}`, {
              id: 'comparison',
              header: 'Comparison',
            }),
            effectCol.accessor('difference', {
              header: `Difference${inUnit}`,
              cell: (c) => formatNumber(c.getValue() * f),
              meta: { align: 'right', cellProps: (e) => ({ 'data-difference': e.difference }) },
            }),
            effectCol.accessor('se', {
              header: `SE${inUnit}`,
              cell: (c) => formatNumber(c.getValue() * f, 3),
              meta: { align: 'right' },
            }),
            effectCol.accessor('df', {
              header: 'df',
              cell: (c) =>
                Number.isInteger(c.getValue()) ? c.getValue() : c.getValue().toFixed(1),
              meta: { align: 'right' },
            }),
            effectCol.accessor('p', {
              header: 'p',
              cell: (c) => (
                <>
                  {formatP(c.getValue())}
                  {c.getValue() < result.alpha ? (
                    <span className="ml-1 font-semibold text-leaf-700">*</span>
                  ) : null}
                </>
              ),
              meta: { align: 'right' },
            }),
          ]}
        />
        <p className="px-2 pb-2 text-xs text-loam-700">* p below α = {result.alpha}</p>
      </ScrollRegion>
    </section>
  );
}
