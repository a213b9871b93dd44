import { directionWords } from '@common/ranking';
import {
  type AnalysisBasis,
  type AnalysisModel,
  analysisBases,
  basisLabels,
  defaultModelFor,
  derivedTraits,
  modelLabels,
  modelReasonFor,
  modelsForDesign,
} from '@common/contracts/analysis';
import { useId } from 'react';
import { Link, useParams, useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useUnitSystem } from '@/lib/session';
import { useTrial } from '@/lib/trial';
import { useTrialAnalysis } from '../api/get-trial-analysis';
import {
  AnovaTable,
  MeansTable,
  MixedModelPanel,
  ResultSummary,
  SeparationSummary,
  WarningsList,
} from '../components/analysis-tables';
import { displayUnit, formatNumber } from '@common/display-units';
import { downloadCsv, downloadJson } from '../components/download';
import { RankingPanel } from '../components/ranking-panel';
import { VarietiesRandomPanel } from '../components/varieties-random-panel';
import { SeasonPanel } from '../components/season-panel';
import { TwoFactorPanel } from '../components/two-factor-panel';
import { FixedTestsTable } from '../components/fixed-tests-table';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { DataTable } from '@/components/ui/data-table';
import type { TrialAnalysis } from '@common/contracts/analysis';
import { createColumnHelper } from '@tanstack/react-table';

const plotCol = createColumnHelper<TrialAnalysis['plotValues'][number]>();

const select = 'mt-1 min-h-11 w-full rounded-lg border border-leaf-300 bg-white px-2';

