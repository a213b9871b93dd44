/**
 * Sequential sums of squares for blocked layouts (rcbd; multisite with blocks nested in
 * sites) that are not orthogonal, for example after a missing plot.
 *
 * Blocks are absorbed by sweeping block means, which leaves the reduced normal equations for
 * varieties, C·τ = Q with C = Σ_b (diag(n_b) − n_b n_bᵀ / N_b) and Q = Σ (y − ȳ_block) by
 * variety: a small dense system (entries × entries) instead of a QR of every plot.
 *   - site and block-within-site: from group means (blocks nest in sites, so these
 *     reductions need no solve even when unbalanced);
 *   - variety after site and block: Qᵀτ from the whole-trial system;
 *   - site × variety after those: blocks and site × variety cells both live inside one site,
 *     so the full model splits into one block-absorbed system per site; its reduction is the
 *     sum of the per-site Qᵀτ, minus the variety reduction.
 * The residual is computed plot by plot from the per-site solutions, not by subtraction.
 * Each system is solved by Cholesky with diagonal pivoting; a pivot that falls to a tiny
 * fraction of its column's size marks an aliased variety, so degrees of freedom are ranks.
 */
import { accurateMean } from './linear-model.js';

/** Pivot below this fraction of the variety's plot count counts as aliased. */
const PIVOT_TOLERANCE = 1e-10;

export interface AbsorbedSs {
  site: { df: number; ss: number } | null;
  block: { df: number; ss: number };
  variety: { df: number; ss: number };
  siteVariety: { df: number; ss: number } | null;
  residualDf: number;
  residualSs: number;
  totalSs: number;
}

interface Reduced {
  /** entries × entries, row-major */
  c: Float64Array;
  q: Float64Array;
  /** Plots per entry (the raw column's squared norm). */
  n: Float64Array;
}

interface Solution {
  rank: number;
  /** Qᵀτ, the reduction in the residual sum of squares. */
  ss: number;
  /** One solution of Cτ = Q (aliased entries set to 0). */
  tau: Float64Array;
}

/**
 * Pivoted Cholesky on the Schur complement, with forward and back substitution. `sys.c` must be
 * exactly symmetric (as the reduced systems built here are).
 */
export function solveReduced(sys: Reduced, k: number): Solution {
  const s = Float64Array.from(sys.c);
  const b = Float64Array.from(sys.q);
  // Entries not yet pivoted, in entry order (typed, and shortened in place).
  const remaining = new Int32Array(k);
  let left = 0;
  for (let e = 0; e < k; e++) if (sys.n[e]! > 0) remaining[left++] = e;
  const pivots: number[] = [];
  const columns: Float64Array[] = [];
  const z: number[] = [];
  let ss = 0;
  while (left > 0) {
    let best = -1;
    let bestValue = 0;
    for (let r = 0; r < left; r++) {
      const e = remaining[r]!;
      const d = s[e * k + e]!;
      if (d > PIVOT_TOLERANCE * sys.n[e]! && d > bestValue) {
        bestValue = d;
        best = r;
      }
    }
    if (best < 0) break;
    const p = remaining[best]!;
    remaining.copyWithin(best, best + 1, left);
    left--;
    const root = Math.sqrt(bestValue);
    const l = new Float64Array(k);
    l[p] = root;
    // C is symmetric to the last bit (every entry is built from products that commute), so
    // only its lower triangle (row entry ≥ column entry) is kept up to date.
    for (let r = 0; r < left; r++) {
      const i = remaining[r]!;
      l[i] = s[i > p ? i * k + p : p * k + i]! / root;
    }
    for (let r = 0; r < left; r++) {
      const i = remaining[r]!;
      const li = l[i]!;
      if (li === 0) continue;
      const row = i * k;
      for (let c = 0; c <= r; c++) {
        const j = remaining[c]!;
        s[row + j] = s[row + j]! - li * l[j]!;
      }
    }
    const zr = b[p]! / root;
    for (let r = 0; r < left; r++) {
      const i = remaining[r]!;
      b[i] = b[i]! - l[i]! * zr;
    }
    ss += zr * zr;
    pivots.push(p);
    columns.push(l);
    z.push(zr);
  }
  const tau = new Float64Array(k);
  for (let r = pivots.length - 1; r >= 0; r--) {
    const l = columns[r]!;
    let acc = z[r]!;
    for (let t = r + 1; t < pivots.length; t++) acc -= l[pivots[t]!]! * tau[pivots[t]!]!;
    tau[pivots[r]!] = acc / l[pivots[r]!]!;
  }
  return { rank: pivots.length, ss, tau };
}

