/**
 * Top level of the replicate statistics engine: plot rows (or CSV text) in, one result
 * object out. Pure: no file or network access, so the command line and the web API share it.
 */
import { parse } from 'csv-parse/sync';
import Decimal from 'decimal.js';
import {
  analyseVariance,
  isOrthogonal,
  type AnovaLine,
  type AnovaMethod,
  type Design,
  type PlotLayout,
} from './anova.js';
import { readDecimalText } from '../../../common/decimal';
import { centreDecimalTexts, addOffset } from './decimal-input.js';
import { describe } from './descriptives.js';
import { accurateMean } from './linear-model.js';
import { adjustedMeans, NotConnectedError, type AdjustedMeans } from './adjusted-means.js';
import { studentTTwoSided, studentizedRangeUpperTail } from './distributions.js';
import { separateMeans, type SeparationMethod } from './mean-separation.js';
import {
  mixedVarietyAnalysis,
  varietiesRandomAnalysis,
  type MixedVarietyAnalysis,
  type VarianceSource,
} from './mixed-analysis.js';
import { rankMeans, type TraitDirection } from '../../../common/ranking';
import {
  analyseTwoFactor,
  balancedTwoFactorProblem,
  blockTreatmentVarietyCells,
  type TwoFactorAnalysis,
} from './two-factor.js';
import { analyseUnbalancedFactorial } from './two-factor-unbalanced.js';
import { analyseSplitPlotMixed, type SplitPlotMixedAnalysis } from './split-plot-mixed.js';
import type { AnalysisModel } from '../../../common/contracts/analysis';

export type { Design } from './anova.js';

/** Bad input; the message is one line naming the row or column. */
export class AnalysisInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'AnalysisInputError';
  }
}

/** Input beyond a size limit the caller set; names the limit so the message can. */
export class AnalysisLimitError extends Error {
  constructor(
    readonly limit: 'rows' | 'entries',
    readonly max: number,
    readonly actual: number,
  ) {
    super(
      limit === 'rows'
        ? `The data has ${actual} rows; the limit is ${max} rows per analysis.`
        : `The data has ${actual} entries (varieties); the limit is ${max} entries per analysis.`,
    );
    this.name = 'AnalysisLimitError';
  }
}

/** Size limits on one analysis (none when left out). */
export interface AnalysisLimits {
  maxRows?: number;
  maxEntries?: number;
}

/** One measured plot (or one sub-sample of a plot). */
export interface PlotRow {
  variety: string;
  site?: string | null;
  block?: string | null;
  plot?: string | null;
  /** Two-factor trials: the plot's treatment level (fertilizer, irrigation, …). */
  treatment?: string | null;
  /** Decimal text (read exactly) or a number. Empty text or "NA" marks a missing value. */
  value: string | number | null;
  /** Row number to use in messages (defaults to position + 1). */
  row?: number;
}

export interface AnalyzeOptions {
  /** Name of the trait, reported back. */
  trait?: string;
  /** Significance level for F tests, LSD, HSD and letters (default 0.05). */
  alpha?: number;
  /** Layout; chosen from the columns present when omitted. */
  design?: Design;
  /** Which test the `group` letters come from (default "hsd"; both are always reported). */
  letters?: SeparationMethod;
  /** Force the means (orthogonal) or least-squares computation; default picks by layout. */
  method?: AnovaMethod;
  /** Include every pairwise comparison in the result (default false). */
  includePairs?: boolean;
  limits?: AnalysisLimits;
  /** Work limit for each letter display (see compactLettersWithin). */
  letterWorkLimit?: number;
  /**
   * Which way is better, for ranks and order (default "higher", the spreadsheet's reading).
   * "lower" ranks the smallest mean 1; "none" gives no ranks and orders by mean.
   */
  direction?: TraitDirection;
  /**
   * "anova" (default): the classical analysis of variance with least-squares means.
   * "mixed": REML with gardens, blocks (and site × variety where estimable) random; means,
   * ranks and letters from the BLUEs of the variety means.
   */
  model?: AnalysisModel;
  /**
   * What the site column holds: gardens or sites (default), or the replicates of one field in
   * an incomplete-block trial (the mixed model then has blocks random within replicates).
   */
  sitesAre?: 'site' | 'replicate';
  /**
   * With the mixed model: also fit varieties as random, for their variance, BLUPs and the
   * heritability (one more REML fit).
   */
  varietiesRandom?: boolean;
}

export type { AnalysisModel };

export interface EntrySummary {
  variety: string;
  /** Plot values for this entry (after sub-sample averaging). */
  n: number;
  /** Arithmetic mean of the entry's plot values. */
  mean: number;
  /** SD of the plot values (null with one plot). */
  sd: number | null;
  /** Descriptive standard error SD/√n of the entry's own plot values. */
  se: number | null;
  cvPercent: number | null;
  min: number;
  max: number;
  /** 1 = best in the trait's direction (by adjusted mean where there is one); ties share the best rank; null with no direction. */
  rank: number | null;
  /** Letters from the chosen test (see `letters`). */
  group: string;
  groupLsd: string;
  groupHsd: string;
}

