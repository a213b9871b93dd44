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

const SOURCE_WORDS: Record<VarianceSource, string> = {
  site: 'gardens (sites)',
  'site:block': 'blocks within gardens',
  block: 'blocks',
  'site:variety': 'varieties doing differently in different gardens',
  replicate: 'replicates',
  'replicate:block': 'blocks within replicates',
  residual: 'plot-to-plot (residual)',
};

export function mixedVarietyAnalysis(layout: MixedLayout): MixedVarietyAnalysis | string {
  const { y, entry, entries: k } = layout;
  const n = y.length;
  const random: RandomTerm[] = [];
  const sites = layout.site && layout.site.levels >= 2 ? layout.site : null;
  const kind = layout.sitesAre ?? 'site';
  if (sites) random.push({ source: kind, cells: sites.cells, levels: sites.levels });
  // A garden that is one block (a network where each garden grows some entries): the block
  // term would repeat the site term, so it is left out.
  const block = layout.block && !(sites && layout.block.levels === sites.levels) ? layout.block : null;
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
  const total = components.reduce((s, c) => s + c.variance, 0);
  const share = components
    .map((c) => ({ c, pct: total > 0 ? (100 * c.variance) / total : 0 }))
    .sort((a, b) => b.pct - a.pct)
    .map(
      ({ c, pct }) =>
        `${SOURCE_WORDS[c.source]} ${pct < 0.5 && pct > 0 ? '<1' : Math.round(pct)} %`,
    );
  const zero = components.filter((c) => c.variance === 0).map((c) => SOURCE_WORDS[c.source]);
  const summary =
    `Of the variation left once varieties are accounted for: ${share.join(', ')}.` +
    (zero.length > 0
      ? ` The data show no variation of their own for ${zero.join(' and ')} (estimated as zero).`
      : '');

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
