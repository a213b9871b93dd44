/**
 * Analysis of variance for the three trial layouts:
 *  - crd: completely randomised, variety only (unequal replication allowed);
 *  - rcbd: randomised complete blocks, block then variety;
 *  - multisite: blocks at several sites — site, block within site, variety, site × variety.
 *    Variety is tested against site × variety (the varieties' interaction with sites is the
 *    error for a claim across sites) and site against block within site.
 *
 * Sums of squares are sequential (type I) in the order site, block, variety, site × variety.
 * When every block holds every variety equally often, the terms are orthogonal and the sums
 * of squares come from group means directly; otherwise a least-squares fit gives the
 * sequential reductions (blocks absorbed, then small variety systems; QR for crd), so missing
 * plots cost only their own degrees of freedom, not whole blocks.
 */
import { absorbedBlockSs } from './block-absorption.js';
import { fUpperTail } from './distributions.js';
import { accurateMean, sequentialSumsOfSquares, type ModelTerm } from './linear-model.js';

export type Design = 'crd' | 'rcbd' | 'multisite';
export type AnovaSource = 'site' | 'block' | 'variety' | 'site:variety' | 'residual' | 'total';

export interface AnovaLine {
  source: AnovaSource;
  df: number;
  ss: number;
  ms: number | null;
  f: number | null;
  p: number | null;
  testedAgainst: AnovaSource | null;
}

/**
 * Plot layout with factors coded 0 … levels − 1. Block codes are global (a block at one
 * site is a different block from the block with the same label at another site).
 */
export interface PlotLayout {
  /** One value per plot (may be deviations from an offset: sums of squares do not change). */
  y: Float64Array;
  entry: Int32Array;
  entries: number;
  block?: Int32Array;
  blocks?: number;
  site?: Int32Array;
  sites?: number;
}

export type AnovaMethod = 'auto' | 'means' | 'least-squares';

export interface AnovaResult {
  design: Design;
  lines: AnovaLine[];
  /** Which computation produced the sums of squares. */
  method: 'means' | 'least-squares';
  /** The error term for variety comparisons (residual, or site:variety for multisite). */
  error: { source: AnovaSource; df: number; ms: number };
  residual: { df: number; ss: number; ms: number };
}

/** True when every block holds every variety equally often (so blocks and varieties are orthogonal). */
function equalBlockReplication(layout: PlotLayout): boolean {
  const { block, blocks, entry, entries } = layout;
  if (!block || !blocks) return true;
  const counts = new Int32Array(blocks * entries);
  for (let i = 0; i < entry.length; i++) counts[block[i]! * entries + entry[i]!]! += 1;
  const c = counts[0]!;
  if (c === 0) return false;
  for (let j = 1; j < counts.length; j++) if (counts[j] !== c) return false;
  return true;
}

/** Group means with one correction pass each, plus group sizes. */
export function groupMeans(y: Float64Array, codes: Int32Array, levels: number) {
  const sum = new Float64Array(levels);
  const n = new Float64Array(levels);
  for (let i = 0; i < y.length; i++) {
    sum[codes[i]!]! += y[i]!;
    n[codes[i]!]! += 1;
  }
  const mean = new Float64Array(levels);
  for (let g = 0; g < levels; g++) mean[g] = n[g]! > 0 ? sum[g]! / n[g]! : 0;
  const corr = new Float64Array(levels);
  for (let i = 0; i < y.length; i++) corr[codes[i]!]! += y[i]! - mean[codes[i]!]!;
  for (let g = 0; g < levels; g++) if (n[g]! > 0) mean[g] = mean[g]! + corr[g]! / n[g]!;
  return { mean, n };
}

export interface RawSs {
  terms: { source: AnovaSource; df: number; ss: number }[];
  residualDf: number;
  residualSs: number;
  totalSs: number;
}