export interface AnalysisResult {
  design: Design;
  trait: string;
  alpha: number;
  /** Plot values after sub-sample averaging. */
  n: number;
  grandMean: number;
  /** 100 × √(residual MS) / grand mean. */
  cvPercent: number | null;
  anova: AnovaLine[];
  means: EntrySummary[];
  lsd: { value: number | null; df: number; t: number; protected: boolean };
  hsd: { value: number | null; q: number; df: number };
  /** Test behind `means[].group`. */
  letters: SeparationMethod;
  /** Error term for mean separation: residual (crd, rcbd) or site:variety (multisite). */
  errorTerm: { source: 'residual' | 'site:variety'; df: number; ms: number };
  /** "means" for orthogonal layouts, "least-squares" (QR) otherwise. */
  method: 'means' | 'least-squares';
  counts: { entries: number; sites: number; blocks: number; rows: number; missingPlots: number };
  /** Which model the means, ranks and letters come from. */
  model: 'anova' | 'mixed';
  /**
   * Least-squares means (predictions averaged over blocks and sites with equal weights) with
   * their standard errors, in rank order; equal to the arithmetic means on balanced layouts.
   * `means[].rank` and the letters follow these.
   */
  adjustedMeans: { variety: string; mean: number; se: number }[];
  /** Why `group` letters are empty (too many entries to display within the limit), else null. */
  lettersOmitted: string | null;
  /** With the mixed model: REML variance components (σ², with an asymptotic SE where defined). */
  varianceComponents?: { source: VarianceSource; variance: number; se: number | null }[];
  /** With the mixed model: Wald F test for varieties, Satterthwaite denominator df. */
  fixedTest?: MixedVarietyAnalysis['fixedTest'];
  /** With the mixed model: the REML log-likelihood. */
  logLik?: number;
  /** With the mixed model: a variance component was estimated as zero and kept there. */
  boundary?: boolean;
  /** With the mixed model: how the variation splits between the random sources, in words. */
  varianceSummary?: string;
  /** With the mixed model and `varietiesRandom`: varieties random, BLUPs and heritability. */
  varietiesRandom?: {
    varianceComponents: {
      source: VarianceSource | 'variety';
      variance: number;
      se: number | null;
    }[];
    /**
     * Predicted mean = overall mean + BLUP, best first in the trait's direction, with its rank
     * (1 = best; null with no direction).
     */
    blups: { variety: string; blup: number; predicted: number; rank: number | null }[];
    meanVarianceOfBlueDifferences: number;
    heritability: number;
    logLik: number;
    boundary: boolean;
    summary: string;
  };
  pairs?: {
    a: string;
    b: string;
    /** Difference of adjusted means a − b. */
    difference: number;
    se: number;
    lsdSeparated: boolean;
    hsdSeparated: boolean;
    /** difference / se, on the error term's df. */
    t: number;
    /** Two-sided p of t, unadjusted. */
    p: number;
    /** Tukey-adjusted p (Tukey–Kramer with unequal SEs). */
    pTukey: number;
  }[];
  warnings: string[];
}

const MISSING = new Set(['', 'NA', 'na', 'N/A', 'n/a', '.']);
const PLAIN_DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)$/;

/** Integer codes for a factor's levels, in order of first appearance. */
class Coder {
  readonly levels: string[] = [];
  codes = new Int32Array(0);
  private readonly index = new Map<string, number>();
  code(level: string): number {
    let c = this.index.get(level);
    if (c === undefined) {
      c = this.levels.length;
      this.index.set(level, c);
      this.levels.push(level);
    }
    return c;
  }
}

/**
 * Magnitudes the analysis accepts: squares and sums of squares of values up to 1e150 stay
 * finite in double precision, and nonzero values from 1e-150 up keep their squares from
 * underflowing to zero (1e400 would be read as infinity, 1e-400 as 0).
 */
export const VALUE_LIMITS = { largest: 1e150, smallestNonZero: 1e-150 } as const;

/** Why a decimal text is outside VALUE_LIMITS, or null when it is inside. */
function outOfRangeReason(text: string): string | null {
  // Decimal text parsed exactly first: Number() would turn 1e400 into Infinity, 1e-400 into 0.
  const exact = new Decimal(text).abs();
  if (exact.isZero()) return null;
  if (exact.greaterThan(VALUE_LIMITS.largest))
    return 'is too large to analyse (largest accepted magnitude 1e150)';
  if (exact.lessThan(VALUE_LIMITS.smallestNonZero))
    return 'is too small to analyse (smallest accepted nonzero magnitude 1e-150)';
  return null;
}

/** "row 9 has no value", or a list of rows, with at most ten row numbers spelled out. */
function leftOutWarning(rowNumbers: readonly number[]): string {
  const shown = rowNumbers.slice(0, 10).join(', ');
  const more = rowNumbers.length > 10 ? ` and ${rowNumbers.length - 10} more` : '';
  return rowNumbers.length === 1
    ? `row ${shown} has no value: left out`
    : `rows ${shown}${more} have no value: ${rowNumbers.length} rows left out`;
}

/** A plot value as exact decimal text, null when it is missing; refuses what is not a number. */
function valueText(raw: PlotRow['value'], rowNo: number, trait: string): string | null {
  // Most cells are short plain decimals: already in the form readDecimalText gives back, and
  // too short (no exponent, at most 140 characters) to leave VALUE_LIMITS.
  if (typeof raw === 'string' && raw.length <= 140 && PLAIN_DECIMAL.test(raw)) return raw;
  if (raw === null || raw === undefined || (typeof raw === 'string' && MISSING.has(raw.trim())))
    return null;
  let text: string;
  if (typeof raw === 'number') {
    if (!Number.isFinite(raw))
      throw new AnalysisInputError(`row ${rowNo}, column "${trait}": ${raw} is not a number`);
    text = String(raw);
  } else {
    const reading = readDecimalText(raw);
    if (!reading.ok)
      throw new AnalysisInputError(
        `row ${rowNo}, column "${trait}": ${reading.message.replace(/\.$/, '')}`,
      );
    text = reading.text;
  }
  const outOfRange = outOfRangeReason(text);
  if (outOfRange)
    throw new AnalysisInputError(`row ${rowNo}, column "${trait}": ${text} ${outOfRange}`);
  return text;
}

