/**
 * Ranks within a trait, in the trait's own direction: 1 = best, so for a "lower is better"
 * trait (plant height, spines, disease) rank 1 is the smallest mean. A trait with no preferred
 * direction has no ranks at all. Every output (analysis, results sheet, PDF, CSV, comparison)
 * ranks through here, so they cannot disagree. Pure.
 */
import type { traitDirections } from './contracts/trials';

export type TraitDirection = (typeof traitDirections)[number];

/** Competition ranking from the highest value: tied values share the best rank (1, 1, 3). */
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

/** +1 when higher is better, −1 when lower is better, 0 with no preference. */
export const directionSign = (direction: TraitDirection): 1 | -1 | 0 =>
  direction === 'higher' ? 1 : direction === 'lower' ? -1 : 0;

/** Rank per value, 1 = best in `direction`; null for every value when there is no direction. */
export function rankByDirection(
  values: readonly number[],
  direction: TraitDirection,
): (number | null)[] {
  const sign = directionSign(direction);
  if (sign === 0) return values.map(() => null);
  return rankDescending(values.map((v) => sign * v));
}

/**
 * Entry means with their rank, best first. With no preferred direction the order is by mean,
 * highest first, and no entry is called best. Ties keep their incoming order.
 */
export function rankMeans<T extends { mean: number; adjustedMean?: number }>(
  means: readonly T[],
  direction: TraitDirection,
): (Omit<T, 'rank'> & { rank: number | null })[] {
  // Where the layout was unbalanced the adjusted (least-squares) mean is the one ranked.
  const rankedOn = means.map((m) => m.adjustedMean ?? m.mean);
  const ranks = rankByDirection(rankedOn, direction);
  const sign = directionSign(direction) || 1;
  return means
    .map((_, i) => i)
    .sort((a, b) => sign * (rankedOn[b]! - rankedOn[a]!) || a - b)
    .map((i) => {
      // A copy, then the rank set on it: the same object as `{ ...m, rank }`, which V8 makes
      // far more slowly (an object spread followed by a new key).
      const ranked = Object.assign({}, means[i]!) as unknown as Omit<T, 'rank'> & {
        rank: number | null;
      };
      ranked.rank = ranks[i]!;
      return ranked;
    });
}

/** How a reader is told which end is better. */
export const directionWords: Record<TraitDirection, string> = {
  higher: 'higher is better',
  lower: 'lower is better',
  none: 'no preferred direction (not ranked)',
};