export function Component() {
  const { slug = '' } = useParams();
  const id = useId();
  const system = useUnitSystem();
  const trial = useTrial(slug);
  const [params, setParams] = useSearchParams();

  const traits = [
    ...(trial.data?.traits ?? []).map((t) => ({
      key: t.key,
      label: t.label,
      amount: t.basis === 'harvest' && (t.quantityKind === 'mass' || t.quantityKind === 'count'),
    })),
    ...Object.entries(derivedTraits).map(([key, d]) => ({
      key,
      label: `${d.label} (from harvests)`,
      amount: false,
    })),
  ];
  const traitKey = params.get('trait') ?? traits[0]?.key ?? '';
  const current = traits.find((t) => t.key === traitKey);
  const basisParam = params.get('basis') as AnalysisBasis | null;
  const basis: AnalysisBasis =
    current?.amount && basisParam && analysisBases.includes(basisParam) ? basisParam : 'plot';
  const alpha = Number(params.get('alpha') ?? '0.05');
  const letters = params.get('letters') === 'lsd' ? 'lsd' : 'hsd';
  // The model: the lead's choice where the design allows it, else the one the design suggests.
  const design = trial.data?.design ?? 'crd';
  const twoFactor = Boolean(trial.data?.factor);
  const splitPlot = trial.data?.factor?.arrangement === 'split_plot';
  const models = modelsForDesign(design, twoFactor, splitPlot);
  const modelParam = params.get('model') as AnalysisModel | null;
  const chosenModel = modelParam && models.includes(modelParam) ? modelParam : null;
  // Nothing is asked for until the trial (and so its design) is known. A split plot with no
  // model chosen is left to the server: one that lost plots gets the mixed model.
  const analysis = useTrialAnalysis(slug, {
    trait: trial.data ? traitKey : '',
    basis,
    alpha,
    letters,
    model: chosenModel ?? (splitPlot ? undefined : defaultModelFor(design, twoFactor)),
  });
  const model: AnalysisModel =
    chosenModel ?? analysis.data?.model ?? defaultModelFor(design, twoFactor);

  const set = (key: string, value: string) => {
    const next = new URLSearchParams(params);
    next.set(key, value);
    if (key === 'trait') next.delete('basis');
    setParams(next, { replace: true });
  };

  if (trial.isPending) return <Spinner label="Loading the trial…" />;
  if (trial.error) return <ErrorPanel error={trial.error} />;
  const t = trial.data;
  const result = analysis.data;
  const typical = result ? result.grandMean : 0;
  const chosen = t.traits.find((x) => x.key === result?.traitKey)?.displayUnit;
  const unit = result
    ? displayUnit(result.unit, system, typical, chosen)
    : { label: '', factor: 1 };
  const basisChoices = analysisBases.filter((b) => (system === 'us' ? b !== 'ha' : b !== 'acre'));

  return (
    <article>
      <p className="text-sm text-loam-700">
        <Link to={`/t/${slug}`} className="underline">
          {t.title}
        </Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold text-leaf-900">Analysis</h1>
      <p className="mt-1 max-w-prose text-sm">
        Replicate statistics from the records entered so far; deleted records are left out.
      </p>

      <form
        className="mt-4 grid gap-3 rounded-xl bg-white p-4 shadow-sm sm:grid-cols-2 lg:grid-cols-5"
        onSubmit={(e) => e.preventDefault()}
        aria-label="Choose what to analyse"
      >
        <div className="text-sm">
          <label htmlFor={`${id}-trait`}>Trait</label>
          <select
            id={`${id}-trait`}
            className={select}
            value={traitKey}
            onChange={(e) => set('trait', e.target.value)}
          >
            {traits.map((x) => (
              <option key={x.key} value={x.key}>
                {x.label}
              </option>
            ))}
          </select>
        </div>
        <label className="text-sm">
          Expressed
          <select
            className={select}
            value={basis}
            disabled={!current?.amount}
            onChange={(e) => set('basis', e.target.value)}
            aria-describedby={`${id}-basis-help`}
          >
            {basisChoices.map((b) => (
              <option key={b} value={b}>
                {basisLabels[b]}
              </option>
            ))}
          </select>
          <span id={`${id}-basis-help`} className="text-xs text-loam-700">
            {current?.amount ? 'Harvest amounts only.' : 'Measured per plot or per plant.'}
          </span>
        </label>
        <label className="text-sm">
          Significance level (α)
          <select
            className={select}
            value={String(alpha)}
            onChange={(e) => set('alpha', e.target.value)}
          >
            <option value="0.1">0.10</option>
            <option value="0.05">0.05</option>
            <option value="0.01">0.01</option>
          </select>
        </label>
        <label className="text-sm">
          Letters from
          <select
            className={select}
            value={letters}
            onChange={(e) => set('letters', e.target.value)}
          >
            <option value="hsd">Tukey HSD</option>
            <option value="lsd">Fisher LSD</option>
          </select>
        </label>
        <label className="text-sm">
          Model
          <select
            className={select}
            value={model}
            disabled={models.length < 2}
            onChange={(e) => set('model', e.target.value)}
            aria-describedby={`${id}-model-help`}
          >
            {models.map((m) => (
              <option key={m} value={m}>
                {modelLabels[m]}
              </option>
            ))}
          </select>
          <span id={`${id}-model-help`} className="text-xs text-loam-700">
            {splitPlot
              ? 'A split plot is analysed with its strata by the classical analysis; one that lost plots by the mixed model, whose tests stay valid without every plot.'
              : twoFactor
                ? 'A two-factor trial is analysed with its strata by the classical analysis.'
                : models.length < 2
                  ? 'No blocks or gardens to treat as random.'
                  : `Suggested by the design: ${modelLabels[defaultModelFor(design)]}.`}
          </span>
        </label>
      </form>
      {modelReasonFor(design) ? (
        <p role="note" className="mt-2 max-w-prose rounded-lg bg-straw-100 p-3 text-sm">
          <span className="font-semibold">Why the mixed model: </span>
          {modelReasonFor(design)}
        </p>
      ) : null}

      <div aria-live="polite">
        {analysis.isFetching ? (
          <div className="mt-3">
            <div
              className="h-1 animate-pulse rounded bg-pod-500"
              role="progressbar"
              aria-label="Computing the analysis"
            />
            <Spinner label="Computing the analysis…" />
          </div>
        ) : null}
        {analysis.error ? (
          <div className="mt-4">
            <ErrorPanel error={analysis.error} title="This trait could not be analysed" />
          </div>
        ) : null}
      </div>

      {result && !analysis.error ? (
        <section aria-labelledby={`${id}-result`} className="mt-6">
          <h2 id={`${id}-result`} className="text-2xl font-semibold text-leaf-900">
            {result.traitLabel}{' '}
            <span className="text-base font-normal text-loam-700">
              {basisLabels[result.basis]}, {unit.label}, {directionWords[result.direction]}
            </span>
          </h2>
          <p className="text-sm text-loam-700">Plot value: {result.valueNote}.</p>
          <ResultSummary result={result} unit={unit} trialDesign={t.design} />
          <WarningsList warnings={result.warnings} />
          <MixedModelPanel result={result} unit={unit} factor={result.twoFactor?.factor} />
          {result.twoFactor?.fixedTests ? (
            <FixedTestsTable tests={result.twoFactor.fixedTests} factor={result.twoFactor.factor} />
          ) : null}
          {result.model === 'mixed' && !result.twoFactor ? (
            <VarietiesRandomPanel
              key={`${result.traitKey}-${basis}`}
              slug={slug}
              query={{ trait: result.traitKey, basis, alpha, letters, model }}
              unit={unit}
            />
          ) : null}
          {result.anova.length > 0 ? (
            <AnovaTable
              result={result}
              unit={unit}
              title={result.traitLabel}
              factor={result.twoFactor?.factor}
            />
          ) : null}
          <TwoFactorPanel result={result} unit={unit} />
          <MeansTable
            result={result}
            unit={unit}
            title={result.traitLabel}
            codes={result.entryCodes}
          />
          <SeparationSummary result={result} unit={unit} />
          <details className="mt-3 rounded-lg bg-white p-2 shadow-sm">
            <summary className="min-h-11 cursor-pointer py-2 font-semibold">
              The {result.plotValues.length} plot values used
            </summary>
            <ScrollRegion label="Plot values used">
              <DataTable
                className="min-w-[28rem]"
                caption={`Plot values for ${result.traitLabel}`}
                data={result.plotValues}
                rowId={(p) => p.plotId}
                rowHeader="plotNumber"
                columns={[
                  plotCol.accessor('site', { header: 'Site' }),
                  plotCol.accessor('block', { header: 'Block', meta: { align: 'right' } }),
                  plotCol.accessor('plotNumber', { header: 'Plot', meta: { align: 'right' } }),
                  ...(result.twoFactor
                    ? [plotCol.accessor('treatment', { header: result.twoFactor.factor })]
                    : []),
                  plotCol.accessor('entryCode', { header: 'Entry' }),
                  plotCol.accessor('value', {
                    header: `Value (${unit.label})`,
                    cell: (c) => formatNumber(c.getValue() * unit.factor),
                    meta: { align: 'right' },
                  }),
                ]}
              />
            </ScrollRegion>
          </details>
          <div className="mt-3 flex flex-wrap gap-2">
            <Button
              variant="secondary"
              type="button"
              onClick={() => downloadJson(`${slug}-${result.traitKey}`, result)}
            >
              Download results (JSON)
            </Button>
            <Button
              variant="secondary"
              type="button"
              onClick={() => downloadCsv(`${slug}-${result.traitKey}`, result)}
            >
              Download results (CSV)
            </Button>
          </div>
        </section>
      ) : null}

      {/* A split plot with no model chosen: each trait ranked under the model the server
          chooses for it, not under the one the trait shown above happened to get. */}
      <RankingPanel trial={t} alpha={alpha} model={splitPlot && !chosenModel ? undefined : model} />
      <SeasonPanel
        slug={slug}
        system={system}
        sites={t.sites.map((s) => ({ id: s.id, name: s.name }))}
        canWrite={t.permissions['records.write'] === true}
      />
    </article>
  );
}
