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
import { compactLetters } from './letters.js';

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
  /** Entries with rank (1 = highest mean) and letters for both tests, highest mean first. */
  ranked: {
    entry: string;
    mean: number;
    n: number;
    rank: number;
    lsdGroup: string;
    hsdGroup: string;
  }[];
  pairs: PairComparison[];
  warnings: string[];
}

/** Competition ranking: tied means share the best rank (1 = highest mean). */
export function rankDescending(values: readonly number[]): number[] {
  const order = values.map((_, i) => i).sort((a, b) => values[b]! - values[a]!);
  const ranks = new Array<number>(values.length);
  order.forEach((idx, pos) => {
    const prev = order[pos - 1];
    ranks[idx] =
      pos > 0 && prev !== undefined && values[prev] === values[idx] ? ranks[prev]! : pos + 1;
  });
  return ranks;
}

/**
 * @param varietyP p-value of the variety F test; LSD is "protected" only when it is < alpha.
 * @param pairSe standard error of the difference between means[i] and means[j] when it is
 *   not √(MS·(1/ni + 1/nj)) (adjusted means of a non-orthogonal layout); the single LSD and
 *   HSD values are then null.
 */
export function separateMeans(
  means: readonly EntryMean[],
  errorMs: number,
  errorDf: number,
  alpha = 0.05,
  varietyP: number | null = null,
  pairSe?: (i: number, j: number) => number,
): MeanSeparation {
  if (!(alpha > 0 && alpha < 1))
    throw new RangeError(`alpha must be between 0 and 1, got ${alpha}`);
  const k = means.length;
  if (k < 2) throw new RangeError('mean separation needs at least two entries');
  if (!(errorDf > 0)) throw new RangeError('no error degrees of freedom for mean separation');
  const warnings: string[] = [];

  const t = studentTQuantile(1 - alpha / 2, errorDf);
  const q = studentizedRangeQuantile(1 - alpha, k, errorDf);
  const n0 = means[0]!.n;
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
  const seOf =
    pairSe ?? ((i: number, j: number) => Math.sqrt(ms * (1 / means[i]!.n + 1 / means[j]!.n)));

  const sepLsd: boolean[][] = Array.from({ length: k }, () => new Array<boolean>(k).fill(false));
  const sepHsd: boolean[][] = Array.from({ length: k }, () => new Array<boolean>(k).fill(false));
  const pairs: PairComparison[] = [];
  for (let i = 0; i < k; i++) {
    for (let j = i + 1; j < k; j++) {
      const a = means[i]!;
      const b = means[j]!;
      const se = seOf(i, j);
      const diff = a.mean - b.mean;
      const d = Math.abs(diff);
      // Threshold form of the tests; a zero error MS separates any unequal means.
      const lsdSep = d > t * se;
      const hsdSep = d > (q * se) / Math.SQRT2;
      sepLsd[i]![j] = sepLsd[j]![i] = lsdSep;
      sepHsd[i]![j] = sepHsd[j]![i] = hsdSep;
      pairs.push({
        a: a.entry,
        b: b.entry,
        difference: diff,
        se,
        lsdSeparated: lsdSep,
        hsdSeparated: hsdSep,
      });
    }
  }

  const order = means.map((_, i) => i).sort((x, y) => means[y]!.mean - means[x]!.mean);
  const lsdLetters = compactLetters(order, (i, j) => sepLsd[i]![j]!);
  const hsdLetters = compactLetters(order, (i, j) => sepHsd[i]![j]!);
  const ranks = rankDescending(means.map((m) => m.mean));
  const ranked = order.map((i) => ({
    entry: means[i]!.entry,
    mean: means[i]!.mean,
    n: means[i]!.n,
    rank: ranks[i]!,
    lsdGroup: lsdLetters[i]!,
    hsdGroup: hsdLetters[i]!,
  }));

  return {
    alpha,
    errorDf,
    errorMs,
    replicates: equal ? n0 : null,
    lsd: { value: lsdValue, df: errorDf, t, protected: isProtected },
    hsd: { value: hsdValue, q },
    ranked,
    pairs,
    warnings,
  };
}
