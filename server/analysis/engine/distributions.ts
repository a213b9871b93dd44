/**
 * Distribution functions for the tests and mean separation.
 *
 * The t and F tails come from a regularized incomplete beta computed here to near full double
 * precision: a continued fraction (modified Lentz) whose prefactor xᵃ(1−x)ᵇ/B(a,b) is formed
 * from Stirling's series with the large terms cancelled analytically, so degrees of freedom
 * in the thousands lose no digits. The t quantile is refined by Newton steps on that tail.
 * The studentized range still comes from jstat (its accuracy, ~1e-8, is ample for letters).
 */
import jStat from 'jstat';

const LN_SQRT_2PI = 0.9189385332046728;
const EPS = 2.220446049250313e-16;

/**
 * Stirling's correction μ(z) = ln Γ(z) − (z − ½)ln z + z − ln√(2π), by its asymptotic
 * series (Bernoulli numbers) for z ≥ 10 and by μ(z) = μ(z + 1) + (z + ½)·ln(1 + 1/z) − 1 below.
 */
function stirlingCorrection(z: number): number {
  let shift = 0;
  while (z < 10) {
    shift += (z + 0.5) * Math.log1p(1 / z) - 1;
    z += 1;
  }
  const r = 1 / z;
  const r2 = r * r;
  // 1/12, −1/360, 1/1260, −1/1680, 1/1188, −691/360360, 1/156, −3617/122400
  const series =
    r *
    (1 / 12 +
      r2 *
        (-1 / 360 +
          r2 *
            (1 / 1260 +
              r2 *
                (-1 / 1680 +
                  r2 *
                    (1 / 1188 + r2 * (-691 / 360360 + r2 * (1 / 156 + r2 * (-3617 / 122400))))))));
  return series + shift;
}

/** ln Γ(z) for z > 0. */
export function logGamma(z: number): number {
  if (!(z > 0)) return NaN;
  if (z < 10) {
    // Shift up to the asymptotic range: ln Γ(z) = ln Γ(z + m) − ln(z(z+1)…(z+m−1)).
    let prod = 1;
    let w = z;
    while (w < 10) {
      prod *= w;
      w += 1;
    }
    return logGamma(w) - Math.log(prod);
  }
  return (z - 0.5) * Math.log(z) - z + LN_SQRT_2PI + stirlingCorrection(z);
}

/** ln B(a, b), keeping the digits of the small difference when one or both arguments are large. */
function logBeta(a: number, b: number): number {
  const p = Math.min(a, b);
  const q = Math.max(a, b);
  if (p >= 10) {
    const corr = stirlingCorrection(p) + stirlingCorrection(q) - stirlingCorrection(p + q);
    return (
      -0.5 * Math.log(q) +
      LN_SQRT_2PI +
      corr +
      (p - 0.5) * Math.log(p / (p + q)) +
      q * Math.log1p(-p / (p + q))
    );
  }
  if (q >= 10) {
    const corr = stirlingCorrection(q) - stirlingCorrection(p + q);
    return logGamma(p) + corr + p - p * Math.log(p + q) + (q - 0.5) * Math.log1p(-p / (p + q));
  }
  return logGamma(p) + logGamma(q) - logGamma(p + q);
}

/**
 * ln of xᵃ yᵇ / B(a, b) with y = 1 − x given separately (so neither loses digits near 0 or 1).
 * For a, b ≥ 1 the Stirling form a·ln(1 + d/a) + b·ln(1 − d/b) with d = x·b − y·a keeps the
 * large parts of a·ln x, b·ln y and ln B from cancelling numerically.
 */
