import {
  derivedTraits,
  modelsForDesign,
  type AnalysisModel,
  type AnalysisResult,
  type AnalyzeOptionsInput,
  type Ranking,
  type TrialAnalysis,
  type analysisBases,
  type designs,
} from '../../common/contracts/analysis';
import { designLabels, isIncompleteDesign } from '../../common/contracts/trials';
import type { Actor } from '../../common/policy';
import type { DB } from '../../db/database';
import type { Trial, TrialDesign } from '../../db/schema';
import { AppError } from '../lib/app-error';
import { trialFactor, trialForAction } from '../trials/trials-service';
import type { AnalysisResult as EngineResult, PlotRow, TwoFactorResult } from './engine/analyze';
import { cachedForTrialData } from './analysis-cache';
import { AnalysisStopped, runAnalysis } from './analysis-pool';
import type { AnalysisTask } from './analysis-worker';
import { describe } from './engine/descriptives';
import { rankAcrossTraits } from './engine/ranking';
import * as repo from './analysis-repository';
import { buildPlotValues, PlotValueError, type TraitSource } from './trial-plot-values';

type Basis = (typeof analysisBases)[number];
type EngineDesign = (typeof designs)[number];

interface ResolvedTrait {
  key: string;
  label: string;
  quantityKind: string;
  direction: 'higher' | 'lower' | 'none';
  source: TraitSource;
  traitId: string | null;
}

/** NaN or ±Infinity would travel as null in JSON anyway; make it explicit. */
function finite<T>(value: T): T {
  return JSON.parse(
    JSON.stringify(value, (_k, v: unknown) =>
      typeof v === 'number' && !Number.isFinite(v) ? null : v,
    ),
  ) as T;
}

/**
 * Runs the engine off the request thread and turns what stopped it into an answer that names
 * the limit: too many rows 413, too many entries or too long 422, a full queue 503.
 */
async function analyse(task: AnalysisTask & { kind: 'csv' | 'rows' }): Promise<EngineResult>;
async function analyse(task: AnalysisTask & { kind: 'two-factor' }): Promise<TwoFactorResult>;
async function analyse(task: AnalysisTask): Promise<EngineResult | TwoFactorResult> {
  let outcome;
  try {
    outcome = await runAnalysis(task);
  } catch (err) {
    if (!(err instanceof AnalysisStopped)) throw err;
    if (err.reason === 'busy') throw new AppError('unavailable', err.message);
    throw new AppError('unprocessable', err.message, { limit: err.reason, max: err.max });
  }
  if (outcome.ok) return outcome.result;
  if (outcome.kind === 'input') throw new AppError('unprocessable', outcome.message);
  throw new AppError(
    outcome.limit === 'rows' ? 'payload_too_large' : 'unprocessable',
    outcome.message,
    { limit: outcome.limit, max: outcome.max, actual: outcome.actual },
  );
}

function unprocessable(err: unknown): never {
  if (err instanceof PlotValueError) {
    if (err.field)
      throw new AppError('validation_failed', err.message, {
        fields: [{ path: err.field, message: err.message }],
      });
    throw new AppError('unprocessable', err.message);
  }
  throw err;
}

type TrialTraits = Awaited<ReturnType<typeof repo.trialTraits>>;

/** A derived trait needs no lookup; a recorded one is found among the trial's traits. */
async function resolveTrait(
  traitsOfTrial: () => Promise<TrialTraits>,
  key: string,
): Promise<ResolvedTrait> {
  if (key in derivedTraits) {
    const d = derivedTraits[key as keyof typeof derivedTraits];
    return {
      key,
      label: d.label,
      quantityKind: d.quantityKind,
      direction: d.direction,
      source: { kind: 'derived', key: key as keyof typeof derivedTraits },
      traitId: null,
    };
  }
  const trait = (await traitsOfTrial()).find((t) => t.key === key);
  if (!trait) throw AppError.notFound(`The trait "${key}"`);
  return {
    key,
    label: trait.label,
    quantityKind: trait.quantity_kind,
    direction: trait.direction,
    traitId: trait.id,
    source:
      trait.basis === 'harvest'
        ? { kind: 'harvest', quantityKind: trait.quantity_kind }
        : { kind: 'observation', basis: trait.basis, quantityKind: trait.quantity_kind },
  };
}

