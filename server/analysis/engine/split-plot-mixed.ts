/**
 * A split plot (treatment on main plots within blocks, varieties on sub-plots) as a mixed model,
 *   y ~ treatment * variety + (1|block) + (1|block:treatment),
 * fitted by REML: blocks and main plots (block × treatment, the main-plot error) random. Unlike
 * the classical strata, it stays valid when plots are missing.
 *   - Fixed effects are the treatment × variety cell means (BLUEs); cell, treatment and variety
 *     means are emmeans' defaults (equal weights over the other factor's levels), each with its
 *     SE and Satterthwaite df; simple effects likewise.
 *   - Wald F tests for treatment, variety and variety × treatment are sequential (type I, in
 *     that order, as lmerTest's anova(type = 1)) with Satterthwaite's denominator df. On a
 *     balanced layout with positive variance components they equal the classical strata's tests.
 * Every treatment × variety cell needs at least one plot. Pure: no I/O.
 */
import { fitReml, sequentialContrasts, type MixedFit } from './mixed-model.js';
import { cellModelMeans, rankedVarietyMeans, treatmentVarietyCells } from './two-factor-means.js';
import type { TwoFactorAnalysis, TwoFactorInput } from './two-factor.js';

export type SplitPlotVarianceSource = 'block' | 'block:treatment' | 'residual';
export type SplitPlotFixedSource = 'treatment' | 'variety' | 'variety:treatment';

export interface SplitPlotFixedTest {
  source: SplitPlotFixedSource;
  numDf: number;
  denDf: number;
  f: number;
  p: number;
  method: 'satterthwaite';
}

export interface SplitPlotMixedAnalysis extends TwoFactorAnalysis {
  varianceComponents: { source: SplitPlotVarianceSource; variance: number; se: number | null }[];
  fixedTests: SplitPlotFixedTest[];
  /** REML log-likelihood. */
  logLik: number;
  /** A variance component was estimated as zero and kept there. */
  boundary: boolean;
}

/**
 * The rows of each sequential hypothesis on the cell means. The treatment-coded model's
 * parameters (intercept, treatment 2…a, variety 2…v, their products with the treatment
 * varying fastest, as R's model.matrix orders them) are mapped to cell means m(t, e) by
 * μ = m(1,1), τ_t = m(t,1) − m(1,1), ν_e = m(1,e) − m(1,1), (τν)_te = m(t,e) − m(t,1) − m(1,e) + m(1,1).
 * (The F does not depend on the basis; Satterthwaite's df for a multi-df test does.)
 */
function sequentialCellContrasts(
  counts: ArrayLike<number>,
  a: number,
  v: number,
): Record<SplitPlotFixedSource, Float64Array[]> {
  const p = a * v;
  const tCol = (t: number) => t; // t = 1 … a−1
  const vCol = (e: number) => a - 1 + e; // e = 1 … v−1
  const iCol = (t: number, e: number) => a + v - 1 + (e - 1) * (a - 1) + (t - 1);
  const codedRow = (t: number, e: number) => {
    const cols = [0];
    if (t > 0) cols.push(tCol(t));
    if (e > 0) cols.push(vCol(e));
    if (t > 0 && e > 0) cols.push(iCol(t, e));
    return cols;
  };
  const xtx = new Float64Array(p * p);
  for (let t = 0; t < a; t++)
    for (let e = 0; e < v; e++) {
      const n = counts[t * v + e]!;
      const cols = codedRow(t, e);
      for (const i of cols) for (const j of cols) xtx[i * p + j]! += n;
    }
  // γ = G m, so l'γ = (G'l)'m.
  const toCells = (l: Float64Array) => {
    const w = new Float64Array(p);
    const add = (t: number, e: number, c: number) => (w[t * v + e]! += c);
    add(0, 0, l[0]!);
    for (let t = 1; t < a; t++) {
      add(t, 0, l[tCol(t)]!);
      add(0, 0, -l[tCol(t)]!);
    }
    for (let e = 1; e < v; e++) {
      add(0, e, l[vCol(e)]!);
      add(0, 0, -l[vCol(e)]!);
    }
    for (let t = 1; t < a; t++)
      for (let e = 1; e < v; e++) {
        const c = l[iCol(t, e)]!;
        add(t, e, c);
        add(t, 0, -c);
        add(0, e, -c);
        add(0, 0, c);
      }
    return w;
  };
  const rows = (from: number, to: number) => sequentialContrasts(xtx, p, from, to).map(toCells);
  return {
    treatment: rows(1, a),
    variety: rows(a, a + v - 1),
    'variety:treatment': rows(a + v - 1, p),
  };
}

export function analyseSplitPlotMixed(input: TwoFactorInput): SplitPlotMixedAnalysis {
  const { y, n, r, a, v, B, T, V, cellOf, counts } = treatmentVarietyCells(input);
  const p = a * v;
  if (r < 2) throw new RangeError('the split plot needs at least two blocks');
  // Main plots present in the data (block × treatment), coded in order of appearance.
  const mainPlot = new Int32Array(n);
  const seen = new Map<number, number>();
  for (let i = 0; i < n; i++) {
    const key = B[i]! * a + T[i]!;
    let c = seen.get(key);
    if (c === undefined) seen.set(key, (c = seen.size));
    mainPlot[i] = c;
  }
  if (n - p - seen.size + r <= 0)
    throw new RangeError('too few plots left to estimate the sub-plot (residual) variance');

  const fit: MixedFit = fitReml({
    y,
    fixedCells: cellOf,
    fixedLevels: p,
    random: [
      { source: 'block', cells: B, levels: r },
      { source: 'block:treatment', cells: mainPlot, levels: seen.size },
    ],
  });
  const hypotheses = sequentialCellContrasts(counts, a, v);
  const fixedTests = (['treatment', 'variety', 'variety:treatment'] as const).map((source) => ({
    source,
    ...fit.waldF(hypotheses[source]),
    method: 'satterthwaite' as const,
  }));

  const fits = cellModelMeans(input, (l) => fit.contrast(l));

  // Variety means ranked and lettered on their own pairwise SEs, with the variety test's
  // denominator df (as the one-factor mixed model does).
  const varietyTest = fixedTests[1]!;
  const residual = fit.varianceComponents.at(-1)!.variance;
  const means = rankedVarietyMeans(input, V, fits, {
    ms: residual,
    df: varietyTest.denDf,
    varietyP: varietyTest.p,
  });

  return {
    layout: 'split-plot',
    // The classical strata do not apply; the model's tests are in `fixedTests`.
    anova: [],
    ...means,
    errorTerm: { source: 'residual', df: varietyTest.denDf, ms: residual },
    varianceComponents: fit.varianceComponents.map((c) => ({
      source: c.source as SplitPlotVarianceSource,
      variance: c.variance,
      se: c.se,
    })),
    fixedTests,
    logLik: fit.logLik,
    boundary: fit.boundary,
  };
}
