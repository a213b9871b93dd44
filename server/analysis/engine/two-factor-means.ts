/**
 * The means and simple effects of a two-factor model whose fixed effects are the treatment ×
 * variety cell means: every cell, each treatment and each variety (emmeans' defaults, equal
 * weights over the other factor's levels), and the differences of one factor within each level
 * of the other. `estimate` gives l'β̂ with its SE and df for weights l on the cells (cell
 * t × v + e). Pure: no I/O.
 */
import { studentTTwoSided } from './distributions.js';
import { addOffset } from './decimal-input.js';
import { separateMeans } from './mean-separation.js';
import { rankMeans } from '../../../common/ranking';
import type { SimpleEffect, TwoFactorAnalysis, TwoFactorInput } from './two-factor.js';

/**
 * The plots of a two-factor layout unpacked: level counts, each plot's block, treatment and
 * variety codes, its treatment × variety cell (t × v + e) and the plots in each cell. A cell
 * without plots has no mean, so it is refused here, naming the variety and treatment.
 */
export function treatmentVarietyCells(input: TwoFactorInput) {
  const { y } = input;
  const n = y.length;
  const r = input.block.levels.length;
  const a = input.treatment.levels.length;
  const v = input.variety.levels.length;
  const B = input.block.codes;
  const T = input.treatment.codes;
  const V = input.variety.codes;
  const cellOf = Int32Array.from({ length: n }, (_, i) => T[i]! * v + V[i]!);
  const counts = new Float64Array(a * v);
  for (let i = 0; i < n; i++) counts[cellOf[i]!]!++;
  const empty = [...counts.keys()].filter((c) => counts[c] === 0);
  if (empty.length > 0)
    throw new RangeError(
      `no plot left of ${empty
        .map((c) => `${input.variety.levels[c % v]} / ${input.treatment.levels[Math.floor(c / v)]}`)
        .join(', ')}: a cell without plots has no mean`,
    );
  return { y, n, r, a, v, B, T, V, cellOf, counts };
}

export type CellEstimate = (l: Float64Array) => { estimate: number; se: number; df: number };

export function cellModelMeans(
  input: Pick<TwoFactorInput, 'offset' | 'treatment' | 'variety'>,
  estimate: CellEstimate,
): Pick<
  TwoFactorAnalysis,
  | 'cellMeans'
  | 'treatmentMeans'
  | 'varietyMeans'
  | 'treatmentWithinVariety'
  | 'varietyWithinTreatment'