/**
 * How a trial's design reads to the engine. Incomplete blocks and networks go as blocks
 * (the classical analysis fits blocks, or gardens, before varieties: the intra-block analysis);
 * the mixed model then has blocks random within replicates, or gardens random.
 */
function engineLayout(design: TrialDesign): {
  design: EngineDesign;
  sitesAre?: 'site' | 'replicate';
} {
  switch (design) {
    case 'crd':
    case 'rcbd':
    case 'multisite':
      return { design };
    case 'incomplete':
      return { design: 'rcbd', sitesAre: 'replicate' };
    case 'network':
      return { design: 'rcbd', sitesAre: 'site' };
    default: {
      const never: never = design;
      return never;
    }
  }
}

async function analyseTrait(
  db: DB,
  trial: Trial,
  trait: ResolvedTrait,
  basis: Basis,
  options: {
    alpha: number;
    letters: 'hsd' | 'lsd';
    model?: AnalysisModel;
    /** False: the caller chose no model, so a split plot that lost plots takes the mixed one. */
    modelAsked?: boolean;
    varietiesRandom?: boolean;
  },
): Promise<TrialAnalysis> {
  const [plots, harvests, observations] = await Promise.all([
    repo.trialPlots(db, trial.id),
    trait.source.kind === 'observation'
      ? { plots: [], massDecimals: 0 }
      : repo.harvestTotals(db, trial.id),
    trait.traitId && trait.source.kind === 'observation'
      ? repo.liveObservations(db, trial.id, trait.traitId)
      : [],
  ]);
  if (plots.length === 0) throw new AppError('unprocessable', 'The trial has no plots yet.');
  let built;
  try {
    built = buildPlotValues(
      trait.source,
      basis,
      {
        sowingDate: trial.sowing_date,
        transplantDate: trial.transplant_date,
        rowsPerPlot: trial.rows_per_plot,
        rowLengthMm: trial.row_length_mm,
        rowSpacingMm: trial.row_spacing_mm,
      },
      plots,
      harvests,
      observations,
    );
  } catch (err) {
    unprocessable(err);
  }
  if (built.values.length === 0)
    throw new AppError('unprocessable', `No records for ${trait.label} yet: nothing to analyse.`);
  const entryCodes = Object.fromEntries(plots.map((p) => [p.entry_name, p.entry_code]));
  const plotValues = built.values.map(({ plot, value }) => ({
    plotId: plot.id,
    plotNumber: plot.plot_number,
    site: plot.site_name,
    block: plot.block,
    entry: plot.entry_name,
    entryCode: plot.entry_code,
    ...(plot.treatment != null ? { treatment: plot.treatment } : {}),
    value,
  }));
  const described = {
    traitKey: trait.key,
    traitLabel: trait.label,
    quantityKind: trait.quantityKind,
    direction: trait.direction,
    basis,
    unit: built.unit,
    decimals: built.decimals,
    valueNote: built.valueNote,
    plotValues,
    entryCodes,
  };
  const factor = trialFactor(trial);
  if (factor) {
    const order = new Map(factor.levels.map((l, i) => [l, i]));
    // The lead's order of levels and the entries' codes fix the order of every table.
    const twoFactorRows = built.values
      .map(({ plot, value }) => ({
        variety: plot.entry_name,
        // At several sites every site's blocks are blocks of their own.
        block:
          trial.design === 'multisite' ? `${plot.site_name} / ${plot.block}` : String(plot.block),
        treatment: plot.treatment ?? '',
        plot: String(plot.plot_number),
        value,
        key: [order.get(plot.treatment ?? '') ?? -1, plot.entry_code] as const,
      }))
      .sort((a, b) => a.key[0] - b.key[0] || a.key[1].localeCompare(b.key[1]))
      .map(({ key: _key, ...row }) => row);
    const result = await analyse({
      kind: 'two-factor',
      rows: twoFactorRows,
      options: {
        trait: trait.key,
        alpha: options.alpha,
        letters: options.letters,
        direction: trait.direction,
        ...(options.modelAsked === false ? {} : { model: options.model ?? 'anova' }),
        splitPlot: factor.arrangement === 'split_plot',
        factor: factor.name,
      },
    });
    return finite({
      ...twoFactorTrialResult(result, plotValues, factor),
      warnings: [...built.warnings, ...result.warnings],
      ...described,
    });
  }
  const layout = engineLayout(trial.design);
  const rows: PlotRow[] = built.values.map(({ plot, value }) => ({
    variety: plot.entry_name,
    site: layout.sitesAre === 'replicate' ? `Replicate ${plot.replicate ?? 1}` : plot.site_name,
    block: trial.design === 'crd' ? null : String(plot.block),
    plot: String(plot.plot_number),
    value,
  }));
  const result = await analyse({
    kind: 'rows',
    rows,
    options: {
      trait: trait.key,
      alpha: options.alpha,
      design: layout.design,
      ...(layout.sitesAre ? { sitesAre: layout.sitesAre } : {}),
      letters: options.letters,
      direction: trait.direction,
      model: options.model ?? 'anova',
      varietiesRandom: options.varietiesRandom ?? false,
    },
  });
  return finite({
    ...result,
    warnings: [...built.warnings, ...result.warnings],
    ...described,
  });
}

