/**
 * Distribution functions used by the tests and mean separation, built on jstat with the
 * accuracy the analysis needs (upper tails without cancellation, refined quantiles).
 */
import jStat from 'jstat';

/** Upper-tail probability P(F > f) for F(df1, df2), via the incomplete beta function. */
export function fUpperTail(f: number, df1: number, df2: number): number {
  if (!(f >= 0) || df1 <= 0 || df2 <= 0) return NaN;
  if (f === Infinity) return 0;
  // P(F > f) = I_{df2/(df2+df1 f)}(df2/2, df1/2); avoids 1 − cdf losing small p-values.
  return jStat.ibeta(df2 / (df2 + df1 * f), df2 / 2, df1 / 2);
}

/** Student t quantile, refined by Newton steps on jstat's cdf (its inverse alone is ~1e-8 off; the refined value is limited by the cdf, ~1e-9..1e-8). */
export function studentTQuantile(p: number, df: number): number {
  let x = jStat.studentt.inv(p, df);
  for (let i = 0; i < 4; i++) {
    const err = jStat.studentt.cdf(x, df) - p;
    const dens = jStat.studentt.pdf(x, df);
    if (!(dens > 0)) break;
    const step = err / dens;
    x -= step;
    if (Math.abs(step) < 1e-15 * Math.abs(x)) break;
  }
  return x;
}

/** Quantile of the studentized range for k means and df error degrees of freedom. */
export function studentizedRangeQuantile(p: number, k: number, df: number): number {
  return jStat.tukey.inv(p, k, df);
}

/** Upper-tail probability of the studentized range. */
export function studentizedRangeUpperTail(q: number, k: number, df: number): number {
  return 1 - jStat.tukey.cdf(q, k, df);
}