/** Orthogonal layout: sums of squares from group means (successive projections). */
function meansSs(design: Design, L: PlotLayout): RawSs {
  const { y, entry, entries } = L;
  const n = y.length;
  const gm = accurateMean(y);
  let totalSs = 0;
  for (let i = 0; i < n; i++) totalSs += (y[i]! - gm) ** 2;
  const v = groupMeans(y, entry, entries);
  let ssV = 0;
  let kPresent = 0;
  for (let g = 0; g < entries; g++) {
    if (v.n[g]! > 0) kPresent++;
    ssV += v.n[g]! * (v.mean[g]! - gm) ** 2;
  }
  if (design === 'crd') {
    let res = 0;
    for (let i = 0; i < n; i++) res += (y[i]! - v.mean[entry[i]!]!) ** 2;
    return {
      terms: [{ source: 'variety', df: kPresent - 1, ss: ssV }],
      residualDf: n - kPresent,
      residualSs: res,
      totalSs,
    };
  }
  const block = L.block!;
  const nb = L.blocks!;
  const b = groupMeans(y, block, nb);
  if (design === 'rcbd') {
    let ssB = 0;
    for (let g = 0; g < nb; g++) ssB += b.n[g]! * (b.mean[g]! - gm) ** 2;
    let res = 0;
    for (let i = 0; i < n; i++) res += (y[i]! - b.mean[block[i]!]! - v.mean[entry[i]!]! + gm) ** 2;
    return {
      terms: [
        { source: 'block', df: nb - 1, ss: ssB },
        { source: 'variety', df: entries - 1, ss: ssV },
      ],
      residualDf: n - nb - entries + 1,
      residualSs: res,
      totalSs,
    };
  }
  const site = L.site!;
  const ns = L.sites!;
  const s = groupMeans(y, site, ns);
  const siteOfBlock = new Int32Array(nb);
  for (let i = 0; i < n; i++) siteOfBlock[block[i]!] = site[i]!;
  const cellCode = new Int32Array(n);
  for (let i = 0; i < n; i++) cellCode[i] = site[i]! * entries + entry[i]!;
  const sv = groupMeans(y, cellCode, ns * entries);
  let ssS = 0;
  for (let g = 0; g < ns; g++) ssS += s.n[g]! * (s.mean[g]! - gm) ** 2;
  let ssB = 0;
  for (let g = 0; g < nb; g++) ssB += b.n[g]! * (b.mean[g]! - s.mean[siteOfBlock[g]!]!) ** 2;
  let ssSV = 0;
  for (let si = 0; si < ns; si++) {
    for (let e = 0; e < entries; e++) {
      const c = si * entries + e;
      ssSV += sv.n[c]! * (sv.mean[c]! - s.mean[si]! - v.mean[e]! + gm) ** 2;
    }
  }
  let res = 0;
  for (let i = 0; i < n; i++) {
    res += (y[i]! - b.mean[block[i]!]! - sv.mean[cellCode[i]!]! + s.mean[site[i]!]!) ** 2;
  }
  return {
    terms: [
      { source: 'site', df: ns - 1, ss: ssS },
      { source: 'block', df: nb - ns, ss: ssB },
      { source: 'variety', df: entries - 1, ss: ssV },
      { source: 'site:variety', df: (ns - 1) * (entries - 1), ss: ssSV },
    ],
    residualDf: n - nb - (entries - 1) * ns,
    residualSs: res,
    totalSs,
  };
}

/**
 * Non-orthogonal layout. Blocked designs absorb blocks and solve small variety systems
 * (block-absorption.ts); the completely randomised design, and `qrSequentialSs` for checks,
 * use the general QR fit.
 */
function leastSquaresSs(design: Design, L: PlotLayout): RawSs {
  if (design === 'crd') return qrSequentialSs(design, L);
  const a = absorbedBlockSs(L.y, L.block!, L.blocks!, L.entry, L.entries, L.site, L.sites);
  const terms: RawSs['terms'] = [];
  if (a.site) terms.push({ source: 'site', ...a.site });
  terms.push({ source: 'block', ...a.block }, { source: 'variety', ...a.variety });
  if (a.siteVariety) terms.push({ source: 'site:variety', ...a.siteVariety });
  return { terms, residualDf: a.residualDf, residualSs: a.residualSs, totalSs: a.totalSs };
}