/**
 * A two-factor analysis in the shape of every trial analysis: the variety means (averaged over
 * the treatment levels, ranked and lettered on the subplot or residual error) stand where a
 * one-factor trial's means stand, so the sheet and the ranking read them the same way; the
 * cells, treatment means and simple effects travel in `twoFactor`.
 */
function twoFactorTrialResult(
  r: TwoFactorResult,
  values: { entry: string; value: number }[],
  factor: { name: string; levels: string[] },
): Omit<TrialAnalysis, Described | 'warnings'> {
  const byVariety = new Map<string, number[]>();
  for (const v of values) {
    const xs = byVariety.get(v.entry);
    if (xs) xs.push(v.value);
    else byVariety.set(v.entry, [v.value]);
  }
  return {
    design: 'rcbd',
    trait: r.trait,
    alpha: r.alpha,
    n: r.n,
    grandMean: r.grandMean,
    cvPercent: r.cvPercent,
    anova: r.anova,
    means: r.means.map((m) => {
      const { sd, cvPercent, min, max } = describe(byVariety.get(m.variety) ?? []);
      return { ...m, sd, cvPercent, min, max };
    }),
    lsd: r.lsd,
    hsd: r.hsd,
    letters: r.letters,
    errorTerm: r.errorTerm,
    method: r.method,
    model: r.model,
    ...(r.varianceComponents && r.fixedTest
      ? {
          varianceComponents: r.varianceComponents,
          fixedTest: r.fixedTest,
          logLik: r.logLik,
          boundary: r.boundary,
        }
      : {}),
    adjustedMeans: r.varietyMeans.map(({ variety, mean, se }) => ({ variety, mean, se })),
    counts: {
      entries: r.counts.entries,
      sites: 1,
      blocks: r.counts.blocks,
      rows: r.counts.rows,
      missingPlots: r.counts.missingPlots,
    },
    twoFactor: {
      factor: factor.name,
      levels: factor.levels,
      layout: r.layout,
      cellMeans: r.adjustedMeans,
      treatmentMeans: r.treatmentMeans,
      varietyMeans: r.varietyMeans,
      treatmentWithinVariety: r.treatmentWithinVariety,
      varietyWithinTreatment: r.varietyWithinTreatment,
      ...(r.fixedTests ? { fixedTests: r.fixedTests } : {}),
    },
  };
}
/** What every trial analysis adds to the engine's result (trait, unit, plot values). */
type Described =
  | 'traitKey'
  | 'traitLabel'
  | 'quantityKind'
  | 'direction'
  | 'basis'
  | 'unit'
  | 'decimals'
  | 'valueNote'
  | 'plotValues'
  | 'entryCodes';