function logBetaPrefactor(a: number, b: number, x: number, y: number): number {
  if (a >= 1 && b >= 1) {
    const d = x * b - y * a;
    return (
      a * Math.log1p(d / a) +
      b * Math.log1p(-d / b) +
      0.5 * Math.log((a * b) / (a + b)) -
      LN_SQRT_2PI -
      stirlingCorrection(a) -
      stirlingCorrection(b) +
      stirlingCorrection(a + b)
    );
  }
  const lx = x > 0.5 ? Math.log1p(-y) : Math.log(x);
  const ly = y > 0.5 ? Math.log1p(-x) : Math.log(y);
  return a * lx + b * ly - logBeta(a, b);
}

/**
 * Continued fraction for I_x(a, b) / prefactor (modified Lentz). Its first denominator
 * 1 − (a + b)x/(a + 1) is formed from y = 1 − x when x is near 1, as
 * (1 − b + (a + b)·y)/(a + 1): with a in the thousands the direct form cancels to a few digits.
 */
function betaContinuedFraction(a: number, b: number, x: number, y: number): number {
  const tiny = 1e-300;
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = x < 0.5 ? 1 - (qab * x) / qap : (1 - b + qab * y) / qap;
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 100_000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  return h;
}

// Double-double arithmetic (a value is hi + lo, ~32 significant digits): the continued
// fraction below cancels several digits near the distribution's centre when a or b is in
// the thousands, which plain doubles cannot afford.
type DD = [number, number];
const SPLITTER = 134217729; // 2^27 + 1
function twoSum(a: number, b: number): DD {
  const s = a + b;
  const bb = s - a;
  return [s, a - (s - bb) + (b - bb)];
}
function twoProd(a: number, b: number): DD {
  const p = a * b;
  const ta = SPLITTER * a;
  const ah = ta - (ta - a);
  const al = a - ah;
  const tb = SPLITTER * b;
  const bh = tb - (tb - b);
  const bl = b - bh;
  return [p, ah * bh - p + ah * bl + al * bh + al * bl];
}
function ddAdd(x: DD, y: DD): DD {
  const [s, e] = twoSum(x[0], y[0]);
  const [hi, lo] = twoSum(s, e + x[1] + y[1]);
  return [hi, lo];
}
function ddMul(x: DD, y: DD): DD {
  const [p, e] = twoProd(x[0], y[0]);
  return twoSum(p, e + x[0] * y[1] + x[1] * y[0]);
}
function ddDiv(x: DD, y: DD): DD {
  const q1 = x[0] / y[0];
  const r = ddAdd(x, ddMul(y, [-q1, 0]));
  const q2 = r[0] / y[0];
  const r2 = ddAdd(r, ddMul(y, [-q2, 0]));
  const q3 = r2[0] / y[0];
  return ddAdd(twoSum(q1, q2), [q3, 0]);
}
const DD_ONE: DD = [1, 0];
const ddNum = (v: number): DD => [v, 0];

/**
 * The same continued fraction in double-double, for a or b in the hundreds and more: near the
 * distribution's centre its steps 1 + aa·d then cancel more digits than doubles can spare.
 */
