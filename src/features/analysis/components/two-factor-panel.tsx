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
import { seriesColour } from '@/components/ui/chart-palette';
import { ScrollRegion } from '@/components/ui/scroll-region';

const th = 'p-2 font-semibold';
const td = 'p-2 tabular-nums text-right';

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
  const inUnit = unit.label ? `, ${unit.label}` : '';
  const { rows, series } = interactionTable(t, f);
  const varieties = series.map((s) => s.name);
  const cell = (variety: string, level: string) =>
    t.cellMeans.find((c) => c.variety === variety && c.treatment === level);
  const chart = (
    <LineChart data={rows} margin={{ left: 8, right: 8 }} {...(size ?? {})}>
      <CartesianGrid strokeDasharray="3 3" />
      <XAxis dataKey="treatment" type="category" interval={0} padding={{ left: 40, right: 40 }} />
      {/* The means' own range, not from zero: the slopes are what the plot is for. */}
      <YAxis
        domain={['auto', 'auto']}
        label={{ value: unit.label, angle: -90, position: 'insideLeft' }}
      />
      <Tooltip />
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
          Interaction plot: {result.traitLabel} by {t.factor.toLowerCase()}, one line per variety
          <span className="block text-xs font-normal text-loam-700">
            Lines that are not parallel show varieties answering the {t.factor.toLowerCase()}{' '}
            differently. The same numbers are in the table below.
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
        <table className="w-full min-w-[28rem] text-left text-sm">
          <caption className="p-2 text-left font-semibold text-leaf-900">
            Cell means: variety × {t.factor.toLowerCase()} (± SE{inUnit})
            <span className="block text-xs font-normal text-loam-700">
              Least-squares means averaged over blocks; the last row and column are the{' '}
              {t.factor.toLowerCase()} and variety means.
            </span>
          </caption>
          <thead className="bg-leaf-50 text-leaf-900">
            <tr>
              <th scope="col" className={th}>
                Variety
              </th>
              {t.levels.map((l) => (
                <th key={l} scope="col" className={`${th} text-right`}>
                  {l}
                </th>
              ))}
              <th scope="col" className={`${th} text-right`}>
                Variety mean
              </th>
            </tr>
          </thead>
          <tbody>
            {varieties.map((v) => {
              const vm = t.varietyMeans.find((m) => m.variety === v);
              return (
                <tr key={v} className="border-t border-leaf-50">
                  <th scope="row" className="p-2 font-medium">
                    {v}
                  </th>
                  {t.levels.map((l) => {
                    const c = cell(v, l);
                    return (
                      <td key={l} className={td} data-mean={c?.mean ?? ''}>
                        {c ? `${formatNumber(c.mean * f)} ± ${formatNumber(c.se * f, 3)}` : '—'}
                      </td>
                    );
                  })}
                  <td className={td}>
                    {vm ? `${formatNumber(vm.mean * f)} ± ${formatNumber(vm.se * f, 3)}` : '—'}
                  </td>
                </tr>
              );
            })}
            <tr className="border-t-2 border-leaf-100">
              <th scope="row" className="p-2 font-medium">
                {t.factor} mean
              </th>
              {t.levels.map((l) => {
                const m = t.treatmentMeans.find((x) => x.treatment === l);
                return (
                  <td key={l} className={td}>
                    {m ? `${formatNumber(m.mean * f)} ± ${formatNumber(m.se * f, 3)}` : '—'}
                  </td>
                );
              })}
              <td />
            </tr>
          </tbody>
        </table>
      </ScrollRegion>

      <ScrollRegion
        label={`${t.factor} within each variety`}
        className="rounded-lg bg-white shadow-sm"
      >
        <table className="w-full min-w-[32rem] text-left text-sm">
          <caption className="p-2 text-left font-semibold text-leaf-900">
            {t.factor} within each variety (simple effects{inUnit})
            <span className="block text-xs font-normal text-loam-700">
              {t.layout === 'split-plot'
                ? 'Two levels compared within a variety lie on different main plots: the SE carries both errors, on Satterthwaite’s df.'
                : 'Every comparison is on the residual error.'}
            </span>
          </caption>
          <thead className="bg-leaf-50 text-leaf-900">
            <tr>
              <th scope="col" className={th}>
                Variety
              </th>
              <th scope="col" className={th}>
                Comparison
              </th>
              <th scope="col" className={`${th} text-right`}>
                Difference
              </th>
              <th scope="col" className={`${th} text-right`}>
                SE
              </th>
              <th scope="col" className={`${th} text-right`}>
                df
              </th>
              <th scope="col" className={`${th} text-right`}>
                p
              </th>
            </tr>
          </thead>
          <tbody>
            {t.treatmentWithinVariety.map((e) => (
              <tr key={`${e.within}|${e.a}|${e.b}`} className="border-t border-leaf-50">
                <th scope="row" className="p-2 font-medium">
                  {e.within}
                </th>
                <td className="p-2">
                  {e.a} − {e.b}
                </td>
                <td className={td} data-difference={e.difference}>
                  {formatNumber(e.difference * f)}
                </td>
                <td className={td}>{formatNumber(e.se * f, 3)}</td>
                <td className={td}>{Number.isInteger(e.df) ? e.df : e.df.toFixed(1)}</td>
                <td className={td}>
                  {formatP(e.p)}
                  {e.p < result.alpha ? (
                    <span className="ml-1 font-semibold text-leaf-700">*</span>
                  ) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        <p className="px-2 pb-2 text-xs text-loam-700">* p below α = {result.alpha}</p>
      </ScrollRegion>
    </section>
  );
}
