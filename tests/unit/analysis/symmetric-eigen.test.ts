// The eigen solver behind the Satterthwaite F test, on matrices whose eigen decomposition is
// known in closed form.
import { describe, expect, it } from 'vitest';
import { symmetricEigen } from '../../../server/analysis/engine/symmetric-eigen.js';

function checkOrthonormal(vectors: Float64Array[], n: number) {
  for (let a = 0; a < n; a++)
    for (let b = 0; b <= a; b++) {
      let s = 0;
      for (let i = 0; i < n; i++) s += vectors[a]![i]! * vectors[b]![i]!;
      expect(Math.abs(s - (a === b ? 1 : 0))).toBeLessThan(1e-12);
    }
}

describe('symmetric eigen decomposition', () => {
  it('second-difference matrix tridiag(−1, 2, −1): λ_k = 2 − 2cos(kπ/(n+1)), v_k ∝ sin(jkπ/(n+1))', () => {
    // Closed form of the discrete Laplacian (any numerical linear algebra text, e.g. Strang,
    // "Introduction to Applied Mathematics", §1.5; from memory).
    for (const n of [1, 2, 7, 60, 120]) {
      const a = new Float64Array(n * n);
      for (let i = 0; i < n; i++) {
        a[i * n + i] = 2;
        if (i > 0) a[i * n + i - 1] = a[(i - 1) * n + i] = -1;
      }
      const { values, vectors } = symmetricEigen(a, n);
      values.forEach((lambda, m) => {
        const k = n - m; // descending order
        expect(Math.abs(lambda - (2 - 2 * Math.cos((k * Math.PI) / (n + 1))))).toBeLessThan(1e-12);
        // Parallel to the closed-form vector (up to sign).
        const exact = Float64Array.from({ length: n }, (_, j) =>
          Math.sin(((j + 1) * k * Math.PI) / (n + 1)),
        );
        const norm = Math.hypot(...exact);
        let dot = 0;
        for (let j = 0; j < n; j++) dot += (exact[j]! / norm) * vectors[m]![j]!;
        expect(Math.abs(Math.abs(dot) - 1)).toBeLessThan(1e-9);
      });
      checkOrthonormal(vectors, n);
    }
  });

  it('a matrix of ones (rank one): n once and 0 n − 1 times, with an orthonormal null space', () => {
    for (const n of [3, 50, 99]) {
      const a = new Float64Array(n * n).fill(1);
      const { values, vectors } = symmetricEigen(a, n);
      expect(Math.abs(values[0]! - n)).toBeLessThan(1e-12 * n);
      for (const v of values.slice(1)) expect(Math.abs(v)).toBeLessThan(1e-12 * n);
      checkOrthonormal(vectors, n);
    }
  });

  it('a diagonal matrix is its own decomposition, in descending order', () => {
    const a = new Float64Array([3, 0, 0, 0, -1, 0, 0, 0, 5]);
    const { values, vectors } = symmetricEigen(a, 3);
    expect(values).toEqual([5, 3, -1]);
    expect(vectors.map((v) => [...v].map(Math.abs))).toEqual([
      [0, 0, 1],
      [1, 0, 0],
      [0, 1, 0],
    ]);
  });
});
