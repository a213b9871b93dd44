/**
 * Eigenvalues and eigenvectors of a small symmetric matrix by cyclic Jacobi rotations
 * (accurate to rounding for the matrices the analysis meets: a few hundred rows at most).
 */
export interface SymmetricEigen {
  /** Descending. */
  values: number[];
  /** vectors[m] is the unit eigenvector of values[m]. */
  vectors: Float64Array[];
}

export function symmetricEigen(matrix: Float64Array, n: number): SymmetricEigen {
  const a = Float64Array.from(matrix);
  const v = new Float64Array(n * n);
  for (let i = 0; i < n; i++) v[i * n + i] = 1;
  for (let sweep = 0; sweep < 100; sweep++) {
    let off = 0;
    let scale = 0;
    for (let i = 0; i < n; i++) {
      scale += a[i * n + i]! ** 2;
      for (let j = i + 1; j < n; j++) off += a[i * n + j]! ** 2;
    }
    if (off <= 1e-30 * scale || off === 0) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q]!;
        if (apq === 0) continue;
        const theta = (a[q * n + q]! - a[p * n + p]!) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k * n + p]!;
          const akq = a[k * n + q]!;
          a[k * n + p] = c * akp - s * akq;
          a[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p * n + k]!;
          const aqk = a[q * n + k]!;
          a[p * n + k] = c * apk - s * aqk;
          a[q * n + k] = s * apk + c * aqk;
        }
        for (let k = 0; k < n; k++) {
          const vkp = v[k * n + p]!;
          const vkq = v[k * n + q]!;
          v[k * n + p] = c * vkp - s * vkq;
          v[k * n + q] = s * vkp + c * vkq;
        }
      }
    }
  }
  const order = [...Array(n).keys()].sort((i, j) => a[j * n + j]! - a[i * n + i]!);
  return {
    values: order.map((i) => a[i * n + i]!),
    vectors: order.map((i) => {
      const out = new Float64Array(n);
      for (let k = 0; k < n; k++) out[k] = v[k * n + i]!;
      return out;
    }),
  };
}