function betaContinuedFractionDD(a: number, b: number, x: number, y: number): number {
  const tiny: DD = [1e-300, 0];
  const small = (v: DD) => Math.abs(v[0]) < 1e-300;
  const X = ddNum(x);
  const qab = twoSum(a, b);
  const qap = twoSum(a, 1);
  let c: DD = DD_ONE;
  // Whichever of x and y is small carries the digits of the difference.
  let d: DD =
    x < 0.5
      ? ddAdd(DD_ONE, ddDiv(ddMul(qab, [-x, 0]), qap))
      : ddDiv(ddAdd(twoSum(1, -b), ddMul(qab, ddNum(y))), qap);
  if (small(d)) d = tiny;
  d = ddDiv(DD_ONE, d);
  let h = d;
  for (let m = 1; m <= 100_000; m++) {
    const m2 = 2 * m;
    // aa = m(b − m)x / ((a − 1 + 2m)(a + 2m))
    let aa = ddDiv(ddMul(twoProd(m, b - m), X), ddMul(twoSum(a - 1, m2), twoSum(a, m2)));
    d = ddAdd(DD_ONE, ddMul(aa, d));
    if (small(d)) d = tiny;
    c = ddAdd(DD_ONE, ddDiv(aa, c));
    if (small(c)) c = tiny;
    d = ddDiv(DD_ONE, d);
    h = ddMul(h, ddMul(d, c));
    // aa = −(a + m)(a + b + m)x / ((a + 2m)(a + 1 + 2m))
    aa = ddDiv(
      ddMul(ddMul(twoSum(a, m), ddAdd(qab, ddNum(m))), [-x, 0]),
      ddMul(twoSum(a, m2), ddAdd(qap, ddNum(m2))),
    );
    d = ddAdd(DD_ONE, ddMul(aa, d));
    if (small(d)) d = tiny;
    c = ddAdd(DD_ONE, ddDiv(aa, c));
    if (small(c)) c = tiny;
    d = ddDiv(DD_ONE, d);
    const del = ddMul(d, c);
    h = ddMul(h, del);
    if (Math.abs(del[0] - 1 + del[1]) < 1e-20) break;
  }
  return h[0] + h[1];
}

function continuedFraction(a: number, b: number, x: number, y: number): number {
  return Math.max(a, b) >= 100
    ? betaContinuedFractionDD(a, b, x, y)
    : betaContinuedFraction(a, b, x, y);
}

/**
 * Regularized incomplete beta I_x(a, b) and its complement 1 − I_x(a, b), each computed
 * directly where it is the small one (no cancellation in either tail). y must be 1 − x.
 */
export function incompleteBeta(
  a: number,
  b: number,
  x: number,
  y: number = 1 - x,
): { lower: number; upper: number } {
  if (!(a > 0 && b > 0) || !(x >= 0 && x <= 1)) return { lower: NaN, upper: NaN };
  if (x === 0) return { lower: 0, upper: 1 };
  if (y === 0) return { lower: 1, upper: 0 };
  if (x < (a + 1) / (a + b + 2)) {
    const lower = (Math.exp(logBetaPrefactor(a, b, x, y)) * continuedFraction(a, b, x, y)) / a;
    return { lower, upper: 1 - lower };
  }
  const upper = (Math.exp(logBetaPrefactor(b, a, y, x)) * continuedFraction(b, a, y, x)) / b;
  return { lower: 1 - upper, upper };
}

/** Upper-tail probability P(F > f) for F(df1, df2). */
export function fUpperTail(f: number, df1: number, df2: number): number {
  if (!(f >= 0) || !(df1 > 0) || !(df2 > 0)) return NaN;
  if (f === Infinity) return 0;
  // P(F > f) = I_x(df2/2, df1/2) with x = df2/(df2 + df1·f), 1 − x = df1·f/(df2 + df1·f).
  const den = df2 + df1 * f;
  return incompleteBeta(df2 / 2, df1 / 2, df2 / den, (df1 * f) / den).lower;
}

/** Upper-tail probability P(T > t) for Student's t with df degrees of freedom. */
export function studentTUpperTail(t: number, df: number): number {
  if (Number.isNaN(t) || !(df > 0)) return NaN;
  if (t === Infinity) return 0;
  if (t === -Infinity) return 1;
  const t2 = t * t;
  // P(|T| > |t|) = I_x(df/2, ½) with x = df/(df + t²).
  const tails = incompleteBeta(df / 2, 0.5, df / (df + t2), t2 / (df + t2));
  const half = tails.lower / 2;
  return t >= 0 ? half : 1 - half;
}

/** Two-sided p-value P(|T| > |t|). */
export function studentTTwoSided(t: number, df: number): number {
  if (Number.isNaN(t) || !(df > 0)) return NaN;
  const t2 = t * t;
  if (t2 === Infinity) return 0;
  return incompleteBeta(df / 2, 0.5, df / (df + t2), t2 / (df + t2)).lower;
}

