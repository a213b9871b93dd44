/**
 * Two-factor trials: a treatment (fertilizer, irrigation, …) × variety, in complete blocks.
 *   - factorial in blocks:  y ~ block + treatment * variety, one error (residual);
 *   - split plot, the treatment on main plots within blocks: two strata, as
 *     aov(y ~ block + treatment * variety + Error(block/treatment)): the treatment is tested
 *     against block × treatment (the main-plot error, Ea), variety and variety × treatment
 *     against the residual (the sub-plot error, Eb).
 * Means and their standard errors are emmeans' for the same model with blocks fixed; in the
 * split plot a mean or difference that crosses main plots carries both errors,
 * (Ea + (v − 1) Eb) / (r v) per cell, on Satterthwaite's degrees of freedom (the textbook
 * split-plot standard errors; Gomez & Gomez 1984, Statistical Procedures for Agricultural
 * Research, ch. 3). Balanced layouts only: every block holds every treatment × variety plot once.
 * Pure: no I/O.
 */
import type { SeparationMethod } from './mean-separation.js';
import { separateMeans } from './mean-separation.js';
import { fUpperTail, studentTTwoSided } from './distributions.js';
import { rankMeans, type TraitDirection } from '../../../common/ranking';
import { addOffset } from './decimal-input.js';

export type TwoFactorSource =
  | 'block'
  | 'treatment'
  | 'block:treatment'
  | 'variety'
  | 'variety:treatment'
  | 'residual'
  | 'total';

export interface TwoFactorLine {
  source: TwoFactorSource;
  df: number;
  ss: number;
  ms: number | null;
  f: number | null;
  p: number | null;
  testedAgainst: TwoFactorSource | null;
}

export interface TwoFactorInput {
  /** Plot values as deviations from `offset` (exact decimal text), added back to every mean. */
  y: Float64Array;
  offset: string;
  block: { codes: Int32Array; levels: string[] };
  treatment: { codes: Int32Array; levels: string[] };
  variety: { codes: Int32Array; levels: string[] };
  splitPlot: boolean;
  alpha: number;
  letters: SeparationMethod;
  direction: TraitDirection;
}

export interface SimpleEffect {
  /** The level the comparison is made within (a variety, or a treatment). */
  within: string;
  a: string;
  b: string;
  difference: number;
  se: number;
  df: number;
  t: number;
  p: number;
}

export interface TwoFactorAnalysis {
  layout: 'factorial' | 'split-plot';
  anova: TwoFactorLine[];
  /** One per treatment × variety cell. */
  cellMeans: { variety: string; treatment: string; mean: number; se: number; df: number }[];
  treatmentMeans: { treatment: string; mean: number; se: number; df: number }[];
  varietyMeans: { variety: string; mean: number; se: number; df: number }[];
  /** Treatment differences within each variety (the grower's question). */
  treatmentWithinVariety: SimpleEffect[];
  /** Variety differences within each treatment. */
  varietyWithinTreatment: SimpleEffect[];
  /** Variety means ranked in the trait's direction, with letters on the variety error. */
  means: {
    variety: string;
    n: number;
    mean: number;
    se: number;
    rank: number | null;
    group: string;
    groupLsd: string;
    groupHsd: string;
  }[];
  lsd: { value: number | null; df: number; t: number; protected: boolean };
  hsd: { value: number | null; q: number; df: number };
  /** The error variety comparisons are made against. */
  errorTerm: { source: 'residual'; df: number; ms: number };
}

/** Satterthwaite's df for a Σ cᵢ MSᵢ combination of mean squares (Satterthwaite 1946). */
function satterthwaite(parts: { c: number; ms: number; df: number }[]): number {
  const num = parts.reduce((s, p) => s + p.c * p.ms, 0) ** 2;
  const den = parts.reduce((s, p) => s + (p.c * p.ms) ** 2 / p.df, 0);
  return num / den;
}

type TwoFactorLayout = Omit<
  TwoFactorInput,
  'alpha' | 'letters' | 'direction' | 'splitPlot' | 'offset'
>;

/** The block × treatment × variety cells with no plot (named), and how many hold more than one. */
export function blockTreatmentVarietyCells(input: TwoFactorLayout): {
  missing: string[];
  repeated: number;
} {
  const r = input.block.levels.length;
  const a = input.treatment.levels.length;
  const v = input.variety.levels.length;
  const seen = new Uint32Array(r * a * v);
  for (let i = 0; i < input.y.length; i++)
    seen[(input.block.codes[i]! * a + input.treatment.codes[i]!) * v + input.variety.codes[i]!]! +=
      1;
  const missing: string[] = [];
  let repeated = 0;
  for (let b = 0; b < r; b++)
    for (let t = 0; t < a; t++)
      for (let e = 0; e < v; e++) {
        const n = seen[(b * a + t) * v + e]!;
        if (n === 0)
          missing.push(
            `${input.block.levels[b]} / ${input.treatment.levels[t]} / ${input.variety.levels[e]}`,
          );
        if (n > 1) repeated++;
      }
  return { missing, repeated };
}

