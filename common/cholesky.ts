/**
 * Dense Cholesky factorisation A = L Lᵀ of a symmetric positive-definite matrix (row-major
 * m × m, only its lower triangle read), and what is built on it: the inverse, and the trace of
 * the inverse. One factorisation for the analysis engine (least-squares and mixed-model normal
 * equations) and for describing an incomplete-block plan (its efficiency factor). Pure: no I/O.
 */

/** A pivot at or below this fraction of its diagonal (or of 1, if larger) counts as singular. */
const SINGULAR = 1e-10;

/**
 * L written over A's lower triangle (the upper triangle is left as it was). Returns log det A,
 * or NaN when a pivot is not positive, or not above `tolerance` × max(1, its diagonal); the
 * factor is then incomplete.
 */
export function choleskyInPlace(a: Float64Array, m: number, tolerance = 0): number {
  let logdet = 0;
  for (let j = 0; j < m; j++) {
    const diagonal = a[j * m + j]!;
    let d = diagonal;
    for (let k = 0; k < j; k++) d -= a[j * m + k]! ** 2;
    if (!(d > 0) || d <= tolerance * Math.max(1, diagonal)) return NaN;
    const root = Math.sqrt(d);
    a[j * m + j] = root;
    logdet += 2 * Math.log(root);
    for (let i = j + 1; i < m; i++) {
      let s = a[i * m + j]!;
      for (let k = 0; k < j; k++) s -= a[i * m + k]! * a[j * m + k]!;
      a[i * m + j] = s / root;
    }
  }
  return logdet;
}

/** The lower factor of A, or null when A is singular. */
function factor(a: Float64Array, m: number): Float64Array | null {
  const l = Float64Array.from(a);
  return Number.isNaN(choleskyInPlace(l, m, SINGULAR)) ? null : l;
}

/** L⁻¹ (lower triangular, row-major) from the lower factor L. */
function inverseOfFactor(l: Float64Array, m: number): Float64Array {
  const li = new Float64Array(m * m);
  for (let j = 0; j < m; j++) {
    li[j * m + j] = 1 / l[j * m + j]!;
    for (let i = j + 1; i < m; i++) {
      let s = 0;
      for (let k = j; k < i; k++) s -= l[i * m + k]! * li[k * m + j]!;
      li[i * m + j] = s / l[i * m + i]!;
    }
  }
  return li;
}

/** A⁻¹ = L⁻ᵀ L⁻¹, or null when A is singular. */
export function invertSpd(a: Float64Array, m: number): Float64Array | null {
  const l = factor(a, m);
  if (!l) return null;
  const li = inverseOfFactor(l, m);
  const inv = new Float64Array(m * m);
  for (let i = 0; i < m; i++) {
    for (let j = 0; j <= i; j++) {
      let s = 0;
      for (let k = i; k < m; k++) s += li[k * m + i]! * li[k * m + j]!;
      inv[i * m + j] = s;
      inv[j * m + i] = s;
    }
  }
  return inv;
}

/** trace(A⁻¹), the sum of the squares of L⁻¹'s entries; null when A is singular. */
export function traceOfSpdInverse(a: Float64Array, m: number): number | null {
  const l = factor(a, m);
  if (!l) return null;
  const li = inverseOfFactor(l, m);
  let trace = 0;
  for (let c = 0; c < m; c++) for (let i = c; i < m; i++) trace += li[i * m + c]! * li[i * m + c]!;
  return trace;
}
