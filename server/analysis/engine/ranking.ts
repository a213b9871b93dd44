/**
 * Ranking entries across traits: a weighted index of standardised entry means and a
 * rank-sum alternative, with each trait's contribution per entry.
 */
import {
  directionSign,
  rankByDirection,
  rankDescending,
  type TraitDirection,
} from '../../../common/ranking';

export type { TraitDirection };

export interface TraitEntryMeans {
  trait: string;
  /** Which way is better; "none" traits are reported but do not count. */
  direction: TraitDirection;
  /** Weight set by the trial lead (≥ 0). */
  weight: number;
  /** Entry mean per entry. */
  means: Readonly<Record<string, number>>;
}

export interface TraitContribution {
  trait: string;
  mean: number;
  /** (mean − mean over entries) / SD over entries. */
  z: number;
  /** Share of the index: weight × sign × z / Σ weights (0 for "none"). */
  contribution: number;
  /** Rank within the trait, 1 = best in its direction (null for "none"). */
  rank: number | null;
}

export interface EntryRanking {
  entry: string;
  /** Weighted mean of signed z-scores (on the z scale; higher is better). */
  index: number;
  indexRank: number;
  /** Sum of per-trait ranks over directional traits (lower is better). */
  rankSum: number;
  rankSumRank: number;
  contributions: TraitContribution[];
}

export interface CrossTraitRanking {
  entries: EntryRanking[];
  traits: { trait: string; direction: TraitDirection; weight: number; mean: number; sd: number }[];
}

/** Rank entries across traits. Every directional trait needs a mean for every entry. */
export function rankAcrossTraits(
  traits: readonly TraitEntryMeans[],
  entries?: readonly string[],
): CrossTraitRanking {
  const names = entries ? [...entries] : [...new Set(traits.flatMap((t) => Object.keys(t.means)))];
  if (names.length === 0) throw new RangeError('no entries to rank');
  const counted = traits.filter((t) => t.direction !== 'none');
  for (const t of traits) {
    if (!(t.weight >= 0)) throw new RangeError(`trait "${t.trait}": weight must be zero or more`);
  }
  const weightSum = counted.reduce((s, t) => s + t.weight, 0);
  if (counted.length > 0 && !(weightSum > 0))
    throw new RangeError('the weights of the ranked traits add up to zero');

  const traitStats = traits.map((t) => {
    const values = names.map((n) => {
      const v = t.means[n];
      if (v === undefined || !Number.isFinite(v))
        throw new RangeError(`trait "${t.trait}": no mean for entry "${n}"`);
      return v;
    });
    const mean = values.reduce((s, v) => s + v, 0) / values.length;
    const sd =
      values.length > 1
        ? Math.sqrt(values.reduce((s, v) => s + (v - mean) ** 2, 0) / (values.length - 1))
        : 0;
    const sign = directionSign(t.direction);
    const ranks = rankByDirection(values, t.direction);
    return { t, values, mean, sd, sign, ranks };
  });

  const rows = names.map((entry, i) => {
    const contributions = traitStats.map(({ t, values, mean, sd, sign, ranks }) => {
      const z = sd > 0 ? (values[i]! - mean) / sd : 0;
      return {
        trait: t.trait,
        mean: values[i]!,
        z,
        contribution: sign === 0 || weightSum === 0 ? 0 : (t.weight * sign * z) / weightSum,
        rank: ranks[i]!,
      };
    });
    return {
      entry,
      index: contributions.reduce((s, c) => s + c.contribution, 0),
      rankSum: contributions.reduce((s, c) => s + (c.rank ?? 0), 0),
      contributions,
    };
  });
  const indexRanks = rankDescending(rows.map((r) => r.index));
  const rankSumRanks = rankDescending(rows.map((r) => -r.rankSum));
  const ranked: EntryRanking[] = rows
    .map((r, i) => ({ ...r, indexRank: indexRanks[i]!, rankSumRank: rankSumRanks[i]! }))
    .sort((a, b) => a.indexRank - b.indexRank || a.entry.localeCompare(b.entry));
  return {
    entries: ranked,
    traits: traitStats.map(({ t, mean, sd }) => ({
      trait: t.trait,
      direction: t.direction,
      weight: t.weight,
      mean,
      sd,
    })),
  };
}