export function balancedTwoFactorProblem(
  input: TwoFactorLayout,
  /** The treatment under the trial's (or the column's) own name, as the lead sees it. */
  factor: string,
  /** blockTreatmentVarietyCells(input), which the caller also counts the missing plots from. */
  cells: ReturnType<typeof blockTreatmentVarietyCells>,
): string | null {
  const r = input.block.levels.length;
  const a = input.treatment.levels.length;
  const v = input.variety.levels.length;
  if (a < 2) return `${factor} has only one level ("${input.treatment.levels[0]}")`;
  if (v < 2) return `only one variety ("${input.variety.levels[0]}")`;
  if (r < 2) return 'a two-factor trial needs at least two blocks';
  const { missing, repeated } = cells;
  if (missing.length > 0)
    return `missing plots (block / ${factor} / variety: ${missing.slice(0, 5).join('; ')}${missing.length > 5 ? '; …' : ''}): the classical two-factor analysis needs every plot`;
  if (repeated > 0) return `${repeated} block × ${factor} × variety cells hold more than one plot`;
  return null;
}

export function analyseTwoFactor(input: TwoFactorInput): TwoFactorAnalysis {
  const { y, offset, splitPlot } = input;
  const r = input.block.levels.length;
  const a = input.treatment.levels.length;
  const v = input.variety.levels.length;
  const n = y.length;
  const B = input.block.codes;
  const T = input.treatment.codes;
  const V = input.variety.codes;

  // Means of the margins and cells (balanced: every mean is a plain average).
  const grand = y.reduce((s, x) => s + x, 0) / n;
  const mb = new Float64Array(r);
  const mt = new Float64Array(a);
  const mv = new Float64Array(v);
  const mtv = new Float64Array(a * v);
  const mbt = new Float64Array(r * a);
  for (let i = 0; i < n; i++) {
    mb[B[i]!]! += y[i]! / (a * v);
    mt[T[i]!]! += y[i]! / (r * v);
    mv[V[i]!]! += y[i]! / (r * a);
    mtv[T[i]! * v + V[i]!]! += y[i]! / r;
    mbt[B[i]! * a + T[i]!]! += y[i]! / v;
  }
  const sq = (x: number) => x * x;
  let ssTotal = 0;
  for (let i = 0; i < n; i++) ssTotal += sq(y[i]! - grand);
  let ssB = 0;
  for (let b = 0; b < r; b++) ssB += a * v * sq(mb[b]! - grand);
  let ssT = 0;
  for (let t = 0; t < a; t++) ssT += r * v * sq(mt[t]! - grand);
  let ssV = 0;
  for (let e = 0; e < v; e++) ssV += r * a * sq(mv[e]! - grand);
  let ssTV = 0;
  for (let t = 0; t < a; t++)
    for (let e = 0; e < v; e++) ssTV += r * sq(mtv[t * v + e]! - mt[t]! - mv[e]! + grand);
  let ssBT = 0;
  for (let b = 0; b < r; b++)
    for (let t = 0; t < a; t++) ssBT += v * sq(mbt[b * a + t]! - mb[b]! - mt[t]! + grand);

  const line = (
    source: TwoFactorSource,
    df: number,
    ss: number,
    against: { source: TwoFactorSource; df: number; ms: number } | null,
  ): TwoFactorLine => {
    const ms = ss / df;
    const f = against ? ms / against.ms : null;
    return {
      source,
      df,
      ss,
      ms,
      f,
      p: f === null || !against ? null : fUpperTail(f, df, against.df),
      testedAgainst: against ? against.source : null,
    };
  };

  const dfB = r - 1;
  const dfT = a - 1;
  const dfV = v - 1;
  const dfTV = (a - 1) * (v - 1);
  let anova: TwoFactorLine[];
  let eb: { source: 'residual'; df: number; ms: number };
  let ea: { source: TwoFactorSource; df: number; ms: number };
  if (splitPlot) {
    const dfBT = (r - 1) * (a - 1);
    const dfRes = a * (r - 1) * (v - 1);
    const ssRes = Math.max(ssTotal - ssB - ssT - ssBT - ssV - ssTV, 0);
    ea = { source: 'block:treatment', df: dfBT, ms: ssBT / dfBT };
    eb = { source: 'residual', df: dfRes, ms: ssRes / dfRes };
    anova = [
      // The block stratum holds blocks alone: nothing to test them against.
      line('block', dfB, ssB, null),
      line('treatment', dfT, ssT, ea),
      line('block:treatment', dfBT, ssBT, null),
      line('variety', dfV, ssV, eb),
      line('variety:treatment', dfTV, ssTV, eb),
      line('residual', dfRes, ssRes, null),
    ];
  } else {
    const dfRes = (r - 1) * (a * v - 1);
    const ssRes = Math.max(ssTotal - ssB - ssT - ssV - ssTV, 0);
    eb = { source: 'residual', df: dfRes, ms: ssRes / dfRes };
    ea = eb;
    anova = [
      line('block', dfB, ssB, eb),
      line('treatment', dfT, ssT, eb),
      line('variety', dfV, ssV, eb),
      line('variety:treatment', dfTV, ssTV, eb),
      line('residual', dfRes, ssRes, null),
    ];
  }
  anova.push({
    source: 'total',
    df: n - 1,
    ss: ssTotal,
    ms: null,
    f: null,
    p: null,
    testedAgainst: null,
  });

  // Variance of one cell mean, and its df: across main plots in a split plot both errors count.
  const cellVar = splitPlot ? (ea.ms + (v - 1) * eb.ms) / (r * v) : eb.ms / r;
  const crossDf = splitPlot
    ? satterthwaite([
        { c: 1, ms: ea.ms, df: ea.df },
        { c: v - 1, ms: eb.ms, df: eb.df },
      ])
    : eb.df;
  const cellMeans = input.variety.levels.flatMap((variety, e) =>
    input.treatment.levels.map((treatment, t) => ({
      variety,
      treatment,
      mean: addOffset(offset, mtv[t * v + e]!),
      se: Math.sqrt(cellVar),
      df: crossDf,
    })),
  );
  const treatmentMeans = input.treatment.levels.map((treatment, t) => ({
    treatment,
    mean: addOffset(offset, mt[t]!),
    se: Math.sqrt(ea.ms / (r * v)),
    df: ea.df,
  }));
  const varietyMeans = input.variety.levels.map((variety, e) => ({
    variety,
    mean: addOffset(offset, mv[e]!),
    se: Math.sqrt(cellVar / a),
    df: crossDf,
  }));

  /** Every pair of `levels` within each level of `within`; `cell(w, i)` is their cell mean. */
  const pairsWithin = (
    within: string[],
    levels: string[],
    cell: (w: number, i: number) => number,
    se: number,
    df: number,
  ): SimpleEffect[] =>
    within.flatMap((name, w) => {
      const pairs: SimpleEffect[] = [];
      for (let i = 0; i < levels.length; i++)
        for (let j = i + 1; j < levels.length; j++) {
          const difference = cell(w, i) - cell(w, j);
          const t = difference / se;
          pairs.push({
            within: name,
            a: levels[i]!,
            b: levels[j]!,
            difference,
            se,
            df,
            t,
            p: studentTTwoSided(t, df),
          });
        }
      return pairs;
    });
  const treatmentWithinVariety = pairsWithin(
    input.variety.levels,
    input.treatment.levels,
    (e, t) => mtv[t * v + e]!,
    Math.sqrt(2 * cellVar),
    crossDf,
  );
  const varietyWithinTreatment = pairsWithin(
    input.treatment.levels,
    input.variety.levels,
    (t, e) => mtv[t * v + e]!,
    Math.sqrt((2 * eb.ms) / r),
    eb.df,
  );

  // Variety main effects: differences lie within main plots, so on the sub-plot error alone.
  const varietyLine = anova.find((l) => l.source === 'variety')!;
  const sep = separateMeans(
    input.variety.levels.map((name, e) => ({ entry: name, mean: mv[e]!, n: r * a })),
    eb.ms,
    eb.df,
    input.alpha,
    varietyLine.p,
  );
  const ranked = rankMeans(
    sep.ranked.map((s) => ({ s, mean: s.mean })),
    input.direction,
  );
  const means = ranked.map(({ s, rank }) => ({
    variety: s.entry,
    n: s.n,
    mean: addOffset(offset, s.mean),
    se: Math.sqrt(cellVar / a),
    rank,
    group: input.letters === 'lsd' ? s.lsdGroup : s.hsdGroup,
    groupLsd: s.lsdGroup,
    groupHsd: s.hsdGroup,
  }));

  return {
    layout: splitPlot ? 'split-plot' : 'factorial',
    anova,
    cellMeans,
    treatmentMeans,
    varietyMeans,
    treatmentWithinVariety,
    varietyWithinTreatment,
    means,
    lsd: sep.lsd,
    hsd: { ...sep.hsd, df: eb.df },
    errorTerm: eb,
  };
}