function label(v: string | null | undefined): string | null {
  if (v === null || v === undefined) return null;
  const t = String(v).trim();
  return t === '' ? null : t;
}

/** Analyse already-parsed plot rows (for example database records). */
export function analyzePlotRows(
  rows: readonly PlotRow[],
  options: AnalyzeOptions = {},
): AnalysisResult {
  const alpha = options.alpha ?? 0.05;
  if (!(alpha > 0 && alpha < 1))
    throw new AnalysisInputError(`alpha must be between 0 and 1, got ${alpha}`);
  const trait = options.trait ?? 'value';
  const warnings: string[] = [];
  if (rows.length === 0) throw new AnalysisInputError('no data rows');
  const limits = options.limits ?? {};
  if (limits.maxRows !== undefined && rows.length > limits.maxRows)
    throw new AnalysisLimitError('rows', limits.maxRows, rows.length);

  const hasPlot = rows.some((r) => label(r.plot) !== null);
  const hasBlock = rows.some((r) => label(r.block) !== null);
  const hasSite = rows.some((r) => label(r.site) !== null);

  // One pass over the rows: check them, read values as exact decimal text, and code the
  // factors as integers in order of first appearance (rows sharing (site, plot) are
  // sub-samples of one plot, so a plot's factors are those of its first row).
  // Per value and per plot, in typed arrays sized for the rows (at most one plot per row).
  const texts: string[] = [];
  const plotOfValue = new Int32Array(rows.length);
  const missingRows: number[] = [];
  const entry = new Coder();
  const site = new Coder();
  const block = new Coder();
  // Per site: block label → global block code, plot label → plot index.
  const blocksAt: Map<string, number>[] = [];
  const plotsAt: Map<string, number>[] = [];
  const plotEntry = new Int32Array(rows.length);
  const plotSite = new Int32Array(rows.length);
  const plotBlock = new Int32Array(rows.length);
  const plotBlockLabel: (string | null)[] = [];
  const plotFirstRow = new Float64Array(rows.length);
  const plotRows = new Int32Array(rows.length);
  let plotCount = 0;
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i]!;
    const rowNo = r.row ?? i + 1;
    const variety = label(r.variety);
    if (variety === null) throw new AnalysisInputError(`row ${rowNo}, column "variety": empty`);
    const siteLabel = label(r.site);
    if (hasSite && siteLabel === null)
      throw new AnalysisInputError(`row ${rowNo}, column "site": empty`);
    const blockLabel = label(r.block);
    if (hasBlock && blockLabel === null)
      throw new AnalysisInputError(`row ${rowNo}, column "block": empty`);
    const plot = label(r.plot);
    if (hasPlot && plot === null)
      throw new AnalysisInputError(`row ${rowNo}, column "plot": empty`);
    const text = valueText(r.value, rowNo, trait);
    if (text === null) {
      missingRows.push(rowNo);
      continue;
    }
    const s = site.code(siteLabel ?? '');
    const plotsHere = (plotsAt[s] ??= new Map());
    const existing = plot === null ? undefined : plotsHere.get(plot);
    if (existing !== undefined) {
      const firstVariety = entry.levels[plotEntry[existing]!]!;
      if (firstVariety !== variety) {
        throw new AnalysisInputError(
          `row ${rowNo}, column "variety": plot "${plot}" is "${firstVariety}" in row ${plotFirstRow[existing]} but "${variety}" here`,
        );
      }
      if (plotBlockLabel[existing] !== blockLabel) {
        throw new AnalysisInputError(
          `row ${rowNo}, column "block": plot "${plot}" is in block "${plotBlockLabel[existing]}" in row ${plotFirstRow[existing]} but "${blockLabel}" here`,
        );
      }
      plotRows[existing]!++;
      plotOfValue[texts.length] = existing;
      texts.push(text);
      continue;
    }
    const p = plotCount++;
    if (plot !== null) plotsHere.set(plot, p);
    plotEntry[p] = entry.code(variety);
    plotSite[p] = s;
    const blocksHere = (blocksAt[s] ??= new Map());
    const blockKey = blockLabel ?? '';
    let b = blocksHere.get(blockKey);
    if (b === undefined) {
      b = block.code(`${siteLabel ?? ''}\u0000${blockKey}`);
      blocksHere.set(blockKey, b);
    }
    plotBlock[p] = b;
    if (hasPlot) plotBlockLabel[p] = blockLabel;
    plotFirstRow[p] = rowNo;
    plotRows[p] = 1;
    plotOfValue[texts.length] = p;
    texts.push(text);
  }
  if (missingRows.length > 0) warnings.push(leftOutWarning(missingRows));
  if (texts.length === 0) throw new AnalysisInputError(`column "${trait}": no values`);
  let subSampled = 0;
  for (let p = 0; p < plotCount; p++) if (plotRows[p]! > 1) subSampled++;
  if (subSampled > 0) {
    warnings.push(
      `sub-samples averaged: ${texts.length} rows became ${plotCount} plot values (${subSampled} plots had more than one row)`,
    );
  }

  // Exact offset removal, then one value per plot (sub-samples added in row order).
  const centred = centreDecimalTexts(texts);
  const y = new Float64Array(plotCount);
  for (let j = 0; j < texts.length; j++) y[plotOfValue[j]!]! += centred.deviations[j]!;
  if (subSampled > 0) for (let p = 0; p < plotCount; p++) y[p] = y[p]! / plotRows[p]!;
  entry.codes = plotEntry.slice(0, plotCount);
  site.codes = plotSite.slice(0, plotCount);
  block.codes = plotBlock.slice(0, plotCount);

  if (limits.maxEntries !== undefined && entry.levels.length > limits.maxEntries)
    throw new AnalysisLimitError('entries', limits.maxEntries, entry.levels.length);
  if (entry.levels.length < 2) {
    throw new AnalysisInputError(
      `column "variety": only one entry ("${entry.levels[0]}"); at least two are needed to compare`,
    );
  }

  let design: Design;
  if (options.design) {
    design = options.design;
    if (design !== 'crd' && !hasBlock)
      throw new AnalysisInputError(`column "block": required for design ${design}`);
    if (design === 'multisite' && site.levels.length < 2) {
      throw new AnalysisInputError(
        `column "site": design multisite needs at least two sites, found ${hasSite ? site.levels.length : 0}`,
      );
    }
  } else if (hasBlock && site.levels.length >= 2) design = 'multisite';
  else if (hasBlock) design = 'rcbd';
  else design = 'crd';

  const layout: PlotLayout = { y, entry: entry.codes, entries: entry.levels.length };
  if (design !== 'crd') {
    layout.block = block.codes;
    layout.blocks = block.levels.length;
  }
  if (design === 'multisite') {
    layout.site = site.codes;
    layout.sites = site.levels.length;
  }

  // Missing plots: block × variety cells with no plot.
  let missingPlots = 0;
  if (design !== 'crd') {
    const cells = block.levels.length * entry.levels.length;
    // One flag per cell while that stays small; a set of the cells met otherwise.
    const seen = cells <= 1 << 24 ? new Uint8Array(cells) : null;
    const met = seen ? null : new Set<number>();
    let filled = 0;
    for (let i = 0; i < y.length; i++) {
      const cell = block.codes[i]! * entry.levels.length + entry.codes[i]!;
      if (seen) {
        filled += 1 - seen[cell]!;
        seen[cell] = 1;
      } else met!.add(cell);
    }
    missingPlots = cells - (met ? met.size : filled);
  }
  const orthogonal = isOrthogonal(design, layout);

  const av = analyseVariance(design, layout, options.method ?? 'auto');
  const residual = av.residual;
  if (!(residual.df > 0)) {
    throw new AnalysisInputError(
      `no residual degrees of freedom left: ${y.length} plot values, ${y.length - residual.df} model parameters (add replicates)`,
    );
  }
  if (!(av.error.df > 0)) {
    throw new AnalysisInputError(
      `no degrees of freedom left for ${av.error.source} to test varieties against`,
    );
  }

  if (design !== 'crd' && missingPlots > 0) {
    // Under the mixed model the ranks come from its estimated means, not the ANOVA's.
    warnings.push(
      options.model === 'mixed'
        ? `unbalanced: ${missingPlots} missing plot(s) (block × variety cells with no value); the mixed model uses every plot left, and ranks and letters come from its estimated means (BLUEs), arithmetic means are shown beside them`
        : `unbalanced: ${missingPlots} missing plot(s) (block × variety cells with no value); sequential (type I) sums of squares in the order ${design === 'multisite' ? 'site, block, variety, site:variety' : 'block, variety'}; ranks and letters come from adjusted (least-squares) means, arithmetic means are shown beside them`,
    );
  } else if (!orthogonal) {
    warnings.push(
      'unbalanced: varieties occur unequally often across blocks; sequential (type I) sums of squares',
    );
  }
  if (design === 'multisite' && !orthogonal && options.model !== 'mixed') {
    warnings.push('with missing plots, the variety test against site:variety is approximate');
  }

  // Per-entry descriptives (deviations plus offset) and mean separation on deviations, so
  // differences keep all their digits even with a large common part.
  const groups: number[][] = entry.levels.map(() => []);
  for (let i = 0; i < y.length; i++) groups[entry.codes[i]!]!.push(y[i]!);
  const descs = groups.map((g) => describe(g));
  const varietyLine = av.lines.find((l) => l.source === 'variety');
  const model = options.model ?? 'anova';
  let mixed: MixedVarietyAnalysis | null = null;
  let varietiesRandom: AnalysisResult['varietiesRandom'];
  if (model === 'mixed') {
    const mixedLayout = {
      y,
      entry: entry.codes,
      entries: entry.levels.length,
      ...(hasSite ? { site: { cells: site.codes, levels: site.levels.length } } : {}),
      ...(design === 'crd' ? {} : { block: { cells: block.codes, levels: block.levels.length } }),
      ...(options.sitesAre ? { sitesAre: options.sitesAre } : {}),
    };
    const fitted = mixedVarietyAnalysis(mixedLayout);
    if (typeof fitted === 'string') throw new AnalysisInputError(fitted);
    mixed = fitted;
    if (options.varietiesRandom) {
      const r = varietiesRandomAnalysis(mixedLayout, fitted);
      if (typeof r === 'string') warnings.push(`varieties as random: not fitted (${r})`);
      else
        varietiesRandom = {
          varianceComponents: r.varianceComponents,
          // Ranked on the predicted means like every other ranking; tied predictions keep
          // the entries' alphabetical order.
          blups: rankMeans(
            entry.levels
              .map((variety, i) => ({
                variety,
                blup: r.blup[i]!,
                mean: addOffset(centred.offset, r.predicted[i]!),
              }))
              .sort((a, b) => a.variety.localeCompare(b.variety)),
            options.direction ?? 'higher',
          ).map(({ variety, blup, mean, rank }) => ({ variety, blup, predicted: mean, rank })),
          meanVarianceOfBlueDifferences: r.meanVarianceOfBlueDifferences,
          heritability: r.heritability,
          logLik: r.logLik,
          boundary: r.boundary,
          summary: r.summary,
        };
    }
    if (mixed.boundary) {
      const zero = mixed.varianceComponents.filter((c) => c.variance === 0).map((c) => c.source);
      warnings.push(
        `mixed model at the boundary: the ${zero.join(' and ')} variance was estimated as zero and kept at zero`,
      );
    }
  }
  let adjusted: AdjustedMeans;
  let adjustedOk = true;
  const adjustedInput = {
    y,
    entry: entry.codes,
    entries: entry.levels.length,
    errorMs: av.error.ms,
    orthogonal,
    ...(design === 'crd'
      ? {}
      : { block: block.codes, blocks: block.levels.length, siteOfBlock: siteOfEachBlock() }),
  };
  try {
    adjusted = mixed
      ? { mean: mixed.mean, se: mixed.se, pairSe: mixed.pairSe }
      : adjustedMeans(adjustedInput);
  } catch (err) {
    if (!(err instanceof NotConnectedError)) throw err;
    // Entries and blocks fall apart into unlinked groups: no common scale to adjust to.
    adjustedOk = false;
    adjusted = adjustedMeans({ ...adjustedInput, orthogonal: true });
    warnings.push(
      'blocks and varieties are not connected (some varieties never share a block with the others): adjusted means cannot be estimated; ranks and letters use arithmetic means',
    );
  }
  const modelBased = mixed !== null || (adjustedOk && !orthogonal);
  // Mixed model: letters on the pairwise standard errors with the variety test's
  // denominator df (Satterthwaite).
  const separationDf = mixed ? mixed.fixedTest.denDf : av.error.df;
  let sep: ReturnType<typeof separateMeans>;
  try {
    sep = separateMeans(
      entry.levels.map((name, i) => ({ entry: name, mean: adjusted.mean[i]!, n: descs[i]!.n })),
      av.error.ms,
      separationDf,
      alpha,
      mixed ? mixed.fixedTest.p : (varietyLine?.p ?? null),
      {
        ...(modelBased ? { pairSe: adjusted.pairSe } : {}),
        includePairs: options.includePairs ?? false,
        ...(options.letterWorkLimit === undefined
          ? {}
          : { letterWorkLimit: options.letterWorkLimit }),
      },
    );
  } catch (err) {
    // A critical value the distribution functions cannot give (an extreme alpha).
    if (err instanceof RangeError) throw new AnalysisInputError(err.message);
    throw err;
  }
  if (!sep.replicates) {
    const counts = [...new Set(descs.map((d) => d.n))].sort((a, b) => a - b);
    warnings.push(
      counts.length > 1
        ? `unequal replication (${counts.join(', ')} plots per entry): each pair of entries has its own LSD and HSD, so no single value is given`
        : 'Each pair of entries has its own LSD and HSD (each difference of adjusted means has its own standard error), so no single value is given',
    );
  }
  for (const w of sep.warnings) if (!w.startsWith('unequal replication')) warnings.push(w);

  const lettersFrom = options.letters ?? 'hsd';
  // Ranks in the trait's direction, by the adjusted means (equal to the arithmetic ones when
  // balanced); each entry's line is made once, in rank order.
  const adjustedMean = Array.from(adjusted.mean, (m) => addOffset(centred.offset, m));
  const ranked = rankMeans(
    sep.ranked.map((r) => ({ r, mean: adjustedMean[r.index]! })),
    options.direction ?? 'higher',
  );
  const means: EntrySummary[] = ranked.map(({ r, rank }) => {
    const d = descs[r.index]!;
    const mean = addOffset(centred.offset, d.mean);
    return {
      variety: r.entry,
      n: d.n,
      mean,
      sd: d.sd,
      se: d.se,
      cvPercent: d.sd === null || mean === 0 ? null : (100 * d.sd) / Math.abs(mean),
      min: addOffset(centred.offset, d.min),
      max: addOffset(centred.offset, d.max),
      group: lettersFrom === 'lsd' ? r.lsdGroup : r.hsdGroup,
      groupLsd: r.lsdGroup,
      groupHsd: r.hsdGroup,
      rank,
    };
  });

  const grandMean = addOffset(centred.offset, accurateMean(y));
  const result: AnalysisResult = {
    design,
    trait,
    alpha,
    n: y.length,
    grandMean,
    cvPercent:
      grandMean !== 0 && residual.ms >= 0
        ? (100 * Math.sqrt(residual.ms)) / Math.abs(grandMean)
        : null,
    anova: av.lines,
    means,
    lsd: sep.lsd,
    hsd: { ...sep.hsd, df: separationDf },
    letters: lettersFrom,
    errorTerm: {
      source: av.error.source as 'residual' | 'site:variety',
      df: av.error.df,
      ms: av.error.ms,
    },
    method: av.method,
    model,
    adjustedMeans: ranked.map(({ r }) => ({
      variety: r.entry,
      mean: adjustedMean[r.index]!,
      se: adjusted.se[r.index]!,
    })),
    counts: {
      entries: entry.levels.length,
      sites:
        options.sitesAre === 'replicate'
          ? 1
          : design === 'multisite' || hasSite
            ? site.levels.length
            : 0,
      blocks: design === 'crd' ? 0 : block.levels.length,
      rows: rows.length,
      missingPlots,
    },
    lettersOmitted: sep.lettersOmitted,
    ...(mixed
      ? {
          varianceComponents: mixed.varianceComponents,
          fixedTest: mixed.fixedTest,
          logLik: mixed.logLik,
          boundary: mixed.boundary,
          varianceSummary: mixed.summary,
          ...(varietiesRandom ? { varietiesRandom } : {}),
        }
      : {}),
    warnings,
  };
  if (sep.pairs) {
    const k = entry.levels.length;
    const indexOf = new Map(entry.levels.map((n, i) => [n, i]));
    result.pairs = sep.pairs.map((pair) => {
      const t = pair.se > 0 ? pair.difference / pair.se : pair.difference === 0 ? 0 : Infinity;
      // Mixed model: each difference on its own Satterthwaite df, as emmeans gives.
      const pairDf = mixed ? mixed.pairDf(indexOf.get(pair.a)!, indexOf.get(pair.b)!) : av.error.df;
      return {
        a: pair.a,
        b: pair.b,
        difference: pair.difference,
        se: pair.se,
        lsdSeparated: pair.lsdSeparated,
        hsdSeparated: pair.hsdSeparated,
        t,
        p: studentTTwoSided(t, pairDf),
        pTukey: Math.min(1, studentizedRangeUpperTail(Math.abs(t) * Math.SQRT2, k, separationDf)),
      };
    });
  }
  return result;

  function siteOfEachBlock(): Int32Array {
    const of = new Int32Array(block.levels.length);
    for (let i = 0; i < y.length; i++)
      of[block.codes[i]!] = design === 'multisite' ? site.codes[i]! : 0;
    return of;
  }
}

