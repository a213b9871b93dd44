/**
 * Sequential (type I) least-squares sums of squares by Householder QR.
 *
 * Each model term is a classification of the plots into cells (a factor, a factor nested in
 * another, or an interaction). Its columns are the cell indicators. Terms enter in the given
 * order after the intercept; a column that is (numerically) a combination of earlier columns
 * is aliased and skipped, so each term's degrees of freedom are the columns it adds to the
 * rank and its sum of squares is the reduction it brings. This is the general path used when
 * the layout is not orthogonal (missing plots, unequal replication across blocks).
 */

export interface ModelTerm {
  name: string;
  /** Cell code per observation, 0 … levels − 1. */
  cells: Int32Array;
  levels: number;
}

export interface SequentialTerm {
  name: string;
  df: number;
  ss: number;
}

export interface SequentialFit {
  terms: SequentialTerm[];
  residualDf: number;
  residualSs: number;
  /** Corrected total sum of squares Σ(y − ȳ)². */
  totalSs: number;
  /** Rank of the model matrix, intercept included. */
  rank: number;
}

/**
 * A column whose remaining norm, after the earlier reflections, is below this fraction of
 * its original norm is treated as aliased (the same kind of relative pivot tolerance
 * least-squares routines use for rank detection).
 */
export const ALIAS_TOLERANCE = 1e-7;

/** Mean with one correction pass, so the centred values sum to (nearly) zero. */
export function accurateMean(y: ArrayLike<number>): number {
  const n = y.length;
  if (n === 0) return NaN;
  let s = 0;
  for (let i = 0; i < n; i++) s += y[i]!;
  const m = s / n;
  let c = 0;
  for (let i = 0; i < n; i++) c += y[i]! - m;
  return m + c / n;
}

/**
 * Fit the terms in order by left-looking Householder QR on the centred response and return
 * the sequential sums of squares.
 */
export function sequentialSumsOfSquares(
  response: ArrayLike<number>,
  terms: readonly ModelTerm[],
  tolerance = ALIAS_TOLERANCE,
): SequentialFit {
  const n = response.length;
  const mean = accurateMean(response);
  const y = new Float64Array(n);
  let totalSs = 0;
  for (let i = 0; i < n; i++) {
    const d = response[i]! - mean;
    y[i] = d;
    totalSs += d * d;
  }

  // Householder vectors, stored as full-length columns (entries above the pivot row unused).
  const vectors: Float64Array[] = [];
  const vNorms2: number[] = [];
  const col = new Float64Array(n);
  let k = 0; // rank so far = next pivot row

  const reflect = (z: Float64Array, j: number): void => {
    const v = vectors[j]!;
    let dot = 0;
    for (let i = j; i < n; i++) dot += v[i]! * z[i]!;
    const f = (2 * dot) / vNorms2[j]!;
    if (f === 0) return;
    for (let i = j; i < n; i++) z[i] = z[i]! - f * v[i]!;
  };

  // Returns the squared effect of the new column on y, or null when aliased.
  const addColumn = (): number | null => {
    if (k >= n) return null;
    let orig = 0;
    for (let i = 0; i < n; i++) orig += col[i]! * col[i]!;
    if (orig === 0) return null;
    for (let j = 0; j < k; j++) reflect(col, j);
    let rest = 0;
    for (let i = k; i < n; i++) rest += col[i]! * col[i]!;
    if (Math.sqrt(rest) <= tolerance * Math.sqrt(orig)) return null;
    const norm = Math.sqrt(rest);
    const alpha = col[k]! >= 0 ? -norm : norm;
    const v = new Float64Array(n);
    for (let i = k; i < n; i++) v[i] = col[i]!;
    v[k] = v[k]! - alpha;
    // ‖v‖² = ‖x‖² − 2·alpha·x_k + alpha² = 2·(norm² − alpha·x_k)
    const vn2 = 2 * (rest - alpha * col[k]!);
    vectors.push(v);
    vNorms2.push(vn2);
    reflect(y, k);
    const effect = y[k]!;
    k++;
    return effect * effect;
  };

  // Intercept first: its effect on the centred response is ~0 and is not reported.
  col.fill(1);
  addColumn();

  const out: SequentialTerm[] = [];
  for (const term of terms) {
    let df = 0;
    let ss = 0;
    // Only cells that occur get a column.
    const present = new Uint8Array(term.levels);
    for (let i = 0; i < n; i++) present[term.cells[i]!] = 1;
    for (let level = 0; level < term.levels; level++) {
      if (!present[level]) continue;
      for (let i = 0; i < n; i++) col[i] = term.cells[i] === level ? 1 : 0;
      const e = addColumn();
      if (e !== null) {
        df++;
        ss += e;
      }
    }
    out.push({ name: term.name, df, ss });
  }

  let residualSs = 0;
  for (let i = k; i < n; i++) residualSs += y[i]! * y[i]!;
  return { terms: out, residualDf: n - k, residualSs, totalSs, rank: k };
}
