import {
  type AnalysisResult,
  modelNote,
  varianceSourceLabels,
  varietyTestNote,
} from '@common/contracts/analysis';
import { designLabels, type trialDesigns } from '@common/contracts/trials';
import { type DisplayUnit, formatF, formatNumber, formatP } from '@common/display-units';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '@/components/ui/data-table';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { rankColumn } from './rank-column';

type TrialDesign = (typeof trialDesigns)[number];

const designWords = {
  crd: 'completely randomized',
  rcbd: 'randomized complete blocks',
  multisite: 'blocks at several sites',
} as const;

/**
 * An ANOVA line's source in words: a two-factor trial's treatment under the trial's own name for
 * it (e.g. "Fertilizer"), and blocks "within site" only when there are several sites.
 */
export function anovaSourceLabel(
  source: AnalysisResult['anova'][number]['source'],
  { factor = 'Treatment', sites }: { factor?: string; sites: number },
) {
  const f = factor.toLowerCase();
  switch (source) {
    case 'site':
      return 'Site';
    case 'block':
      return sites > 1 ? 'Block (within site)' : 'Block';
    case 'treatment':
      return factor;
    case 'block:treatment':
      return `Block × ${f} (main-plot error)`;
    case 'variety':
      return 'Variety';
    case 'variety:treatment':
      return `Variety × ${f}`;
    case 'site:variety':
      return 'Site × variety';
    case 'residual':
      return 'Residual';
    case 'total':
      return 'Total';
    default: {
      const never: never = source;
      return never;
    }
  }
}

const tableWrap = 'mt-2 rounded-lg bg-white shadow-sm';
const componentCol =
  createColumnHelper<NonNullable<AnalysisResult['varianceComponents']>[number]>();
const anovaCol = createColumnHelper<AnalysisResult['anova'][number]>();
const meanCol = createColumnHelper<AnalysisResult['means'][number]>();

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
export function MixedModelPanel({
  result,
  unit,
  factor,
}: {
  result: AnalysisResult;
  unit: DisplayUnit;
  /** A two-factor trial's name for its treatment (its main plots are block × that). */
  factor?: string;
}) {
  const componentLabel = (source: keyof typeof varianceSourceLabels) =>
    source === 'block:treatment' && factor
      ? `Main plots (block × ${factor.toLowerCase()})`
      : varianceSourceLabels[source];
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
          <DataTable
            showCaption
            sortable={false}
            className="min-w-[24rem]"
            caption={
              <>
                Variance components (REML, ({unit.label})²)
                {result.logLik === undefined ? null : (
                  <span className="block text-xs font-normal text-loam-700">
                    REML log-likelihood {result.logLik.toFixed(3)}
                    {result.boundary ? '; a component was estimated as zero and kept there' : ''}
                  </span>
                )}
              </>
            }
            data={components}
            rowId={(c) => c.source}
            rowHeader="source"
            columns={[
              componentCol.accessor((c) => componentLabel(c.source), {
                id: 'source',
                header: 'Source',
              }),
              componentCol.display({
                id: 'variance',
                header: 'Variance ± SE',
                cell: ({ row: { original: c } }) =>
                  `${formatNumber(c.variance * f2)}${c.se === null ? '' : ` ± ${formatNumber(c.se * f2, 3)}`}`,
                meta: { align: 'right', cellProps: (c) => ({ 'data-variance': c.variance }) },
              }),
              componentCol.display({
                id: 'share',
                header: 'Share',
                cell: ({ row: { original: c } }) =>
                  total > 0 ? `${Math.round((100 * c.variance) / total)} %` : '—',
                meta: { align: 'right' },
              }),
            ]}
          />
        </ScrollRegion>
      ) : null}
    </section>
  );
}

