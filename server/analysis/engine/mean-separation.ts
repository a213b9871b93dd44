/**
 * Mean separation: Fisher's least significant difference and Tukey's honestly significant
 * difference (Tukey-Kramer when replication is unequal), ranks and letter groups.
 *
 * Both use one error term (mean square and its degrees of freedom): the residual for
 * crd/rcbd, site × variety for multisite. With equal replication m, the single critical
 * differences are LSD = t(1 − α/2, df)·√(2·MS/m) and HSD = q(1 − α; k, df)·√(MS/m). With
 * unequal replication each pair uses its own standard error √(MS·(1/ni + 1/nj)) and the
 * single values are null.
 */
import { studentTQuantile, studentizedRangeQuantile } from './distributions.js';
import { compactLettersByDifference, compactLettersWithin, LETTER_WORK_LIMIT } from './letters.js';
import { rankDescending } from '../../../common/ranking';

export type SeparationMethod = 'lsd' | 'hsd';

export interface EntryMean {
  /** Entry label (variety). */
  entry: string;
  mean: number;
  /** Plots contributing to this mean. */
  n: number;
}

export interface PairComparison {
  a: string;
  b: string;
  difference: number;
  /** √(MS·(1/na + 1/nb)), or the model's SE of the difference of adjusted means. */
  se: number;
  lsdSeparated: boolean;
  hsdSeparated: boolean;
}

export interface MeanSeparation {
  alpha: number;
  errorDf: number;
  errorMs: number;
  /** Plots per entry when equal, otherwise null. */
  replicates: number | null;
  lsd: { value: number | null; df: number; t: number; protected: boolean };
  hsd: { value: number | null; q: number };
  /**
   * Why the letters are empty, when the letter display would have taken more than its work
   * limit (many entries with many separations); null when they were computed.
   */
  lettersOmitted: string | null;
  /** Entries with rank (1 = highest mean) and letters for both tests, highest mean first. */
  ranked: {
    /** Position of this entry in the `means` given. */
    index: number;
    entry: string;
    mean: number;
    n: number;
    rank: number;
    lsdGroup: string;
    hsdGroup: string;
  }[];
  /** Every pair, only when asked for (their number grows with the square of the entries). */
  pairs?: PairComparison[];
  warnings: string[];
}

export interface SeparationOptions {
  /**
   * Standard error of the difference between means[i] and means[j] when it is not
   * √(MS·(1/ni + 1/nj)) (adjusted means of a non-orthogonal layout); the single LSD and HSD
   * values are then null.
   */
  pairSe?: (i: number, j: number) => number;
  /** List every pairwise comparison in the result. */
  includePairs?: boolean;
  /** Work limit for each letter display (see compactLettersWithin). */
  letterWorkLimit?: number;
}

/**
 * @param varietyP p-value of the variety F test; LSD is "protected" only when it is < alpha.
 */
