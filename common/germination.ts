/**
 * Germination as a percentage with its 95 % Wilson score interval (Wilson 1927), the interval
 * that stays inside 0–100 % and keeps close to its stated coverage for small tests and rates
 * near 0 or 100 %, where the plain ± 1.96·SE interval fails.
 */

/** The standard normal quantile for a two-sided 95 % interval, qnorm(0.975). */
const Z_95 = 1.959963984540054;

export interface GerminationRate {
  /** Seeds germinated ÷ seeds tested, as a percentage. */
  percent: number;
  lowerPercent: number;
  upperPercent: number;
}

export function wilsonInterval(
  successes: number,
  trials: number,
  z = Z_95,
): { lower: number; upper: number } {
  if (!Number.isInteger(trials) || trials <= 0)
    throw new RangeError('trials must be a whole number above 0');
  if (!Number.isInteger(successes) || successes < 0 || successes > trials) {
    throw new RangeError('successes must be a whole number from 0 to trials');
  }
  const p = successes / trials;
  const z2 = z * z;
  const denominator = 1 + z2 / trials;
  const centre = (p + z2 / (2 * trials)) / denominator;
  const half = (z * Math.sqrt((p * (1 - p)) / trials + z2 / (4 * trials * trials))) / denominator;
  // At 0 and n the bound is exactly 0 or 1; the formula leaves rounding dust there.
  return {
    lower: successes === 0 ? 0 : Math.max(0, centre - half),
    upper: successes === trials ? 1 : Math.min(1, centre + half),
  };
}

export function germinationRate(germinated: number, tested: number): GerminationRate {
  const { lower, upper } = wilsonInterval(germinated, tested);
  return {
    percent: (100 * germinated) / tested,
    lowerPercent: 100 * lower,
    upperPercent: 100 * upper,
  };
}