export function AnovaTable({
  result,
  unit,
  title,
  factor,
}: {
  result: AnalysisResult;
  unit: DisplayUnit;
  title: string;
  /** A two-factor trial's name for its treatment. */
  factor?: string;
}) {
  const f2 = unit.factor * unit.factor;
  const label = (source: AnalysisResult['anova'][number]['source']) =>
    anovaSourceLabel(source, { factor, sites: result.counts.sites });
  return (
    <ScrollRegion label={`Analysis of variance: ${title}`} className={tableWrap}>
      <DataTable
        showCaption
        sortable={false}
        className="min-w-[36rem]"
        caption={
          <>
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
          </>
        }
        data={result.anova}
        rowId={(l) => l.source}
        rowHeader="source"
        columns={[
          anovaCol.accessor((l) => label(l.source), {
            id: 'source',
            header: 'Source',
          }),
          anovaCol.accessor('df', { header: 'df', meta: { align: 'right' } }),
          anovaCol.accessor('ss', {
            header: 'SS',
            cell: (c) => formatNumber(c.getValue() * f2),
            meta: { align: 'right' },
          }),
          anovaCol.accessor('ms', {
            header: 'MS',
            cell: (c) => (c.getValue() === null ? '—' : formatNumber(c.getValue()! * f2)),
            meta: { align: 'right' },
          }),
          anovaCol.accessor('f', {
            header: 'F',
            cell: (c) => formatF(c.getValue()),
            meta: { align: 'right', cellProps: (l) => ({ 'data-f': l.f ?? '' }) },
          }),
          anovaCol.accessor('p', {
            header: 'p',
            cell: (c) => (
              <>
                {formatP(c.getValue())}
                {c.getValue() !== null && c.getValue()! < result.alpha ? (
                  <span className="ml-1 font-semibold text-leaf-700">*</span>
                ) : null}
              </>
            ),
            meta: { align: 'right' },
          }),
          anovaCol.accessor((l) => (l.testedAgainst ? label(l.testedAgainst) : ''), {
            id: 'testedAgainst',
            header: 'Tested against',
            meta: { cellClassName: () => 'text-loam-700' },
          }),
        ]}
      />
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
      <DataTable
        showCaption
        className="min-w-[34rem]"
        caption={
          <>
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
          </>
        }
        data={result.means}
        rowId={(m) => m.variety}
        rowHeader="variety"
        columns={[
          rankColumn(meanCol),
          meanCol.accessor('variety', {
            header: 'Entry',
            cell: (c) => (
              <>
                {codes?.[c.getValue()] ? (
                  <span className="mr-1 font-mono text-xs text-loam-700">
                    {codes[c.getValue()]}
                  </span>
                ) : null}
                {c.getValue()}
              </>
            ),
          }),
          meanCol.accessor('n', { header: 'Plots', meta: { align: 'right' } }),
          meanCol.accessor('mean', {
            header: 'Mean ± SE',
            cell: ({ row: { original: m } }) =>
              `${formatNumber(m.mean * unit.factor)}${m.se === null ? '' : ` ± ${formatNumber(m.se * unit.factor, 3)}`}`,
            meta: { align: 'right' },
          }),
          ...(adjusted
            ? [
                meanCol.accessor((m) => adjusted.get(m.variety)?.mean, {
                  id: 'adjusted',
                  header: mixed ? 'Model estimate ± SE' : 'Adjusted mean ± SE',
                  cell: ({ row: { original: m } }) => {
                    const a = adjusted.get(m.variety);
                    return `${formatNumber((a?.mean ?? NaN) * unit.factor)}${a?.se == null ? '' : ` ± ${formatNumber(a.se * unit.factor, 3)}`}`;
                  },
                  meta: {
                    align: 'right',
                    cellProps: (m) => ({ 'data-adjusted': adjusted.get(m.variety)?.mean }),
                  },
                }),
              ]
            : []),
          meanCol.accessor('group', {
            header: 'Letters',
            enableSorting: false,
            meta: {
              cellClassName: () => 'font-mono font-semibold text-leaf-700',
              cellProps: (m) => ({ 'data-letters': m.group }),
            },
          }),
          meanCol.display({
            id: 'range',
            header: 'Range',
            cell: ({ row: { original: m } }) =>
              `${formatNumber(m.min * unit.factor)}–${formatNumber(m.max * unit.factor)}`,
            meta: { align: 'right', cellClassName: () => 'text-loam-700' },
          }),
        ]}
      />
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