export async function trialAnalysis(
  db: DB,
  slug: string,
  actor: Actor | null,
  query: {
    trait: string;
    basis: Basis;
    alpha: number;
    letters: 'hsd' | 'lsd';
    model?: AnalysisModel;
    varietiesRandom?: boolean;
  },
): Promise<TrialAnalysis> {
  const { trial } = await trialForAction(db, slug, actor, 'trial.read');
  refuseModelOutsideDesign(trial, query.model ?? 'anova');
  if (query.varietiesRandom && query.model !== 'mixed') {
    const message = 'Varieties as random need the mixed model.';
    throw new AppError('validation_failed', message, {
      fields: [{ path: 'query.varietiesRandom', message }],
    });
  }
  return analyseTrialTrait(db, trial, query);
}

/**
 * One trait of a trial the caller has already been allowed to read (the results sheet). A caller
 * asking for several traits passes one read of the trial's traits for all of them.
 */
export async function analyseTrialTrait(
  db: DB,
  trial: Trial,
  query: {
    trait: string;
    basis: Basis;
    alpha: number;
    letters: 'hsd' | 'lsd';
    model?: AnalysisModel;
    varietiesRandom?: boolean;
  },
  traitsOfTrial: () => Promise<TrialTraits> = () => repo.trialTraits(db, trial.id),
): Promise<TrialAnalysis> {
  // Blocks (or gardens) that hold only some entries are analysed by the mixed model unless the
  // caller asks otherwise; other designs keep the classical analysis as the default here.
  const model = query.model ?? (isIncompleteDesign(trial.design) ? 'mixed' : 'anova');
  // A split plot asked for no model gets the mixed model when it lost plots (the engine decides).
  const modelAsked = query.model !== undefined;
  const question = {
    modelAsked,
    trait: query.trait,
    basis: query.basis,
    alpha: query.alpha,
    letters: query.letters,
    model,
    varietiesRandom: query.varietiesRandom ?? false,
  };
  return cachedForTrialData(trial, question, async () => {
    const trait = await resolveTrait(traitsOfTrial, query.trait);
    return analyseTrait(db, trial, trait, query.basis, { ...query, model, modelAsked });
  });
}

/** A model the trial's design cannot be analysed with is the caller's mistake, named. */
function refuseModelOutsideDesign(trial: Trial, model: AnalysisModel) {
  const factor = trialFactor(trial);
  const twoFactor = factor !== null;
  if (
    modelsForDesign(trial.design, twoFactor, factor?.arrangement === 'split_plot').includes(model)
  )
    return;
  const message = twoFactor
    ? 'A factorial in blocks is analysed with the classical analysis only (the mixed model is offered for split plots).'
    : `A ${designLabels[trial.design].toLowerCase()} trial is analysed with the classical analysis only.`;
  throw new AppError('validation_failed', message, {
    fields: [{ path: 'query.model', message }],
  });
}

/** The variety test's p: the mixed model's Wald F where fitted, else the ANOVA's F. */
function varietyTestP(result: TrialAnalysis): number | null {
  return result.fixedTest?.p ?? result.anova.find((l) => l.source === 'variety')?.p ?? null;
}

export const RANKING_METHOD =
  'Index: for each trait, each entry’s adjusted (least-squares) mean is standardised, z = (entry mean − mean of the entry means) ÷ SD of the entry means, sign flipped where lower is better; the index is the weighted mean of the z scores (higher is better) and each contribution is weight × signed z ÷ total weight. Rank sum: the sum of each entry’s rank per trait (1 = best; lower sum is better). Traits with no preferred direction are shown but not counted.';