const KNOWN_COLUMNS = ['variety', 'site', 'block', 'plot'] as const;
type LayoutColumn = (typeof KNOWN_COLUMNS)[number];

export interface AnalyzeCsvOptions extends AnalyzeOptions {
  /**
   * Header cells to read as the layout columns (matched case-insensitively); a role left out
   * is looked for under its own name, and an empty name means the sheet has no such column.
   * The value column is `trait`.
   */
  columns?: Partial<Record<LayoutColumn, string>>;
}

/**
 * A hint when the header row looks separated by semicolons or tabs (spreadsheets in locales
 * with a decimal comma save "CSV" that way); empty otherwise.
 */
function separatorHint(csvText: string): string {
  const firstLine = csvText.replace(/^\uFEFF/, '').split(/\r?\n/, 1)[0] ?? '';
  if (firstLine.includes(',')) return '';
  const tabs = firstLine.split('\t').length - 1;
  const semicolons = firstLine.split(';').length - 1;
  if (tabs === 0 && semicolons === 0) return '';
  const which = tabs >= semicolons ? 'tabs' : 'semicolons';
  return ` (the header row is separated by ${which}, not commas: save the sheet as comma-separated values, with a point as the decimal mark)`;
}

/** Analyse CSV text with a header row (see the analyze command for the column rules). */
export function analyzeCsv(csvText: string, options: AnalyzeCsvOptions = {}): AnalysisResult {
  const { rows, trait, rest } = readCsvRows(csvText, options);
  return analyzePlotRows(rows, { ...rest, trait });
}