/**
 * Type I sums of squares in the order (site,) block, variety (, site × variety).
 * `site` is omitted for rcbd. Codes are 0 … levels − 1; block codes are global.
 */
export function absorbedBlockSs(
  y: Float64Array,
  block: Int32Array,
  blocks: number,
  entry: Int32Array,
  entries: number,
  site?: Int32Array,
  sites?: number,
): AbsorbedSs {
  const n = y.length;
  const k = entries;
  const gm = accurateMean(y);
  let totalSs = 0;
  for (let i = 0; i < n; i++) totalSs += (y[i]! - gm) ** 2;

  // Block means (with one correction pass) and the site of each block.
  const bSum = new Float64Array(blocks);
  const bN = new Float64Array(blocks);
  for (let i = 0; i < n; i++) {
    bSum[block[i]!]! += y[i]!;
    bN[block[i]!]! += 1;
  }
  const bMean = new Float64Array(blocks);
  for (let g = 0; g < blocks; g++) bMean[g] = bN[g]! > 0 ? bSum[g]! / bN[g]! : 0;
  const bCorr = new Float64Array(blocks);
  for (let i = 0; i < n; i++) bCorr[block[i]!]! += y[i]! - bMean[block[i]!]!;
  for (let g = 0; g < blocks; g++) if (bN[g]! > 0) bMean[g] = bMean[g]! + bCorr[g]! / bN[g]!;

  const nSites = site ? sites! : 1;
  const siteOf = (i: number) => (site ? site[i]! : 0);
  const siteOfBlock = new Int32Array(blocks);
  for (let i = 0; i < n; i++) siteOfBlock[block[i]!] = siteOf(i);
  const sSum = new Float64Array(nSites);
  const sN = new Float64Array(nSites);
  for (let i = 0; i < n; i++) {
    sSum[siteOf(i)]! += y[i]!;
    sN[siteOf(i)]! += 1;
  }
  const sMean = new Float64Array(nSites);
  for (let g = 0; g < nSites; g++) sMean[g] = sN[g]! > 0 ? sSum[g]! / sN[g]! : 0;
  const sCorr = new Float64Array(nSites);
  for (let i = 0; i < n; i++) sCorr[siteOf(i)]! += y[i]! - sMean[siteOf(i)]!;
  for (let g = 0; g < nSites; g++) if (sN[g]! > 0) sMean[g] = sMean[g]! + sCorr[g]! / sN[g]!;

  let sitesPresent = 0;
  let siteSs = 0;
  for (let g = 0; g < nSites; g++) {
    if (sN[g]! === 0) continue;
    sitesPresent++;
    siteSs += sN[g]! * (sMean[g]! - gm) ** 2;
  }
  let blocksPresent = 0;
  let blockSs = 0;
  for (let g = 0; g < blocks; g++) {
    if (bN[g]! === 0) continue;
    blocksPresent++;
    blockSs += bN[g]! * (bMean[g]! - sMean[siteOfBlock[g]!]!) ** 2;
  }

  // Plots grouped by block, then the per-site reduced systems.
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => block[a]! - block[b]!);
  const perSite: Reduced[] = Array.from({ length: nSites }, () => ({
    c: new Float64Array(k * k),
    q: new Float64Array(k),
    n: new Float64Array(k),
  }));
  const count = new Float64Array(k);
  // A site whose every block holds the same entries once each is complete (orthogonal): its
  // system C = r(I − J/k) is solved in closed form. Per site: blocks, and the entries of its
  // first block (-1 once a block differs or holds an entry twice).
  const siteBlocks = new Int32Array(nSites);
  const siteWidth = new Int32Array(nSites).fill(-2);
  for (let start = 0; start < n;) {
    const b = block[order[start]!]!;
    let end = start;
    const present: number[] = [];
    while (end < n && block[order[end]!]! === b) {
      const i = order[end]!;
      const e = entry[i]!;
      if (count[e] === 0) present.push(e);
      count[e] = count[e]! + 1;
      end++;
    }
    const sys = perSite[siteOfBlock[b]!]!;
    const nb = end - start;
    const sb = siteOfBlock[b]!;
    siteBlocks[sb]!++;
    if (siteWidth[sb] === -2) siteWidth[sb] = present.length;
    if (present.length !== nb || present.length !== siteWidth[sb]) siteWidth[sb] = -1;
    for (const e of present) {
      const ce = count[e]!;
      sys.n[e] = sys.n[e]! + ce;
      sys.c[e * k + e] = sys.c[e * k + e]! + ce;
      for (const f of present) sys.c[e * k + f] = sys.c[e * k + f]! - (ce * count[f]!) / nb;
    }
    for (let t = start; t < end; t++) {
      const i = order[t]!;
      sys.q[entry[i]!] = sys.q[entry[i]!]! + (y[i]! - bMean[b]!);
    }
    for (const e of present) count[e] = 0;
    start = end;
  }

  const whole: Reduced = perSite.length === 1 ? perSite[0]! : sumSystems(perSite, k);
  const variety = solveReduced(whole, k);
  const solutions = site
    ? perSite.map(
        (sys, g) =>
          (siteWidth[g]! >= 0 && completeSolution(sys, k, siteBlocks[g]!, siteWidth[g]!)) ||
          solveReduced(sys, k),
      )
    : [variety];

  // Residual plot by plot: y − ȳ_block − (τ_e − mean of τ over the block's plots).
  const tauBlockSum = new Float64Array(blocks);
  for (let i = 0; i < n; i++) tauBlockSum[block[i]!]! += solutions[siteOf(i)]!.tau[entry[i]!]!;
  let residualSs = 0;
  for (let i = 0; i < n; i++) {
    const b = block[i]!;
    const r =
      y[i]! - bMean[b]! - (solutions[siteOf(i)]!.tau[entry[i]!]! - tauBlockSum[b]! / bN[b]!);
    residualSs += r * r;
  }
  const fullRank = solutions.reduce((a, s) => a + s.rank, 0);
  const fullSs = solutions.reduce((a, s) => a + s.ss, 0);

  if (!site) {
    return {
      site: null,
      block: { df: blocksPresent - 1, ss: blockSs },
      variety: { df: variety.rank, ss: variety.ss },
      siteVariety: null,
      residualDf: n - blocksPresent - variety.rank,
      residualSs,
      totalSs,
    };
  }
  return {
    site: { df: sitesPresent - 1, ss: siteSs },
    block: { df: blocksPresent - sitesPresent, ss: blockSs },
    variety: { df: variety.rank, ss: variety.ss },
    siteVariety: { df: fullRank - variety.rank, ss: Math.max(0, fullSs - variety.ss) },
    residualDf: n - blocksPresent - fullRank,
    residualSs,
    totalSs,
  };
}

