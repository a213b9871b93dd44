/**
 * Eigenvalues and eigenvectors of a symmetric matrix: Householder reduction to tridiagonal
 * form, then the implicit QL method with shifts (the tred2 / tql2 pair of the classic
 * handbook algorithms). About 9n³ operations in all, accurate to rounding, for the matrices
 * the analysis meets (a few hundred rows at most).
 */
export interface SymmetricEigen {
  /** Descending. */
  values: number[];
  /** vectors[m] is the unit eigenvector of values[m]. */
  vectors: Float64Array[];
}

const EPS = 2 ** -52;

/** √(a² + b²) without overflow or underflow on the way. */
function hypot(a: number, b: number): number {
  const x = Math.abs(a);
  const y = Math.abs(b);
  if (x > y) {
    const t = y / x;
    return x * Math.sqrt(1 + t * t);
  }
  if (y === 0) return 0;
  const t = x / y;
  return y * Math.sqrt(1 + t * t);
}

export function symmetricEigen(matrix: Float64Array, n: number): SymmetricEigen {
  if (n === 0) return { values: [], vectors: [] };
  // v: row-major n × n, starts as the matrix; after tridiagonalisation it holds the
  // accumulated Householder transformations (columns).
  const v = Float64Array.from(matrix.subarray(0, n * n));
  const d = new Float64Array(n);
  const e = new Float64Array(n);
  for (let j = 0; j < n; j++) d[j] = v[(n - 1) * n + j]!;

  for (let i = n - 1; i > 0; i--) {
    let scale = 0;
    let h = 0;
    for (let k = 0; k < i; k++) scale += Math.abs(d[k]!);
    if (scale === 0) {
      e[i] = d[i - 1]!;
      for (let j = 0; j < i; j++) {
        d[j] = v[(i - 1) * n + j]!;
        v[i * n + j] = 0;
        v[j * n + i] = 0;
      }
    } else {
      for (let k = 0; k < i; k++) {
        d[k]! /= scale;
        h += d[k]! * d[k]!;
      }
      let f = d[i - 1]!;
      let g = Math.sqrt(h);
      if (f > 0) g = -g;
      e[i] = scale * g;
      h -= f * g;
      d[i - 1] = f - g;
      for (let j = 0; j < i; j++) e[j] = 0;
      for (let j = 0; j < i; j++) {
        f = d[j]!;
        v[j * n + i] = f;
        g = e[j]! + v[j * n + j]! * f;
        for (let k = j + 1; k <= i - 1; k++) {
          g += v[k * n + j]! * d[k]!;
          e[k]! += v[k * n + j]! * f;
        }
        e[j] = g;
      }
      f = 0;
      for (let j = 0; j < i; j++) {
        e[j]! /= h;
        f += e[j]! * d[j]!;
      }
      const hh = f / (h + h);
      for (let j = 0; j < i; j++) e[j]! -= hh * d[j]!;
      for (let j = 0; j < i; j++) {
        f = d[j]!;
        g = e[j]!;
        for (let k = j; k <= i - 1; k++) v[k * n + j]! -= f * e[k]! + g * d[k]!;
        d[j] = v[(i - 1) * n + j]!;
        v[i * n + j] = 0;
      }
    }
    d[i] = h;
  }
  // Accumulate the transformations.
  for (let i = 0; i < n - 1; i++) {
    v[(n - 1) * n + i] = v[i * n + i]!;
    v[i * n + i] = 1;
    const h = d[i + 1]!;
    if (h !== 0) {
      for (let k = 0; k <= i; k++) d[k] = v[k * n + i + 1]! / h;
      for (let j = 0; j <= i; j++) {
        let g = 0;
        for (let k = 0; k <= i; k++) g += v[k * n + i + 1]! * v[k * n + j]!;
        for (let k = 0; k <= i; k++) v[k * n + j]! -= g * d[k]!;
      }
    }
    for (let k = 0; k <= i; k++) v[k * n + i + 1] = 0;
  }
  for (let j = 0; j < n; j++) {
    d[j] = v[(n - 1) * n + j]!;
    v[(n - 1) * n + j] = 0;
  }
  v[(n - 1) * n + n - 1] = 1;
  e[0] = 0;

  // QL on the tridiagonal matrix; the rotations act on columns of v, so they run on its
  // transpose w (row i of w = column i of v) to touch contiguous memory.
  const w = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) w[i * n + k] = v[k * n + i]!;
  for (let i = 1; i < n; i++) e[i - 1] = e[i]!;
  e[n - 1] = 0;
  let f = 0;
  // An off-diagonal element is negligible against the whole matrix's size (a running maximum
  // would let the iterations chase rounding noise into subnormal numbers, where the rotations
  // stop being orthogonal).
  let tst1 = 0;
  for (let l = 0; l < n; l++) tst1 = Math.max(tst1, Math.abs(d[l]!) + Math.abs(e[l]!));
  for (let l = 0; l < n; l++) {
    let m = l;
    while (m < n - 1 && Math.abs(e[m]!) > EPS * tst1) m++;
    if (m > l) {
      for (let iter = 0; iter < 60; iter++) {
        let g = d[l]!;
        let p = (d[l + 1]! - g) / (2 * e[l]!);
        let r = hypot(p, 1);
        if (p < 0) r = -r;
        d[l] = e[l]! / (p + r);
        d[l + 1] = e[l]! * (p + r);
        const dl1 = d[l + 1]!;
        let h = g - d[l]!;
        for (let i = l + 2; i < n; i++) d[i]! -= h;
        f += h;
        p = d[m]!;
        let c = 1;
        let c2 = c;
        let c3 = c;
        const el1 = e[l + 1]!;
        let s = 0;
        let s2 = 0;
        for (let i = m - 1; i >= l; i--) {
          c3 = c2;
          c2 = c;
          s2 = s;
          g = c * e[i]!;
          h = c * p;
          r = hypot(p, e[i]!);
          e[i + 1] = s * r;
          s = e[i]! / r;
          c = p / r;
          p = c * d[i]! - s * g;
          d[i + 1] = h + s * (c * g + s * d[i]!);
          const ri = i * n;
          const ri1 = (i + 1) * n;
          for (let k = 0; k < n; k++) {
            const x = w[ri1 + k]!;
            const z = w[ri + k]!;
            w[ri1 + k] = s * z + c * x;
            w[ri + k] = c * z - s * x;
          }
        }
        p = (-s * s2 * c3 * el1 * e[l]!) / dl1;
        e[l] = s * p;
        d[l] = c * p;
        if (!(Math.abs(e[l]!) > EPS * tst1)) break;
      }
    }
    d[l] = d[l]! + f;
    e[l] = 0;
  }
  const order = [...Array(n).keys()].sort((i, j) => d[j]! - d[i]!);
  return {
    values: order.map((i) => d[i]!),
    vectors: order.map((i) => w.slice(i * n, (i + 1) * n)),
  };
}
