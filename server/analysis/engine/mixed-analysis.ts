/**
 * The variety analysis as a mixed model: varieties fixed, the layout's gardens (sites), blocks
 * within them and, where the data can tell it from the residual, site × variety random.
 *   - a network of gardens (site column, no blocks):  y ~ variety + (1|site)
 *   - one site in blocks:                             y ~ variety + (1|block)
 *   - several sites in blocks:                        y ~ variety + (1|site) + (1|site:block)
 *                                                       [+ (1|site:variety) when plots repeat
 *                                                        within site × variety cells]
 * Means are the BLUEs of the variety means (intercept + variety effect, equal to emmeans'
 * estimated marginal means for this model) with their standard errors; the variety test is a
 * Wald F with Satterthwaite's denominator degrees of freedom.
 */
import { fitReml, varietyTestContrasts, type RandomTerm } from './mixed-model.js';
import type { varianceSources } from '../../../common/contracts/analysis';

export interface MixedLayout {
  /** Plot values (deviations from an offset are fine). */
  y: Float64Array;
  entry: Int32Array;
  entries: number;
  site?: { cells: Int32Array; levels: number };
  /** Global block codes (a block at one site differs from the same label at another). */
  block?: { cells: Int32Array; levels: number };
  /**
   * What the site codes stand for: gardens or sites (default), or the replicates of one field
   * in an incomplete-block trial, whose blocks are then random within replicates.
   */
  sitesAre?: 'site' | 'replicate';
}

export type VarianceSource = (typeof varianceSources)[number];

export interface MixedVarietyAnalysis {
  varianceComponents: { source: VarianceSource; variance: number; se: number | null }[];
  fixedTest: {
    source: 'variety';
    numDf: number;
    denDf: number;
    f: number;
    p: number;
    method: 'satterthwaite';
  };
  logLik: number;
  boundary: boolean;
  /** BLUE of each entry's mean (per entry code, on the scale of `y`). */
  mean: Float64Array;
  se: Float64Array;
  /** Standard error of the difference between entries i and j. */
  pairSe(i: number, j: number): number;
  /** Satterthwaite df of that difference. */
  pairDf(i: number, j: number): number;
  /** How much of the variation each source holds, in words. */
  summary: string;
}

const SOURCE_WORDS: Record<VarianceSource | 'variety', string> = {
  'block:treatment': 'main plots (block × treatment)',
  variety: 'varieties',
  site: 'gardens (sites)',
  'site:block': 'blocks within gardens',
  block: 'blocks',
  'site:variety': 'varieties doing differently in different gardens',
  replicate: 'replicates',
  'replicate:block': 'blocks within replicates',
  residual: 'plot-to-plot (residual)',
};

/** The layout's random terms (gardens, blocks, garden × variety where estimable), or why none. */
function layoutRandomTerms(layout: MixedLayout): RandomTerm[] | string {
  const { y, entry, entries: k } = layout;
  const n = y.length;
  const random: RandomTerm[] = [];
  const sites = layout.site && layout.site.levels >= 2 ? layout.site : null;
  const kind = layout.sitesAre ?? 'site';
  if (sites) random.push({ source: kind, cells: sites.cells, levels: sites.levels });
  // A garden that is one block (a network where each garden grows some entries): the block
  // term would repeat the site term, so it is left out.
  const block =
    layout.block && !(sites && layout.block.levels === sites.levels) ? layout.block : null;
  if (block) {
    random.push({
      source: sites ? `${kind}:block` : 'block',
      cells: block.cells,
      levels: block.levels,
    });
  }
  if (sites && block && kind === 'site') {
    const cells = new Int32Array(n);
    const seen = new Map<number, number>();
    for (let i = 0; i < n; i++) {
      const key = sites.cells[i]! * k + entry[i]!;
      let c = seen.get(key);
      if (c === undefined) seen.set(key, (c = seen.size));
      cells[i] = c;
    }
    // Only estimable apart from the residual when some cell holds more than one plot.
    if (seen.size < n) random.push({ source: 'site:variety', cells, levels: seen.size });
  }
  if (random.length === 0)
    return 'the mixed model needs a site or block column (gardens or blocks to treat as random)';
  return random;
}

