/**
 * Derivatives by central differences with Richardson extrapolation (four step sizes, each half
 * the last), the scheme the standard numerical-derivative routines use: the h² and h⁴ error
 * terms cancel, so first and second derivatives keep 8–10 significant digits.
 */

/** Central-difference sequence D(h), D(h/2), … extrapolated to h → 0 (even error series). */
function richardson(estimate: (h: number) => number, h0: number, levels = 4): number {
  let row: number[] = [];
  for (let k = 0; k < levels; k++) row.push(estimate(h0 / 2 ** k));
  for (let m = 1; m < levels; m++) {
    const f = 4 ** m;
    const next: number[] = [];
    for (let k = 0; k + 1 < row.length; k++) next.push((f * row[k + 1]! - row[k]!) / (f - 1));
    row = next;
  }
  return row[0]!;
}

/** Base step for coordinate x: relative d·|x|, or eps near zero. */
function step(x: number, d: number, eps = 1e-4): number {
  const zeroTolerance = Math.sqrt(2.220446049250313e-16 / 7e-7);
  return Math.abs(x) < zeroTolerance ? eps : d * Math.abs(x);
}

/** ∂g/∂x_i of a vector-valued g (every output at once), one array per coordinate. */
export function jacobian(
  g: (x: readonly number[]) => Float64Array,
  x: readonly number[],
  d = 1e-4,
  levels = 4,
): Float64Array[] {
  return x.map((xi, i) => {
    const h0 = step(xi, d);
    // Central differences at h0, h0/2, … for every output, then the same extrapolation as
    // `richardson`, element by element in place (no arrays per output).
    const rows: Float64Array[] = [];
    const arg = [...x];
    for (let k = 0; k < levels; k++) {
      const h = h0 / 2 ** k;
      arg[i] = xi + h;
      const a = g(arg);
      arg[i] = xi - h;
      const b = g(arg);
      const v = new Float64Array(a.length);
      for (let j = 0; j < a.length; j++) v[j] = (a[j]! - b[j]!) / (2 * h);
      rows.push(v);
    }
    for (let m = 1; m < levels; m++) {
      const f = 4 ** m;
      for (let k = 0; k + m < levels; k++) {
        const lo = rows[k]!;
        const hi = rows[k + 1]!;
        for (let j = 0; j < lo.length; j++) lo[j] = (f * hi[j]! - lo[j]!) / (f - 1);
      }
    }
    return rows[0]!;
  });
}

/** Hessian of a scalar f (row-major, symmetric). */
export function hessian(
  f: (x: readonly number[]) => number,
  x: readonly number[],
  d = 0.1,
): Float64Array {
  const k = x.length;
  const at = (shift: readonly number[]) => f(x.map((v, i) => v + shift[i]!));
  const f0 = f(x);
  const h = new Float64Array(k * k);
  const base = x.map((v) => step(v, d));
  for (let i = 0; i < k; i++) {
    h[i * k + i] = richardson((s) => {
      const e = new Array<number>(k).fill(0);
      e[i] = s * base[i]!;
      const plus = at(e);
      e[i] = -s * base[i]!;
      return (plus - 2 * f0 + at(e)) / (s * base[i]!) ** 2;
    }, 1);
    for (let j = 0; j < i; j++) {
      const v = richardson((s) => {
        const hi = s * base[i]!;
        const hj = s * base[j]!;
        const e = (a: number, b: number) => {
          const v2 = new Array<number>(k).fill(0);
          v2[i] = a;
          v2[j] = b;
          return at(v2);
        };
        return (e(hi, hj) - e(hi, -hj) - e(-hi, hj) + e(-hi, -hj)) / (4 * hi * hj);
      }, 1);
      h[i * k + j] = v;
      h[j * k + i] = v;
    }
  }
  return h;
}