export async function trialRanking(
  db: DB,
  slug: string,
  actor: Actor | null,
  query: { traits?: string[]; weights?: number[]; alpha: number; model?: AnalysisModel },
): Promise<Ranking> {
  const { trial } = await trialForAction(db, slug, actor, 'trial.read');
  refuseModelOutsideDesign(trial, query.model ?? 'anova');
  const warnings: string[] = [];
  const explicit = query.traits !== undefined;
  let traitRows: Promise<TrialTraits> | undefined;
  const traitsOfTrial = () => (traitRows ??= repo.trialTraits(db, trial.id));
  const keys =
    query.traits ?? (await traitsOfTrial()).filter((t) => t.direction !== 'none').map((t) => t.key);
  if (keys.length === 0)
    throw new AppError('unprocessable', 'The trial has no traits with a preferred direction.');
  if (new Set(keys).size !== keys.length)
    throw new AppError('validation_failed', 'A trait is named twice.', {
      fields: [{ path: 'query.traits', message: 'A trait is named twice.' }],
    });
  const analysed: { trait: ResolvedTrait; weight: number; result: TrialAnalysis }[] = [];
  for (const [i, key] of keys.entries()) {
    const trait = await resolveTrait(traitsOfTrial, key);
    try {
      const result = await analyseTrialTrait(
        db,
        trial,
        {
          trait: key,
          basis: 'plot',
          alpha: query.alpha,
          letters: 'hsd',
          ...(query.model ? { model: query.model } : {}),
        },
        traitsOfTrial,
      );
      analysed.push({ trait, weight: query.weights?.[i] ?? 1, result });
    } catch (err) {
      if (explicit || !(err instanceof AppError) || err.code !== 'unprocessable') throw err;
      warnings.push(`${trait.label}: left out (${err.message})`);
    }
  }
  if (analysed.length === 0)
    throw new AppError('unprocessable', 'None of the traits has records to rank on yet.');
  const entries = await repo.trialEntries(db, trial.id);
  const complete = entries.filter((e) =>
    analysed.every((a) => a.result.means.some((m) => m.variety === e.name)),
  );
  for (const e of entries)
    if (!complete.includes(e)) warnings.push(`${e.name}: left out (not measured for every trait)`);
  if (complete.length < 2)
    throw new AppError('unprocessable', 'Fewer than two entries have values for every trait.');
  let ranking;
  try {
    ranking = rankAcrossTraits(
      analysed.map((a) => ({
        trait: a.trait.key,
        direction: a.trait.direction,
        weight: a.weight,
        // The adjusted means, as each trait's own ranks and the published sheet use: on
        // unbalanced data the arithmetic means would rank a variety that lost a good plot low.
        means: Object.fromEntries(a.result.adjustedMeans.map((m) => [m.variety, m.mean])),
      })),
      complete.map((e) => e.name),
    );
  } catch (err) {
    if (err instanceof RangeError)
      throw new AppError('validation_failed', err.message, {
        fields: [{ path: 'query.weights', message: err.message }],
      });
    throw err;
  }
  const codeOf = new Map(entries.map((e) => [e.name, e.code]));
  return finite({
    traits: ranking.traits.map((t, i) => ({
      key: t.trait,
      label: analysed[i]!.trait.label,
      direction: t.direction,
      weight: t.weight,
      unit: analysed[i]!.result.unit,
      mean: t.mean,
      sd: t.sd,
      varietyP: varietyTestP(analysed[i]!.result),
    })),
    entries: ranking.entries.map((e) => ({ ...e, entryCode: codeOf.get(e.entry) ?? '' })),
    method: RANKING_METHOD,
    warnings,
  });
}

/** The spreadsheet analysis: nothing is read from or written to the database. */
export async function analyzeSpreadsheet(
  csv: string,
  options: Omit<AnalyzeOptionsInput, 'alpha' | 'letters' | 'model'> & {
    alpha: number;
    letters: 'hsd' | 'lsd';
    model?: AnalysisModel;
  },
): Promise<AnalysisResult> {
  const columns: Record<string, string> = {};
  for (const c of ['variety', 'site', 'block', 'plot'] as const) {
    const v = options[c];
    if (v !== undefined) columns[c] = v;
  }
  return finite(
    await analyse({
      kind: 'csv',
      csv,
      options: {
        alpha: options.alpha,
        letters: options.letters,
        model: options.model ?? 'anova',
        ...(options.design ? { design: options.design } : {}),
        ...(options.value ? { trait: options.value } : {}),
        columns,
      },
    }),
  );
}