export function mixedVarietyAnalysis(layout: MixedLayout): MixedVarietyAnalysis | string {
  const { y, entry, entries: k } = layout;
  const n = y.length;
  const random = layoutRandomTerms(layout);
  if (typeof random === 'string') return random;

  const fit = fitReml({ y, fixedCells: entry, fixedLevels: k, random });
  const counts = new Float64Array(k);
  for (let i = 0; i < n; i++) counts[entry[i]!]! += 1;
  const test = fit.waldF(varietyTestContrasts(counts));
  // β̂ are the variety means themselves (BLUEs).
  const mean = Float64Array.from(fit.beta);
  const se = new Float64Array(k);
  for (let e = 0; e < k; e++) se[e] = Math.sqrt(fit.vcovBeta[e * k + e]!);
  // Differences' SEs straight from Var(β̂) (cheap, needed for every letter decision); their
  // Satterthwaite df only when a pair's p is asked for.
  const v = fit.vcovBeta;
  const pairSe = (i: number, j: number) => {
    return Math.sqrt(Math.max(v[i * k + i]! + v[j * k + j]! - 2 * v[i * k + j]!, 0));
  };
  const pairDf = (i: number, j: number) => {
    const l = new Float64Array(k);
    l[i] = 1;
    l[j] = -1;
    return fit.contrast(l).df;
  };

  const components = fit.varianceComponents.map((c) => ({
    source: c.source as VarianceSource,
    variance: c.variance,
    se: c.se,
  }));
  const summary = varianceSummary(components);

  return {
    varianceComponents: components,
    fixedTest: { source: 'variety', ...test, method: 'satterthwaite' },
    logLik: fit.logLik,
    boundary: fit.boundary,
    mean,
    se,
    pairSe,
    pairDf,
    summary,
  };
}

function varianceSummary(
  components: readonly { source: VarianceSource | 'variety'; variance: number }[],
): string {
  const total = components.reduce((s, c) => s + c.variance, 0);
  const share = components
    .map((c) => ({ c, pct: total > 0 ? (100 * c.variance) / total : 0 }))
    .sort((a, b) => b.pct - a.pct)
    .map(
      ({ c, pct }) =>
        `${SOURCE_WORDS[c.source]} ${pct < 0.5 && pct > 0 ? '<1' : Math.round(pct)} %`,
    );
  const zero = components.filter((c) => c.variance === 0).map((c) => SOURCE_WORDS[c.source]);
  const varietiesIn = components.some((c) => c.source === 'variety');
  return (
    `Of the variation${varietiesIn ? '' : ' left once varieties are accounted for'}: ${share.join(', ')}.` +
    (zero.length > 0
      ? ` The data show no variation of their own for ${zero.join(' and ')} (estimated as zero).`
      : '')
  );
}

export interface VarietiesRandomAnalysis {
  /** REML components with varieties random: "variety" first, then the layout's terms. */
  varianceComponents: { source: VarianceSource | 'variety'; variance: number; se: number | null }[];
  /** The overall mean μ̂ (on the scale of `y`). */
  intercept: number;
  /** Each entry's BLUP û (shrunk towards 0) and predicted mean μ̂ + û, per entry code. */
  blup: Float64Array;
  predicted: Float64Array;
  /** Mean variance of a difference of two BLUEs (varieties fixed). */
  meanVarianceOfBlueDifferences: number;
  /**
   * Heritability on an entry-mean basis, σ²_g ÷ (σ²_g + v̄/2) with v̄ the mean variance of a
   * difference of BLUEs (Piepho & Möhring 2007): for unbalanced trials; on balanced ones it
   * equals the classical σ²_g ÷ (σ²_g + σ²_ge/s + σ²_e/(rs)).
   */
  heritability: number;
  logLik: number;
  boundary: boolean;
  summary: string;
}

/**
 * The same layout with varieties random, y ~ 1 + (1|variety) + the layout's random terms, for
 * a heritability figure and BLUPs (which shrink entries seen in few plots towards the mean).
 * `fixed` is the varieties-fixed fit of the same layout, for the variances of BLUE differences.
 */
export function varietiesRandomAnalysis(
  layout: MixedLayout,
  fixed: MixedVarietyAnalysis,
): VarietiesRandomAnalysis | string {
  const { y, entry, entries: k } = layout;
  const random = layoutRandomTerms(layout);
  if (typeof random === 'string') return random;
  if (k < 3) return 'varieties as random need at least 3 entries to estimate their variance';
  const fit = fitReml({
    y,
    fixedCells: new Int32Array(y.length),
    fixedLevels: 1,
    random: [{ source: 'variety', cells: entry, levels: k }, ...random],
  });
  const intercept = fit.beta[0]!;
  const blup = Float64Array.from(fit.blups[0]!);
  const predicted = blup.map((u) => intercept + u);
  let sum = 0;
  for (let i = 0; i < k; i++) for (let j = i + 1; j < k; j++) sum += fixed.pairSe(i, j) ** 2;
  const meanVarianceOfBlueDifferences = sum / ((k * (k - 1)) / 2);
  const varietyVariance = fit.varianceComponents[0]!.variance;
  const components = fit.varianceComponents.map((c) => ({
    source: c.source as VarianceSource | 'variety',
    variance: c.variance,
    se: c.se,
  }));
  return {
    varianceComponents: components,
    intercept,
    blup,
    predicted,
    meanVarianceOfBlueDifferences,
    heritability: varietyVariance / (varietyVariance + meanVarianceOfBlueDifferences / 2),
    logLik: fit.logLik,
    boundary: fit.boundary,
    summary: varianceSummary(components),
  };
}