export function separateMeans(
  means: readonly EntryMean[],
  errorMs: number,
  errorDf: number,
  alpha = 0.05,
  varietyP: number | null = null,
  options: SeparationOptions = {},
): MeanSeparation {
  if (!(alpha > 0 && alpha < 1))
    throw new RangeError(`alpha must be between 0 and 1, got ${alpha}`);
  const k = means.length;
  if (k < 2) throw new RangeError('mean separation needs at least two entries');
  if (!(errorDf > 0)) throw new RangeError('no error degrees of freedom for mean separation');
  const warnings: string[] = [];

  const t = studentTQuantile(1 - alpha / 2, errorDf);
  const q = studentizedRangeQuantile(1 - alpha, k, errorDf);
  // With one error df the distribution functions give no value at all (HSD stays empty, as
  // before); with more, a missing value means the alpha is beyond what they resolve.
  if (!Number.isFinite(q) && errorDf >= 2)
    throw new RangeError(
      `the HSD critical value cannot be computed at alpha = ${alpha} for ${k} entries and ${errorDf} error degrees of freedom; choose an alpha between 0.001 and 0.2`,
    );
  const n0 = means[0]!.n;
  const pairSe = options.pairSe;
  const equal = !pairSe && means.every((m) => m.n === n0);
  const ms = Math.max(errorMs, 0);
  const lsdValue = equal ? t * Math.sqrt((2 * ms) / n0) : null;
  const hsdValue = equal ? q * Math.sqrt(ms / n0) : null;
  const isProtected = varietyP !== null && varietyP < alpha;
  if (!isProtected) {
    warnings.push(
      `LSD not protected: the variety F test is not significant at alpha = ${alpha}` +
        (varietyP === null ? ' (no F test available)' : ` (p = ${varietyP.toPrecision(3)})`),
    );
  }
  if (!equal) warnings.push('unequal replication: LSD and HSD vary by pair (Tukey-Kramer for HSD)');
  // Equal replication: one standard error for every pair, so each test is one threshold.
  const seEqual = Math.sqrt(ms * (1 / n0 + 1 / n0));
  const m = Float64Array.from(means, (e) => e.mean);
  const se =
    pairSe ??
    (equal
      ? () => seEqual
      : (i: number, j: number) => Math.sqrt(ms * (1 / means[i]!.n + 1 / means[j]!.n)));

  // Pairs are tested when asked, never stored as a k × k table: memory stays linear in k.
  // Threshold form of the tests; a zero error MS separates any unequal means.
  const lsdAt = t * seEqual;
  const hsdAt = (q * seEqual) / Math.SQRT2;
  const lsdSeparated = equal
    ? (i: number, j: number) => Math.abs(m[i]! - m[j]!) > lsdAt
    : (i: number, j: number) => Math.abs(m[i]! - m[j]!) > t * se(i, j);
  const hsdSeparated = equal
    ? (i: number, j: number) => Math.abs(m[i]! - m[j]!) > hsdAt
    : (i: number, j: number) => Math.abs(m[i]! - m[j]!) > (q * se(i, j)) / Math.SQRT2;

  let pairs: PairComparison[] | undefined;
  if (options.includePairs) {
    pairs = [];
    for (let i = 0; i < k; i++) {
      for (let j = i + 1; j < k; j++) {
        pairs.push({
          a: means[i]!.entry,
          b: means[j]!.entry,
          difference: means[i]!.mean - means[j]!.mean,
          se: se(i, j),
          lsdSeparated: lsdSeparated(i, j),
          hsdSeparated: hsdSeparated(i, j),
        });
      }
    }
  }

  const order = means.map((_, i) => i).sort((x, y) => means[y]!.mean - means[x]!.mean);
  const workLimit = options.letterWorkLimit ?? LETTER_WORK_LIMIT;
  // Equal replication: each test is one critical difference, and a sweep down the sorted
  // means gives the letters (the same as insert-and-absorb, in time linear in the entries).
  const letters = (separated: typeof lsdSeparated, critical: number) =>
    equal
      ? compactLettersByDifference(order, m, critical, workLimit)
      : compactLettersWithin(order, separated, workLimit);
  const lsdLetters = letters(lsdSeparated, lsdAt);
  const hsdLetters = lsdLetters && letters(hsdSeparated, hsdAt);
  const lettersOmitted =
    lsdLetters && hsdLetters
      ? null
      : `letters not computed: with ${k} entries the letter display needs more work than its limit; the means, ranks and critical differences stand`;
  if (lettersOmitted) warnings.push(lettersOmitted);
  const ranks = rankDescending(means.map((m) => m.mean));
  const ranked = order.map((i) => ({
    index: i,
    entry: means[i]!.entry,
    mean: means[i]!.mean,
    n: means[i]!.n,
    rank: ranks[i]!,
    lsdGroup: lsdLetters && hsdLetters ? lsdLetters[i]! : '',
    hsdGroup: lsdLetters && hsdLetters ? hsdLetters[i]! : '',
  }));

  return {
    alpha,
    errorDf,
    errorMs,
    replicates: equal ? n0 : null,
    lsd: { value: lsdValue, df: errorDf, t, protected: isProtected },
    hsd: { value: hsdValue, q },
    lettersOmitted,
    ranked,
    ...(pairs ? { pairs } : {}),
    warnings,
  };
}