/** A two-factor trial from CSV text: `factor` names the treatment column. */
export function analyzeTwoFactorCsv(
  csvText: string,
  options: AnalyzeCsvOptions & { factor: string; splitPlot?: boolean },
): TwoFactorResult {
  const { factor, splitPlot, ...others } = options;
  const { rows, trait, rest } = readCsvRows(csvText, others, factor);
  return analyzeTwoFactorRows(rows, { ...rest, trait, splitPlot: splitPlot ?? false, factor });
}

/**
 * The records of a sheet written without quotes and with one kind of line end, split directly;
 * null for anything else (quotes, mixed or bare-CR line ends, rows of unequal length), which the
 * full CSV reader takes, with its own messages. Gives what that reader gives for such text: no
 * BOM, empty lines skipped.
 */
function plainCsvRecords(csvText: string): string[][] | null {
  const text = csvText.charCodeAt(0) === 0xfeff ? csvText.slice(1) : csvText;
  if (text.includes('"')) return null;
  const crs = text.split('\r').length - 1;
  if (crs > 0 && (text.split('\r\n').length - 1 !== crs || text.split('\n').length - 1 !== crs))
    return null;
  const eol = crs > 0 ? '\r\n' : '\n';
  const records: string[][] = [];
  let width = -1;
  // Cut at the positions of line ends and commas (faster than splitting each line apart).
  for (let start = 0; start < text.length;) {
    let end = text.indexOf(eol, start);
    if (end < 0) end = text.length;
    if (end > start) {
      const fields: string[] = [];
      for (let from = start; ;) {
        const comma = text.indexOf(',', from);
        if (comma < 0 || comma >= end) {
          fields.push(text.slice(from, end));
          break;
        }
        fields.push(text.slice(from, comma));
        from = comma + 1;
      }
      if (width < 0) width = fields.length;
      else if (fields.length !== width) return null;
      records.push(fields);
    }
    start = end + eol.length;
  }
  return records;
}

