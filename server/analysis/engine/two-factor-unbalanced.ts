/**
 * A factorial in complete blocks that lost plots: y ~ block + treatment * variety by least
 * squares. Sequential (type I) sums of squares in the order block, treatment, variety,
 * treatment:variety (as R's anova(lm(...)) gives them), every line tested against the residual;
 * cell means are the model's predictions averaged over blocks with equal weights (emmeans'
 * default), treatment and variety means the equal-weight averages of the cells, each with its
 * standard error from MS·L(X'X)⁻¹L'. Every treatment × variety cell needs at least one plot.
 * Pure: no I/O.
 */
import { invertSpd } from './adjusted-means.js';
import { sequentialSumsOfSquares } from './linear-model.js';
import { fUpperTail } from './distributions.js';
import { cellModelMeans, rankedVarietyMeans, treatmentVarietyCells } from './two-factor-means.js';
import type {
  TwoFactorAnalysis,
  TwoFactorInput,
  TwoFactorLine,
  TwoFactorSource,
} from './two-factor.js';

export function analyseUnbalancedFactorial(input: TwoFactorInput): TwoFactorAnalysis {
  const { y, n, r, a, v, B, T, V, cellOf } = treatmentVarietyCells(input);

  const fit = sequentialSumsOfSquares(y, [
    { name: 'block', cells: B, levels: r },
    { name: 'treatment', cells: T, levels: a },
    { name: 'variety', cells: V, levels: v },
    { name: 'variety:treatment', cells: cellOf, levels: a * v },
  ]);
  const res = {
    source: 'residual' as const,
    df: fit.residualDf,
    ms: fit.residualSs / fit.residualDf,
  };
  if (!(res.df > 0)) throw new RangeError('no residual degrees of freedom left');
  const line = (source: TwoFactorSource, df: number, ss: number): TwoFactorLine => {
    const ms = ss / df;
    const f = ms / res.ms;
    return { source, df, ss, ms, f, p: fUpperTail(f, df, res.df), testedAgainst: 'residual' };
  };
  const anova: TwoFactorLine[] = [
    ...fit.terms.map((t) => line(t.name as TwoFactorSource, t.df, t.ss)),
    {
      source: 'residual',
      df: res.df,
      ss: fit.residualSs,
      ms: res.ms,
      f: null,
      p: null,
      testedAgainst: null,
    },
    {
      source: 'total',
      df: n - 1,
      ss: fit.totalSs,
      ms: null,
      f: null,
      p: null,
      testedAgainst: null,
    },
  ];

  // Parameters: one mean per cell, then blocks 1 … r−1 coded as deviations from the last, so
  // the average over blocks of the block effects is zero and a cell's parameter is its mean.
  const p = a * v + r - 1;
  const xtx = new Float64Array(p * p);
  const xty = new Float64Array(p);
  const row = new Float64Array(p);
  for (let i = 0; i < n; i++) {
    row.fill(0);
    row[cellOf[i]!] = 1;
    const b = B[i]!;
    if (b < r - 1) row[a * v + b] = 1;
    else for (let k = 0; k < r - 1; k++) row[a * v + k] = -1;
    for (let j = 0; j < p; j++) {
      if (row[j] === 0) continue;
      xty[j]! += row[j]! * y[i]!;
      for (let k = 0; k < p; k++) xtx[j * p + k]! += row[j]! * row[k]!;
    }
  }
  const inv = invertSpd(xtx, p);
  const beta = new Float64Array(p);
  for (let j = 0; j < p; j++) for (let k = 0; k < p; k++) beta[j]! += inv[j * p + k]! * xty[k]!;
  /** l'β with its SE on the residual df, l given on the cells only. */
  const combine = (l: Float64Array) => {
    let est = 0;
    let q = 0;
    for (let j = 0; j < a * v; j++) {
      if (l[j] === 0) continue;
      est += l[j]! * beta[j]!;
      for (let k = 0; k < a * v; k++) q += l[j]! * inv[j * p + k]! * l[k]!;
    }
    return { estimate: est, se: Math.sqrt(res.ms * q), df: res.df };
  };
  const fits = cellModelMeans(input, combine);

  const varietyLine = anova.find((l) => l.source === 'variety')!;
  const means = rankedVarietyMeans(input, V, fits, {
    ms: res.ms,
    df: res.df,
    varietyP: varietyLine.p,
  });
  return {
    layout: 'factorial',
    anova,
    ...means,
    errorTerm: res,
  };
}