function studentTDensity(t: number, df: number): number {
  return Math.exp(
    -logBeta(df / 2, 0.5) - 0.5 * Math.log(df) - ((df + 1) / 2) * Math.log1p((t * t) / df),
  );
}

/**
 * Student t quantile: jstat's inverse as the start, then Newton steps on the upper tail
 * (for p > ½ the tail 1 − p is the accurate quantity to aim at).
 */
export function studentTQuantile(p: number, df: number): number {
  // Like the studentized range below: the same few (level, df) come again and again.
  const key = `${p}|${df}`;
  let x = tQuantiles.get(key);
  if (x === undefined) {
    x = computeStudentTQuantile(p, df);
    if (tQuantiles.size >= 512) tQuantiles.delete(tQuantiles.keys().next().value!);
    tQuantiles.set(key, x);
  }
  return x;
}

const tQuantiles = new Map<string, number>();

function computeStudentTQuantile(p: number, df: number): number {
  if (!(p > 0 && p < 1) || !(df > 0)) return NaN;
  if (p === 0.5) return 0;
  const upper = p > 0.5;
  const target = upper ? 1 - p : p; // tail beyond |x|
  let x = Math.abs(jStat.studentt.inv(upper ? p : 1 - p, df));
  if (!Number.isFinite(x) || x <= 0) x = 1;
  for (let i = 0; i < 50; i++) {
    const err = studentTUpperTail(x, df) - target;
    const dens = studentTDensity(x, df);
    if (!(dens > 0)) break;
    let step = err / dens;
    // Keep the iterate positive (the tail is monotone, Newton from either side converges).
    if (x + step <= 0) step = -x / 2;
    x += step;
    if (Math.abs(step) <= 4 * EPS * x) break;
  }
  return upper ? x : -x;
}

/**
 * Quantile of the studentized range for k means and df error degrees of freedom. jstat's own
 * inverse gives up ("failed to converge") at some tails and many means; then the quantile is
 * found by bisection on its cdf, and accepted only when that cdf reproduces the upper tail to
 * 0.1 % (otherwise NaN: the tail is beyond what the cdf resolves).
 */
export function studentizedRangeQuantile(p: number, k: number, df: number): number {
  // A trial asks for the same few (level, means, df) again and again, and each costs milliseconds
  // of numerical integration: remember them.
  const key = `${p}|${k}|${df}`;
  let q = rangeQuantiles.get(key);
  if (q === undefined) {
    q = computeStudentizedRangeQuantile(p, k, df);
    if (rangeQuantiles.size >= 512) rangeQuantiles.delete(rangeQuantiles.keys().next().value!);
    rangeQuantiles.set(key, q);
  }
  return q;
}

const rangeQuantiles = new Map<string, number>();

function computeStudentizedRangeQuantile(p: number, k: number, df: number): number {
  // jstat's studentized range has no values below 2 error df.
  if (!(df >= 2)) return NaN;
  try {
    const q = jStat.tukey.inv(p, k, df);
    if (Number.isFinite(q) && q > 0) return q;
  } catch {
    // fall through to bisection
  }
  const cdf = (q: number) => jStat.tukey.cdf(q, k, df);
  let lo = 0;
  let hi = 1;
  while (!(cdf(hi) >= p)) {
    hi *= 2;
    if (hi > 1e6) return NaN;
  }
  for (let i = 0; i < 200 && hi - lo > 1e-12 * hi; i++) {
    const mid = (lo + hi) / 2;
    if (cdf(mid) < p) lo = mid;
    else hi = mid;
  }
  const tail = 1 - cdf(hi);
  return Math.abs(tail - (1 - p)) <= 1e-3 * (1 - p) ? hi : NaN;
}

/** Upper-tail probability of the studentized range (Tukey-adjusted p-values). */
export function studentizedRangeUpperTail(q: number, k: number, df: number): number {
  return 1 - jStat.tukey.cdf(q, k, df);
}
