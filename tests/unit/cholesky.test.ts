import { describe, expect, it } from 'vitest';
import { choleskyInPlace, invertSpd, traceOfSpdInverse } from '../../common/cholesky';

describe('Cholesky factorisation', () => {
  it('factors the worked 3 × 3 example exactly', () => {
    // The worked example on the Wikipedia page "Cholesky decomposition":
    // [[4, 12, −16], [12, 37, −43], [−16, −43, 98]] = L Lᵀ with L = [[2], [6, 1], [−8, 5, 3]].
    const a = Float64Array.from([4, 12, -16, 12, 37, -43, -16, -43, 98]);
    const logdet = choleskyInPlace(a, 3);
    expect([a[0], a[3], a[4], a[6], a[7], a[8]]).toEqual([2, 6, 1, -8, 5, 3]);
    // det = (2 · 1 · 3)² = 36; the upper triangle is left as it was.
    expect(logdet).toBeCloseTo(Math.log(36), 12);
    expect([a[1], a[2], a[5]]).toEqual([12, -16, -43]);
  });

  // The 4 × 4 Hilbert matrix H[i][j] = 1/(i + j + 1) has the integer inverse below and
  // det = 1/6048000 (closed forms in M.-D. Choi, "Tricks or treats with the Hilbert matrix",
  // American Mathematical Monthly 90, 1983).
  const hilbert = Float64Array.from(
    { length: 16 },
    (_, k) => 1 / (Math.floor(k / 4) + (k % 4) + 1),
  );
  const hilbertInverse = [
    16, -120, 240, -140, -120, 1200, -2700, 1680, 240, -2700, 6480, -4200, -140, 1680, -4200, 2800,
  ];
  it('inverts the 4 × 4 Hilbert matrix and gives its determinant', () => {
    const inv = invertSpd(hilbert, 4)!;
    inv.forEach((x, k) => expect(Math.abs(x - hilbertInverse[k]!)).toBeLessThan(1e-8 * 6480));
    expect(Math.exp(choleskyInPlace(Float64Array.from(hilbert), 4))).toBeCloseTo(1 / 6048000, 15);
    // The input is not changed.
    expect(hilbert[5]).toBe(1 / 3);
  });
  it('gives the trace of the inverse', () => {
    expect(traceOfSpdInverse(hilbert, 4)).toBeCloseTo(16 + 1200 + 6480 + 2800, 6);
  });
  it('says a singular or indefinite matrix has no inverse', () => {
    const singular = Float64Array.from([1, 1, 1, 1]);
    expect(invertSpd(singular, 2)).toBeNull();
    expect(traceOfSpdInverse(singular, 2)).toBeNull();
    expect(choleskyInPlace(Float64Array.from([1, 2, 2, 1]), 2)).toBeNaN();
  });
});