function readCsvRows(csvText: string, options: AnalyzeCsvOptions, factor?: string) {
  let records: string[][];
  try {
    records =
      plainCsvRecords(csvText) ??
      (parse(csvText, {
        bom: true,
        skip_empty_lines: true,
        relax_column_count: false,
      }) as string[][]);
  } catch (err) {
    const msg = err instanceof Error ? err.message : String(err);
    throw new AnalysisInputError(
      `CSV could not be read: ${msg.split('\n')[0]}${separatorHint(csvText)}`,
    );
  }
  if (records.length === 0) throw new AnalysisInputError('file is empty: no header row');
  const header = records[0]!.map((h) => h.trim());
  const seen = new Set<string>();
  for (const h of header) {
    if (h === '') throw new AnalysisInputError('row 1: a column has an empty name');
    if (seen.has(h.toLowerCase()))
      throw new AnalysisInputError(`row 1, column "${h}": appears twice`);
    seen.add(h.toLowerCase());
  }
  const find = (name: string) => header.findIndex((h) => h.toLowerCase() === name.toLowerCase());
  const { columns, ...analyzeOptions } = options;
  const col = {} as Record<LayoutColumn, number>;
  for (const c of KNOWN_COLUMNS) {
    const chosen = columns?.[c];
    if (chosen !== undefined && chosen.trim() === '') col[c] = -1;
    else if (chosen !== undefined) {
      col[c] = find(chosen.trim());
      if (col[c] < 0)
        throw new AnalysisInputError(
          `column "${chosen}": not found in the header (chosen as ${c})`,
        );
    } else col[c] = find(c);
  }
  if (col.variety < 0)
    throw new AnalysisInputError(
      `column "variety": not found in the header${separatorHint(csvText)}`,
    );
  let factorCol = -1;
  if (factor !== undefined) {
    factorCol = find(factor.trim());
    if (factorCol < 0)
      throw new AnalysisInputError(
        `column "${factor}": not found in the header (given by --factor)`,
      );
    if (col.block < 0)
      throw new AnalysisInputError('column "block": required for a two-factor trial');
  }
  const chosenCols = [...Object.values(col), factorCol].filter((i) => i >= 0);
  const layoutCols = new Set(chosenCols);
  if (layoutCols.size !== chosenCols.length)
    throw new AnalysisInputError('one column is chosen for two layout roles');

  let valueCol: number;
  if (options.trait !== undefined) {
    valueCol = header.indexOf(options.trait);
    if (valueCol < 0) valueCol = find(options.trait);
    if (valueCol < 0)
      throw new AnalysisInputError(
        `column "${options.trait}": not found in the header (given by --trait)`,
      );
    if (layoutCols.has(valueCol)) {
      throw new AnalysisInputError(`column "${header[valueCol]}": is a layout column, not a trait`);
    }
  } else {
    const others = header
      .map((h, i) => ({ h, i }))
      .filter(
        ({ h, i }) =>
          !layoutCols.has(i) && !(KNOWN_COLUMNS as readonly string[]).includes(h.toLowerCase()),
      );
    if (others.length === 0)
      throw new AnalysisInputError('no value column: the header has only variety/site/block/plot');
    if (others.length > 1) {
      throw new AnalysisInputError(
        `several value columns (${others.map((o) => `"${o.h}"`).join(', ')}): choose one with --trait`,
      );
    }
    valueCol = others[0]!.i;
  }
  const trait = header[valueCol]!;
  if (records.length === 1)
    throw new AnalysisInputError('no data rows: the file has only a header');

  const rows: PlotRow[] = [];
  for (let r = 1; r < records.length; r++) {
    const rec = records[r]!;
    // Spreadsheet numbering: the header is row 1.
    rows.push({
      row: r + 1,
      variety: rec[col.variety] ?? '',
      site: col.site >= 0 ? (rec[col.site] ?? '') : null,
      block: col.block >= 0 ? (rec[col.block] ?? '') : null,
      plot: col.plot >= 0 ? (rec[col.plot] ?? '') : null,
      ...(factorCol >= 0 ? { treatment: rec[factorCol] ?? '' } : {}),
      value: rec[valueCol] ?? '',
    });
  }
  // Presence of the column (not of values) decides whether it is part of the layout.
  if (col.block >= 0) for (const r of rows) r.block ??= '';
  return { rows, trait, rest: analyzeOptions };
}

