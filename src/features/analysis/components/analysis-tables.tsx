import {
  type AnalysisResult,
  modelNote,
  varianceSourceLabels,
  varietyTestNote,
} from '@common/contracts/analysis';
import { designLabels, type trialDesigns } from '@common/contracts/trials';
import { type DisplayUnit, formatF, formatNumber, formatP } from '@common/display-units';
import { ScrollRegion } from '@/components/ui/scroll-region';

type TrialDesign = (typeof trialDesigns)[number];

const designWords = {
  crd: 'completely randomized',
  rcbd: 'randomized complete blocks',
  multisite: 'blocks at several sites',
} as const;

const sourceWords: Record<string, string> = {
  site: 'Site',
  block: 'Block (within site)',
  treatment: 'Treatment',
  'block:treatment': 'Block × treatment (main-plot error)',
  variety: 'Variety',
  'variety:treatment': 'Variety × treatment',
  'site:variety': 'Site × variety',
  residual: 'Residual',
  total: 'Total',
};

const tableWrap = 'mt-2 rounded-lg bg-white shadow-sm';
const th = 'p-2 font-semibold';
const td = 'p-2 tabular-nums';

export function ResultSummary({
  result,
  unit,
  trialDesign,
}: {
  result: AnalysisResult;
  unit: DisplayUnit;
  /** A trial's own design, which may be one the engine reads as blocks (incomplete blocks). */
  trialDesign?: TrialDesign;
}) {
  const items: [string, string][] = [
    ['Design', trialDesign ? designLabels[trialDesign].toLowerCase() : designWords[result.design]],
    ['Plot values', String(result.n)],
    ['Grand mean', `${formatNumber(result.grandMean * unit.factor)} ${unit.label}`],
    ['CV', result.cvPercent === null ? '—' : `${result.cvPercent.toFixed(1)} %`],
  ];
  return (
    <dl className="mt-3 grid grid-cols-2 gap-2 sm:grid-cols-4">
      {items.map(([k, v]) => (
        <div key={k} className="rounded-lg bg-white p-3 shadow-sm">
          <dt className="text-xs uppercase tracking-wide text-loam-700">{k}</dt>
          <dd className="font-display text-lg font-semibold text-leaf-900">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

export function WarningsList({ warnings }: { warnings: string[] }) {
  if (warnings.length === 0) return null;
  return (
    <section
      aria-label="What the data can and cannot say"
      className="mt-3 rounded-lg border-l-4 border-pod-500 bg-straw-100 p-3 text-sm"
    >
      <p className="font-semibold text-loam-700">Read these before the tables</p>
      <ul className="mt-1 list-disc space-y-0.5 pl-5">
        {warnings.map((w) => (
          <li key={w}>{w}</li>
        ))}
      </ul>
    </section>
  );
}

/**
 * Which model the ranks and letters came from and, for the mixed model, its variance
 * components, the variety test and the REML log-likelihood.
 */
export function MixedModelPanel({ result, unit }: { result: AnalysisResult; unit: DisplayUnit }) {
  const f2 = unit.factor * unit.factor;
  const components = result.varianceComponents ?? [];
  const total = components.reduce((s, c) => s + c.variance, 0);
  return (
    <section
      aria-label="Model used"
      className="mt-3 rounded-lg bg-white p-3 text-sm shadow-sm"
      data-model={result.model}
    >
      <p>{modelNote(result.model)}</p>
      {result.fixedTest ? <p className="mt-1">{varietyTestNote(result.fixedTest)}</p> : null}
      {result.varianceSummary ? <p className="mt-1">{result.varianceSummary}</p> : null}
      {components.length ? (
        <ScrollRegion label="Variance components" className="mt-2">
          <table className="w-full min-w-[24rem] text-left text-sm">
            <caption className="text-left font-semibold text-leaf-900">
              Variance components (REML, ({unit.label})²)
              {result.logLik === undefined ? null : (
                <span className="block text-xs font-normal text-loam-700">
                  REML log-likelihood {result.logLik.toFixed(3)}
                  {result.boundary ? '; a component was estimated as zero and kept there' : ''}
                </span>
              )}
            </caption>
            <thead className="bg-leaf-50 text-leaf-900">
              <tr>
                <th scope="col" className={th}>
                  Source
                </th>
                <th scope="col" className={`${th} text-right`}>
                  Variance ± SE
                </th>
                <th scope="col" className={`${th} text-right`}>
                  Share
                </th>
              </tr>
            </thead>
            <tbody>
              {components.map((c) => (
                <tr key={c.source} className="border-t border-leaf-50">
                  <th scope="row" className="p-2 font-medium">
                    {varianceSourceLabels[c.source]}
                  </th>
                  <td className={`${td} text-right`} data-variance={c.variance}>
                    {formatNumber(c.variance * f2)}
                    {c.se === null ? '' : ` ± ${formatNumber(c.se * f2, 3)}`}
                  </td>
                  <td className={`${td} text-right`}>
                    {total > 0 ? `${Math.round((100 * c.variance) / total)} %` : '—'}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      ) : null}
    </section>
  );
}

export function AnovaTable({
  result,
  unit,
  title,
}: {
  result: AnalysisResult;
  unit: DisplayUnit;
  title: string;
}) {
  const f2 = unit.factor * unit.factor;
  return (
    <ScrollRegion label={`Analysis of variance: ${title}`} className={tableWrap}>
      <table className="w-full min-w-[36rem] text-left text-sm">
        <caption className="p-2 text-left font-semibold text-leaf-900">
          Analysis of variance: {title}
          <span className="block text-xs font-normal text-loam-700">
            Sequential (type I) sums of squares; SS and MS in ({unit.label})².
            {result.model === 'mixed'
              ? ' Shown for reference: the ranks and letters come from the mixed model.'
              : ''}
            {result.design === 'multisite'
              ? ' Variety is tested against site × variety, site against blocks within sites.'
              : ''}
          </span>
        </caption>
        <thead className="bg-leaf-50 text-leaf-900">
          <tr>
            <th scope="col" className={th}>
              Source
            </th>
            <th scope="col" className={`${th} text-right`}>
              df
            </th>
            <th scope="col" className={`${th} text-right`}>
              SS
            </th>
            <th scope="col" className={`${th} text-right`}>
              MS
            </th>
            <th scope="col" className={`${th} text-right`}>
              F
            </th>
            <th scope="col" className={`${th} text-right`}>
              p
            </th>
            <th scope="col" className={th}>
              Tested against
            </th>
          </tr>
        </thead>
        <tbody>
          {result.anova.map((l) => (
            <tr key={l.source} className="border-t border-leaf-50">
              <th scope="row" className="p-2 font-medium">
                {sourceWords[l.source] ?? l.source}
              </th>
              <td className={`${td} text-right`}>{l.df}</td>
              <td className={`${td} text-right`}>{formatNumber(l.ss * f2)}</td>
              <td className={`${td} text-right`}>
                {l.ms === null ? '—' : formatNumber(l.ms * f2)}
              </td>
              <td className={`${td} text-right`} data-f={l.f ?? ''}>
                {formatF(l.f)}
              </td>
              <td className={`${td} text-right`}>
                {formatP(l.p)}
                {l.p !== null && l.p < result.alpha ? (
                  <span className="ml-1 font-semibold text-leaf-700">*</span>
                ) : null}
              </td>
              <td className="p-2 text-loam-700">
                {l.testedAgainst ? (sourceWords[l.testedAgainst] ?? l.testedAgainst) : ''}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="px-2 pb-2 text-xs text-loam-700">* p below α = {result.alpha}</p>
    </ScrollRegion>
  );
}

export function MeansTable({
  result,
  unit,
  title,
  codes,
}: {
  result: AnalysisResult;
  unit: DisplayUnit;
  title: string;
  codes?: Record<string, string>;
}) {
  const test = result.letters === 'hsd' ? 'Tukey HSD' : 'Fisher LSD';
  // Unbalanced layouts: the model's adjusted means differ from the arithmetic ones and carry
  // the ranks and letters, so both are shown.
  const mixed = result.model === 'mixed';
  const adjusted =
    result.method === 'least-squares' || mixed
      ? new Map(result.adjustedMeans.map((a) => [a.variety, a]))
      : null;
  return (
    <ScrollRegion label={`Entry means: ${title}`} className={tableWrap}>
      <table className="w-full min-w-[34rem] text-left text-sm">
        <caption className="p-2 text-left font-semibold text-leaf-900">
          Entry means: {title} ({unit.label})
          <span className="block text-xs font-normal text-loam-700">
            Entries sharing a letter are not significantly different ({test}, α = {result.alpha}).
            SE is each entry’s own SD ÷ √n.
            {mixed
              ? ' Ranks and letters come from the mixed model’s estimates of the entry means (BLUEs), with the model’s SE.'
              : adjusted
                ? ' Ranks and letters come from the adjusted (least-squares) means: the model’s predictions averaged over blocks, with the model’s SE.'
                : ''}
          </span>
        </caption>
        <thead className="bg-leaf-50 text-leaf-900">
          <tr>
            <th scope="col" className={`${th} text-right`}>
              Rank
            </th>
            <th scope="col" className={th}>
              Entry
            </th>
            <th scope="col" className={`${th} text-right`}>
              Plots
            </th>
            <th scope="col" className={`${th} text-right`}>
              Mean ± SE
            </th>
            {adjusted ? (
              <th scope="col" className={`${th} text-right`}>
                {mixed ? 'Model estimate ± SE' : 'Adjusted mean ± SE'}
              </th>
            ) : null}
            <th scope="col" className={th}>
              Letters
            </th>
            <th scope="col" className={`${th} text-right`}>
              Range
            </th>
          </tr>
        </thead>
        <tbody>
          {result.means.map((m) => (
            <tr key={m.variety} className="border-t border-leaf-50">
              <td className={`${td} text-right`}>{m.rank ?? '—'}</td>
              <th scope="row" className="p-2 font-medium">
                {codes?.[m.variety] ? (
                  <span className="mr-1 font-mono text-xs text-loam-700">{codes[m.variety]}</span>
                ) : null}
                {m.variety}
              </th>
              <td className={`${td} text-right`}>{m.n}</td>
              <td className={`${td} text-right`}>
                {formatNumber(m.mean * unit.factor)}
                {m.se === null ? '' : ` ± ${formatNumber(m.se * unit.factor, 3)}`}
              </td>
              {adjusted ? (
                <td className={`${td} text-right`} data-adjusted={adjusted.get(m.variety)?.mean}>
                  {formatNumber((adjusted.get(m.variety)?.mean ?? NaN) * unit.factor)}
                  {adjusted.get(m.variety)?.se == null
                    ? ''
                    : ` ± ${formatNumber(adjusted.get(m.variety)!.se! * unit.factor, 3)}`}
                </td>
              ) : null}
              <td className="p-2 font-mono font-semibold text-leaf-700" data-letters={m.group}>
                {m.group}
              </td>
              <td className={`${td} text-right text-loam-700`}>
                {formatNumber(m.min * unit.factor)}–{formatNumber(m.max * unit.factor)}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </ScrollRegion>
  );
}

export function SeparationSummary({ result, unit }: { result: AnalysisResult; unit: DisplayUnit }) {
  const err = result.errorTerm;
  return (
    <dl className="mt-3 grid gap-2 text-sm sm:grid-cols-3">
      <div className="rounded-lg bg-white p-3 shadow-sm">
        <dt className="font-semibold text-leaf-900">LSD (α = {result.alpha})</dt>
        <dd>
          {result.lsd.value === null
            ? 'differs by pair (unequal replication)'
            : `${formatNumber(result.lsd.value * unit.factor)} ${unit.label}`}
          <span className="block text-xs text-loam-700">
            t = {result.lsd.t.toFixed(3)}, df {result.lsd.df};{' '}
            {result.lsd.protected
              ? 'protected by a significant F'
              : 'not protected (F not significant)'}
          </span>
        </dd>
      </div>
      <div className="rounded-lg bg-white p-3 shadow-sm">
        <dt className="font-semibold text-leaf-900">Tukey HSD (α = {result.alpha})</dt>
        <dd>
          {result.hsd.value === null
            ? 'differs by pair (unequal replication)'
            : `${formatNumber(result.hsd.value * unit.factor)} ${unit.label}`}
          <span className="block text-xs text-loam-700">
            q = {result.hsd.q.toFixed(3)}, df {result.hsd.df}
          </span>
        </dd>
      </div>
      <div className="rounded-lg bg-white p-3 shadow-sm">
        <dt className="font-semibold text-leaf-900">Error term</dt>
        <dd>
          {err.source === 'residual' ? 'Residual' : 'Site × variety'}, df {err.df}
          <span className="block text-xs text-loam-700">
            {result.method === 'means'
              ? 'balanced layout: from group means'
              : 'unbalanced layout: least squares'}
          </span>
        </dd>
      </div>
    </dl>
  );
}