> & {
  /** Each variety's mean on the model's scale (no offset), with its SE and df. */
  varietyFits: { estimate: number; se: number; df: number }[];
  /** SE of the difference of two variety means. */
  varietyPairSe(i: number, j: number): number;
} {
  const { offset } = input;
  const a = input.treatment.levels.length;
  const v = input.variety.levels.length;
  const weights = (pick: (t: number, e: number) => number) => {
    const l = new Float64Array(a * v);
    for (let t = 0; t < a; t++) for (let e = 0; e < v; e++) l[t * v + e] = pick(t, e);
    return l;
  };
  const cellMeans = input.variety.levels.flatMap((variety, e) =>
    input.treatment.levels.map((treatment, t) => {
      const c = estimate(weights((tt, ee) => (tt === t && ee === e ? 1 : 0)));
      return { variety, treatment, mean: addOffset(offset, c.estimate), se: c.se, df: c.df };
    }),
  );
  const treatmentMeans = input.treatment.levels.map((treatment, t) => {
    const c = estimate(weights((tt) => (tt === t ? 1 / v : 0)));
    return { treatment, mean: addOffset(offset, c.estimate), se: c.se, df: c.df };
  });
  const varietyFits = input.variety.levels.map((_, e) =>
    estimate(weights((_t, ee) => (ee === e ? 1 / a : 0))),
  );
  const varietyMeans = input.variety.levels.map((variety, e) => ({
    variety,
    mean: addOffset(offset, varietyFits[e]!.estimate),
    se: varietyFits[e]!.se,
    df: varietyFits[e]!.df,
  }));

  const effect = (within: string, aName: string, bName: string, l: Float64Array): SimpleEffect => {
    const c = estimate(l);
    const t = c.estimate / c.se;
    return {
      within,
      a: aName,
      b: bName,
      difference: c.estimate,
      se: c.se,
      df: c.df,
      t,
      p: studentTTwoSided(t, c.df),
    };
  };
  /** Every pair of one factor's levels within each level of the other. */
  const pairsWithin = (
    within: string[],
    levels: string[],
    cell: (w: number, i: number) => [number, number],
  ) =>
    within.flatMap((name, w) => {
      const out: SimpleEffect[] = [];
      for (let i = 0; i < levels.length; i++)
        for (let j = i + 1; j < levels.length; j++) {
          const [ti, ei] = cell(w, i);
          const [tj, ej] = cell(w, j);
          const l = weights((t, e) => (t === ti && e === ei ? 1 : t === tj && e === ej ? -1 : 0));
          out.push(effect(name, levels[i]!, levels[j]!, l));
        }
      return out;
    });
  return {
    cellMeans,
    treatmentMeans,
    varietyMeans,
    varietyFits,
    treatmentWithinVariety: pairsWithin(input.variety.levels, input.treatment.levels, (e, t) => [
      t,
      e,
    ]),
    varietyWithinTreatment: pairsWithin(input.treatment.levels, input.variety.levels, (t, e) => [
      t,
      e,
    ]),
    varietyPairSe: (i, j) =>
      estimate(weights((_t, e) => (e === i ? 1 / a : e === j ? -1 / a : 0))).se,
  };
}

/**
 * The means part of a cell-means model's analysis: its cell, treatment and variety means and
 * simple effects, and the variety means ranked and lettered on their own pairwise SEs, with the
 * error variance and df the variety test used (least squares: the residual; REML: the residual
 * variance with the Wald test's denominator df).
 */
export function rankedVarietyMeans(
  input: Pick<TwoFactorInput, 'offset' | 'variety' | 'alpha' | 'letters' | 'direction'>,
  plotVariety: ArrayLike<number>,
  fits: ReturnType<typeof cellModelMeans>,
  error: { ms: number; df: number; varietyP: number | null },
) {
  const v = input.variety.levels.length;
  const plotsOf = new Array<number>(v).fill(0);
  for (let i = 0; i < plotVariety.length; i++) plotsOf[plotVariety[i]!]!++;
  const sep = separateMeans(
    input.variety.levels.map((name, e) => ({
      entry: name,
      mean: fits.varietyFits[e]!.estimate,
      n: plotsOf[e]!,
    })),
    error.ms,
    error.df,
    input.alpha,
    error.varietyP,
    { pairSe: fits.varietyPairSe },
  );
  const index = new Map(input.variety.levels.map((name, e) => [name, e]));
  const means = rankMeans(
    sep.ranked.map((s) => ({ s, mean: s.mean })),
    input.direction,
  ).map(({ s, rank }) => ({
    variety: s.entry,
    n: s.n,
    mean: addOffset(input.offset, s.mean),
    se: fits.varietyFits[index.get(s.entry)!]!.se,
    rank,
    group: input.letters === 'lsd' ? s.lsdGroup : s.hsdGroup,
    groupLsd: s.lsdGroup,
    groupHsd: s.hsdGroup,
  }));
  return {
    cellMeans: fits.cellMeans,
    treatmentMeans: fits.treatmentMeans,
    varietyMeans: fits.varietyMeans,
    treatmentWithinVariety: fits.treatmentWithinVariety,
    varietyWithinTreatment: fits.varietyWithinTreatment,
    means,
    lsd: sep.lsd,
    hsd: { ...sep.hsd, df: error.df },
  };
}