export interface TwoFactorResult extends Omit<TwoFactorAnalysis, 'cellMeans' | 'varietyMeans'> {
  design: 'rcbd';
  /** The treatment column's name. */
  factor: string;
  trait: string;
  alpha: number;
  n: number;
  grandMean: number;
  cvPercent: number | null;
  letters: SeparationMethod;
  /**
   * 'anova': the classical strata (or least squares for a factorial that lost plots); 'mixed':
   * a split plot by REML, the model a split plot with missing plots is given unless the
   * classical analysis is asked for by name (which is then refused).
   */
  model: 'anova' | 'mixed';
  /** Mixed model only: REML variance components (block, block:treatment, residual). */
  varianceComponents?: SplitPlotMixedAnalysis['varianceComponents'];
  /** Mixed model only: sequential Wald F tests with Satterthwaite's denominator df. */
  fixedTests?: SplitPlotMixedAnalysis['fixedTests'];
  /** Mixed model only: the variety test of `fixedTests`, where a one-factor analysis gives it. */
  fixedTest?: Omit<SplitPlotMixedAnalysis['fixedTests'][number], 'source'> & { source: 'variety' };
  /** Mixed model only: the REML log-likelihood. */
  logLik?: number;
  /** Mixed model only: a variance component was estimated as zero and kept there. */
  boundary?: boolean;
  /** 'means' on a balanced layout; 'least-squares' when plots are missing. */
  method: 'means' | 'least-squares';
  /** One object per treatment × variety cell (emmeans' emmean and SE). */
  adjustedMeans: { variety: string; treatment: string; mean: number; se: number; df: number }[];
  varietyMeans: TwoFactorAnalysis['varietyMeans'];
  counts: {
    entries: number;
    treatments: number;
    blocks: number;
    rows: number;
    missingPlots: number;
  };
  warnings: string[];
}

