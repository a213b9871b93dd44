/** Descriptive statistics per entry, computed in two passes for accuracy. */
import { accurateMean } from './linear-model.js';

export interface Descriptives {
  n: number;
  mean: number;
  /** Sample standard deviation (n − 1 divisor); null for a single value. */
  sd: number | null;
  /** Standard error of the mean, SD/√n (descriptive, from this entry's own values). */
  se: number | null;
  /** 100 × SD / mean; null when the mean is 0 or SD is undefined. */
  cvPercent: number | null;
  min: number;
  max: number;
}

/**
 * Descriptives of one sample. `offset` is added back to mean, min and max when the values
 * are deviations from a common offset (SD is shift-invariant, CV uses the shifted mean).
 */
export function describe(values: ArrayLike<number>, offset = 0): Descriptives {
  const n = values.length;
  if (n === 0) throw new RangeError('no values to describe');
  const m = accurateMean(values);
  let ss = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = values[i]!;
    ss += (v - m) ** 2;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  const sd = n > 1 ? Math.sqrt(ss / (n - 1)) : null;
  const mean = m + offset;
  return {
    n,
    mean,
    sd,
    se: sd === null ? null : sd / Math.sqrt(n),
    cvPercent: sd === null || mean === 0 ? null : (100 * sd) / Math.abs(mean),
    min: min + offset,
    max: max + offset,
  };
}
