/**
 * Adjusted (least-squares) means of the entries: the fitted model's predictions averaged over
 * blocks with equal weights (over sites with equal weights, then over the blocks within each
 * site), as the usual least-squares-means definition does, with standard errors of the means
 * and of every difference.
 *
 * Model: blocks (nested in sites, so sites are absorbed) + entries, additively. Parameters:
 * one effect per block and one per entry except the first (full rank for a connected layout),
 * solved from the normal equations by Cholesky. Var(estimate) = error MS × L (X'X)⁻¹ L'.
 * The error mean square is the analysis's error term: the residual of this model for crd and
 * rcbd, the site × variety mean square for several sites (the classical test's error).
 *
 * When every block holds every entry equally often, the adjusted means are the arithmetic
 * means and SE = √(MS/n) exactly, so they are returned in that closed form.
 */
import { groupMeans } from './anova.js';
import { invertSpd as invertSpdOrNull } from '../../../common/cholesky';

export interface AdjustedMeansInput {
  /** Plot values (deviations from an offset are fine: differences and SEs do not change). */
  y: Float64Array;
  entry: Int32Array;
  entries: number;
  /** Global block codes (omit for a completely randomized layout). */
  block?: Int32Array;
  blocks?: number;
  /** Site of each block code (for the equal weighting over sites). */
  siteOfBlock?: Int32Array;
  errorMs: number;
  /** True when blocks and entries are orthogonal (closed form). */
  orthogonal: boolean;
}

export interface AdjustedMeans {
  /** Per entry code. */
  mean: Float64Array;
  se: Float64Array;
  /** Standard error of the difference between entries i and j. */
  pairSe(i: number, j: number): number;
}

/** A layout whose blocks and entries are not connected has no adjusted means. */
export class NotConnectedError extends Error {}

/** Inverse of a symmetric positive definite matrix (row-major, p × p) by Cholesky. */
export function invertSpd(a: Float64Array, p: number): Float64Array {
  const inv = invertSpdOrNull(a, p);
  if (!inv) throw new NotConnectedError();
  return inv;
}

export function adjustedMeans(input: AdjustedMeansInput): AdjustedMeans {
  const { y, entry, entries: k, errorMs } = input;
  const ms = Math.max(errorMs, 0);
  const arith = groupMeans(y, entry, k);
  if (input.orthogonal || !input.block || !input.blocks) {
    const se = arith.n.map((n) => Math.sqrt(ms / n));
    return {
      mean: arith.mean,
      se,
      pairSe: (i, j) => Math.sqrt(ms * (1 / arith.n[i]! + 1 / arith.n[j]!)),
    };
  }

  const block = input.block;
  const nb = input.blocks;
  const p = nb + k - 1;
  // Normal equations X'X β = X'y; columns: blocks 0…nb−1, entries 1…k−1 at nb + e − 1.
  const xtx = new Float64Array(p * p);
  const xty = new Float64Array(p);
  const col = (e: number) => nb + e - 1;
  for (let i = 0; i < y.length; i++) {
    const b = block[i]!;
    const e = entry[i]!;
    xtx[b * p + b]! += 1;
    xty[b]! += y[i]!;
    if (e > 0) {
      const c = col(e);
      xtx[c * p + c]! += 1;
      xtx[b * p + c]! += 1;
      xtx[c * p + b]! += 1;
      xty[c]! += y[i]!;
    }
  }
  const g = invertSpd(xtx, p);
  const beta = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    let s = 0;
    for (let j = 0; j < p; j++) s += g[i * p + j]! * xty[j]!;
    beta[i] = s;
  }

  // Block weights: equal over sites, then equal over the blocks within a site.
  const w = new Float64Array(nb);
  const siteOf = input.siteOfBlock ?? new Int32Array(nb);
  const blocksInSite = new Map<number, number>();
  for (let b = 0; b < nb; b++)
    blocksInSite.set(siteOf[b]!, (blocksInSite.get(siteOf[b]!) ?? 0) + 1);
  const sites = blocksInSite.size;
  for (let b = 0; b < nb; b++) w[b] = 1 / (sites * blocksInSite.get(siteOf[b]!)!);

  // Gw (the block-weight part of L G), shared by every entry.
  const gw = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    let s = 0;
    for (let b = 0; b < nb; b++) s += g[i * p + b]! * w[b]!;
    gw[i] = s;
  }
  let wgw = 0;
  let base = 0;
  for (let b = 0; b < nb; b++) {
    wgw += w[b]! * gw[b]!;
    base += w[b]! * beta[b]!;
  }
  const mean = new Float64Array(k);
  const se = new Float64Array(k);
  for (let e = 0; e < k; e++) {
    if (e === 0) {
      mean[e] = base;
      se[e] = Math.sqrt(ms * wgw);
    } else {
      const c = col(e);
      mean[e] = base + beta[c]!;
      se[e] = Math.sqrt(ms * (wgw + 2 * gw[c]! + g[c * p + c]!));
    }
  }
  const pairSe = (i: number, j: number): number => {
    const gi = i === 0 ? -1 : col(i);
    const gj = j === 0 ? -1 : col(j);
    const vii = gi < 0 ? 0 : g[gi * p + gi]!;
    const vjj = gj < 0 ? 0 : g[gj * p + gj]!;
    const vij = gi < 0 || gj < 0 ? 0 : g[gi * p + gj]!;
    return Math.sqrt(ms * (vii + vjj - 2 * vij));
  };
  return { mean, se, pairSe };
}