/**
 * The solution of a complete site's system, or null when the site is not complete. Complete:
 * each of its `blocks` blocks holds `width` entries once each (checked by the caller) and every
 * entry present has a plot in every block, so all blocks hold the same entries. Then
 * C = r(I − J/width) on those entries and Q sums to zero, so τ = Q / r, the reduction is Qᵀτ
 * and the rank is width − 1.
 */
function completeSolution(sys: Reduced, k: number, blocks: number, width: number): Solution | null {
  let present = 0;
  for (let e = 0; e < k; e++) {
    if (sys.n[e] === 0) continue;
    if (sys.n[e] !== blocks) return null;
    present++;
  }
  if (present !== width) return null;
  const tau = new Float64Array(k);
  let ss = 0;
  for (let e = 0; e < k; e++) {
    if (sys.n[e] === 0) continue;
    tau[e] = sys.q[e]! / blocks;
    ss += sys.q[e]! * tau[e]!;
  }
  return { rank: width - 1, ss, tau };
}

function sumSystems(systems: Reduced[], k: number): Reduced {
  const out: Reduced = {
    c: new Float64Array(k * k),
    q: new Float64Array(k),
    n: new Float64Array(k),
  };
  for (const s of systems) {
    for (let j = 0; j < k * k; j++) out.c[j] = out.c[j]! + s.c[j]!;
    for (let e = 0; e < k; e++) {
      out.q[e] = out.q[e]! + s.q[e]!;
      out.n[e] = out.n[e]! + s.n[e]!;
    }
  }
  return out;
}