/** General layout: sequential least squares by Householder QR over every plot. */
export function qrSequentialSs(design: Design, L: PlotLayout): RawSs {
  const terms: (ModelTerm & { name: AnovaSource })[] = [];
  const n = L.y.length;
  if (design === 'multisite') {
    terms.push({ name: 'site', cells: L.site!, levels: L.sites! });
  }
  if (design !== 'crd') terms.push({ name: 'block', cells: L.block!, levels: L.blocks! });
  terms.push({ name: 'variety', cells: L.entry, levels: L.entries });
  if (design === 'multisite') {
    const cells = new Int32Array(n);
    for (let i = 0; i < n; i++) cells[i] = L.site![i]! * L.entries + L.entry[i]!;
    terms.push({ name: 'site:variety', cells, levels: L.sites! * L.entries });
  }
  const fit = sequentialSumsOfSquares(L.y, terms);
  return {
    terms: fit.terms.map((t, i) => ({ source: terms[i]!.name, df: t.df, ss: t.ss })),
    residualDf: fit.residualDf,
    residualSs: fit.residualSs,
    totalSs: fit.totalSs,
  };
}

/** True when the layout's terms are orthogonal, so group means give the sequential SS. */
export function isOrthogonal(design: Design, layout: PlotLayout): boolean {
  return design === 'crd' || equalBlockReplication(layout);
}

function testedAgainstFor(design: Design, source: AnovaSource): AnovaSource | null {
  if (source === 'residual' || source === 'total') return null;
  if (design === 'multisite') {
    if (source === 'site') return 'block';
    if (source === 'variety') return 'site:variety';
  }
  return 'residual';
}

/** Run the analysis of variance for a layout. */
export function analyseVariance(
  design: Design,
  layout: PlotLayout,
  method: AnovaMethod = 'auto',
): AnovaResult {
  if (design !== 'crd' && (!layout.block || !layout.blocks)) {
    throw new Error(`${design} needs a block for every plot`);
  }
  if (design === 'multisite' && (!layout.site || !layout.sites)) {
    throw new Error('multisite needs a site for every plot');
  }
  const useMeans = method === 'means' || (method === 'auto' && isOrthogonal(design, layout));
  const raw = useMeans ? meansSs(design, layout) : leastSquaresSs(design, layout);

  const resMs = raw.residualDf > 0 ? raw.residualSs / raw.residualDf : NaN;
  const msOf = new Map<AnovaSource, { df: number; ms: number }>();
  msOf.set('residual', { df: raw.residualDf, ms: resMs });
  for (const t of raw.terms) msOf.set(t.source, { df: t.df, ms: t.df > 0 ? t.ss / t.df : NaN });

  const lines: AnovaLine[] = raw.terms.map((t) => {
    const against = testedAgainstFor(design, t.source);
    const ms = t.df > 0 ? t.ss / t.df : null;
    let f: number | null = null;
    let p: number | null = null;
    const err = against ? msOf.get(against) : undefined;
    if (ms !== null && err && err.df > 0 && err.ms > 0 && Number.isFinite(err.ms)) {
      f = ms / err.ms;
      p = fUpperTail(f, t.df, err.df);
    }
    return { source: t.source, df: t.df, ss: t.ss, ms, f, p, testedAgainst: against };
  });
  lines.push({
    source: 'residual',
    df: raw.residualDf,
    ss: raw.residualSs,
    ms: Number.isFinite(resMs) ? resMs : null,
    f: null,
    p: null,
    testedAgainst: null,
  });
  lines.push({
    source: 'total',
    df: layout.y.length - 1,
    ss: raw.totalSs,
    ms: null,
    f: null,
    p: null,
    testedAgainst: null,
  });
  const errorSource: AnovaSource = design === 'multisite' ? 'site:variety' : 'residual';
  const e = msOf.get(errorSource)!;
  return {
    design,
    lines,
    method: useMeans ? 'means' : 'least-squares',
    error: { source: errorSource, df: e.df, ms: e.ms },
    residual: { df: raw.residualDf, ss: raw.residualSs, ms: resMs },
  };
}