/** A two-factor trial (treatment × variety) in complete blocks, factorial or split plot. */
export function analyzeTwoFactorRows(
  rows: readonly PlotRow[],
  options: AnalyzeOptions & { splitPlot: boolean; factor?: string },
): TwoFactorResult {
  const alpha = options.alpha ?? 0.05;
  if (!(alpha > 0 && alpha < 1))
    throw new AnalysisInputError(`alpha must be between 0 and 1, got ${alpha}`);
  if (options.model === 'mixed' && !options.splitPlot)
    throw new AnalysisInputError(
      'the mixed model is offered for split plots (--split-plot); a factorial in blocks is analysed by the classical analysis of variance (--model anova), by least squares when plots are missing',
    );
  const trait = options.trait ?? 'value';
  const factor = options.factor ?? 'treatment';
  if (rows.length === 0) throw new AnalysisInputError('no data rows');
  const warnings: string[] = [];
  const texts: string[] = [];
  const kept: { variety: string; block: string; treatment: string }[] = [];
  const missingRows: number[] = [];
  rows.forEach((r, i) => {
    const rowNo = r.row ?? i + 1;
    const variety = label(r.variety);
    if (variety === null) throw new AnalysisInputError(`row ${rowNo}, column "variety": empty`);
    const block = label(r.block);
    if (block === null) throw new AnalysisInputError(`row ${rowNo}, column "block": empty`);
    const treatment = label(r.treatment);
    if (treatment === null) throw new AnalysisInputError(`row ${rowNo}, column "${factor}": empty`);
    const text = valueText(r.value, rowNo, trait);
    if (text === null) {
      missingRows.push(rowNo);
      return;
    }
    texts.push(text);
    kept.push({ variety, block, treatment });
  });
  if (missingRows.length > 0) warnings.push(leftOutWarning(missingRows));
  if (kept.length === 0) throw new AnalysisInputError(`column "${trait}": no values`);
  const centred = centreDecimalTexts(texts);
  const code = (values: string[]) => {
    const map = new Map<string, number>();
    const codes = Int32Array.from(values, (v) => {
      let c = map.get(v);
      if (c === undefined) map.set(v, (c = map.size));
      return c;
    });
    return { codes, levels: [...map.keys()] };
  };
  const layout = {
    y: Float64Array.from(centred.deviations),
    block: code(kept.map((k) => k.block)),
    treatment: code(kept.map((k) => k.treatment)),
    variety: code(kept.map((k) => k.variety)),
  };
  const cells = blockTreatmentVarietyCells(layout);
  const problem = balancedTwoFactorProblem(layout, factor, cells);
  // The empty cells themselves: a cell holding two plots must not hide one holding none.
  const missingPlots = cells.missing.length;
  const lostPlots = problem !== null && problem.startsWith('missing plots');
  const lost = `${missingPlots} missing plot${missingPlots === 1 ? '' : 's'}`;
  // A split plot that lost plots: the classical strata need balance, the mixed model does not.
  if (lostPlots && options.splitPlot && options.model === 'anova')
    throw new AnalysisInputError(
      `${problem}; a split plot with missing plots is analysed by the mixed model (choose the mixed model, or leave the model unset)`,
    );
  const model = options.model ?? (lostPlots && options.splitPlot ? 'mixed' : 'anova');
  // A factorial that lost plots is fitted by least squares.
  const unbalanced = lostPlots && !options.splitPlot;
  const mixedTakes = lostPlots || (problem?.endsWith('hold more than one plot') ?? false);
  if (problem && !unbalanced && !(model === 'mixed' && mixedTakes))
    throw new AnalysisInputError(problem);
  if (unbalanced)
    warnings.push(
      `${lost}: sequential sums of squares in the order block, ${factor}, variety, variety × ${factor}; means are least-squares means averaged over blocks.`,
    );
  if (model === 'mixed' && lostPlots)
    warnings.push(
      `${lost}: the split plot's classical strata need every plot, so it is analysed by the mixed model (REML: blocks and main plots random; sequential Wald F tests in the order ${factor}, variety, variety × ${factor} with Satterthwaite's df; means are the model's, averaged with equal weights).`,
    );
  let result: TwoFactorAnalysis;
  let mixed: SplitPlotMixedAnalysis | null = null;
  try {
    const input = {
      ...layout,
      offset: centred.offset,
      splitPlot: options.splitPlot,
      alpha,
      letters: options.letters ?? 'hsd',
      direction: options.direction ?? ('higher' as const),
    };
    if (model === 'mixed') mixed = analyseSplitPlotMixed(input);
    result = mixed ?? (unbalanced ? analyseUnbalancedFactorial(input) : analyseTwoFactor(input));
  } catch (err) {
    if (err instanceof RangeError) throw new AnalysisInputError(err.message);
    throw err;
  }
  if (mixed?.boundary) {
    const zero = mixed.varianceComponents
      .filter((c) => c.variance === 0)
      .map((c) => (c.source === 'block:treatment' ? `block × ${factor}` : c.source));
    warnings.push(
      `mixed model at the boundary: the ${zero.join(' and ')} variance was estimated as zero and kept at zero`,
    );
  }
  const grandMean = addOffset(centred.offset, accurateMean(layout.y));
  const { cellMeans, ...rest } = result;
  return {
    design: 'rcbd',
    factor,
    trait,
    alpha,
    n: layout.y.length,
    grandMean,
    cvPercent:
      grandMean !== 0 ? (100 * Math.sqrt(result.errorTerm.ms)) / Math.abs(grandMean) : null,
    letters: options.letters ?? 'hsd',
    model,
    method: unbalanced || model === 'mixed' ? 'least-squares' : 'means',
    ...rest,
    ...(mixed
      ? {
          fixedTest: {
            ...mixed.fixedTests.find((t) => t.source === 'variety')!,
            source: 'variety',
          },
        }
      : {}),
    adjustedMeans: cellMeans,
    counts: {
      entries: layout.variety.levels.length,
      treatments: layout.treatment.levels.length,
      blocks: layout.block.levels.length,
      rows: rows.length,
      missingPlots: lostPlots ? missingPlots : 0,
    },
    warnings,
  };
}
