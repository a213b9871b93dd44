/**
 * Compact letter display by insert-and-absorb (Piepho 2004, Journal of Computational and
 * Graphical Statistics 13:456-466): start with one group holding every entry; for each pair
 * the test separates, split every group holding both into one without each member of the
 * pair; drop any group contained in another. Afterwards two entries share a letter exactly
 * when the test does not separate them. Letters are assigned in order of the best mean in
 * each group, so the highest mean gets "a".
 */

/**
 * @param order entry indices sorted from highest mean to lowest
 * @param separated separated(i, j) is true when the test finds entries i and j different
 * @returns letter string per entry index (length = order.length)
 */
export function compactLetters(
  order: readonly number[],
  separated: (i: number, j: number) => boolean,
): string[] {
  return compactLettersWithin(order, separated, Infinity)!;
}

/**
 * The work of insert-and-absorb (group-set words compared) that letters may take; the number
 * of groups can grow far faster than the number of entries, so a display is given up rather
 * than let it run without end. About a second of work on one core (common practice, no source:
 * measured here, not a published figure).
 */
export const LETTER_WORK_LIMIT = 200_000_000;

/**
 * Compact letters, or null when they would take more than `workLimit` units of work (one unit
 * = one 32-entry word of a group compared or copied). Memory stays within the groups kept:
 * nothing here holds a value per pair of entries.
 */
export function compactLettersWithin(
  order: readonly number[],
  separated: (i: number, j: number) => boolean,
  workLimit: number = LETTER_WORK_LIMIT,
): string[] | null {
  const k = order.length;
  // Work is counted in 32-entry words, whatever the storage below.
  const words32 = Math.ceil(k / 32) || 1;
  // Groups as bit sets over positions in `order` (position 0 = highest mean), stored in plain
  // arrays of 30-bit words so every word stays a small integer (cheap to copy and collect).
  const words = Math.ceil(k / BITS) || 1;
  const wordOf = new Int32Array(k);
  const bitOf = new Int32Array(k);
  for (let p = 0; p < k; p++) {
    wordOf[p] = (p / BITS) | 0;
    bitOf[p] = 1 << (p % BITS);
  }
  let groups: number[][] = [];
  if (k > 0) {
    const all = new Array<number>(words).fill(0);
    for (let p = 0; p < k; p++) all[wordOf[p]!]! |= bitOf[p]!;
    groups.push(all);
  }
  const subset = (a: number[], b: number[]) => {
    for (let w = 0; w < words; w++) if ((a[w]! & ~b[w]!) !== 0) return false;
    return true;
  };

  // Entries are taken one at a time, with all the pairs they are separated from further down
  // the order. Every group holding entry p and one or more of those entries T splits into
  // (group without p) and (group without T), and only groups contained in no other are kept:
  // the same groups pair-by-pair insert-and-absorb reaches (the maximal sets of entries no
  // pair of which is separated), with one split per group and entry instead of one per pair.
  let work = 0;
  const separatedFromP = new Array<number>(words);
  const fresh: number[][] = [];
  for (let p = 0; p < k; p++) {
    const wp = wordOf[p]!;
    const bp = bitOf[p]!;
    separatedFromP.fill(0);
    let any = false;
    for (let q = p + 1; q < k; q++) {
      // Testing a pair is a unit of work too, so the limit bounds the time as well.
      if (++work > workLimit) return null;
      if (separated(order[p]!, order[q]!)) {
        separatedFromP[wordOf[q]!]! |= bitOf[q]!;
        any = true;
      }
    }
    if (!any) continue;
    // Each split scans every group; each absorption check compares against every kept one.
    work += groups.length * words32;
    if (work > workLimit) return null;
    fresh.length = 0;
    let kept = 0;
    for (let g = 0; g < groups.length; g++) {
      const group = groups[g]!;
      let meets = false;
      if ((group[wp]! & bp) !== 0)
        for (let w = 0; w < words && !meets; w++) meets = (group[w]! & separatedFromP[w]!) !== 0;
      if (meets) {
        const withoutT = group.slice();
        for (let w = 0; w < words; w++) withoutT[w] = withoutT[w]! & ~separatedFromP[w]!;
        group[wp] = group[wp]! & ~bp;
        fresh.push(group, withoutT);
      } else groups[kept++] = group;
    }
    if (fresh.length === 0) continue;
    groups.length = kept;
    // Absorb: an untouched group can never lie inside a new one (it was not inside the
    // group that was split), so only new groups need checking, against everything kept
    // (one copy of equal new groups stays).
    work += fresh.length * (kept + fresh.length) * words32;
    if (work > workLimit) return null;
    for (let a = 0; a < fresh.length; a++) {
      const g = fresh[a]!;
      let absorbed = false;
      for (let h = 0; h < groups.length && !absorbed; h++) absorbed = subset(g, groups[h]!);
      for (let b = a + 1; b < fresh.length && !absorbed; b++) absorbed = subset(g, fresh[b]!);
      if (!absorbed) groups.push(g);
    }
  }

  // Letter order: by the best (lowest-position) member, then by the next members.
  const has = (g: number[], p: number) => ((g[wordOf[p]!]! & bitOf[p]!) !== 0 ? 1 : 0);
  const firstMember = new Map<number[], number>();
  for (const g of groups) {
    let p = 0;
    while (p < k && !has(g, p)) p++;
    firstMember.set(g, p);
  }
  groups = groups.slice().sort((a, b) => {
    for (let p = Math.min(firstMember.get(a)!, firstMember.get(b)!); p < k; p++) {
      const d = has(b, p) - has(a, p);
      if (d !== 0) return d;
    }
    return 0;
  });
  const out: string[] = new Array<string>(k).fill('');
  groups.forEach((g, idx) => {
    const letter = letterName(idx);
    for (let p = 0; p < k; p++) if (has(g, p)) out[order[p]!] += letter;
  });
  return out;
}

/**
 * The same letters as compactLettersWithin(order, separated, workLimit) when the test is one
 * critical difference: separated(i, j) ⇔ |means[i] − means[j]| > critical (equal replication).
 * Along means sorted from the highest, the entries an entry is separated from further down are
 * then a tail of the order that starts no earlier than the previous entry's, so one sweep finds
 * every group (each a run of the order: the maximal sets with no separated pair) and the work
 * insert-and-absorb would have counted, so the display is given up at the very same point.
 * Falls back to insert-and-absorb when `order` does not sort the means from the highest or a
 * mean is not finite.
 */
export function compactLettersByDifference(
  order: readonly number[],
  means: ArrayLike<number>,
  critical: number,
  workLimit: number = LETTER_WORK_LIMIT,
): string[] | null {
  const k = order.length;
  const separated = (i: number, j: number) => Math.abs(means[i]! - means[j]!) > critical;
  for (let p = 0; p < k; p++) {
    const here = means[order[p]!]!;
    if (!Number.isFinite(here) || (p > 0 && !(means[order[p - 1]!]! >= here)))
      return compactLettersWithin(order, separated, workLimit);
  }
  const words32 = Math.ceil(k / 32) || 1;
  // Insert-and-absorb tests every pair once.
  let work = (k * (k - 1)) / 2;
  if (work > workLimit) return null;
  // Entry p (a position in `order`) is separated from positions firstApart[p] … k − 1. Before
  // entry p is taken the groups are the runs [a, firstApart[a] − 1] of the entries a < p that
  // start a new tail, and [p, k − 1]: only that last one splits, into [p + 1, k − 1] and
  // [p, firstApart[p] − 1], the latter absorbed when entry p − 1 has the same tail.
  const starts: number[] = [];
  const ends: number[] = [];
  let groups = 1;
  let q = 1;
  let last = k;
  for (let p = 0; p < k; p++) {
    if (q <= p) q = p + 1;
    while (q < k && !separated(order[p]!, order[q]!)) q++;
    if (q === k) {
      // No entry from here on is separated from any further down: the rest is one group.
      starts.push(p);
      ends.push(k - 1);
      break;
    }
    // One scan over the groups to split, then the two new ones checked against all kept.
    work += groups * words32 + 2 * (groups + 1) * words32;
    if (work > workLimit) return null;
    if (q !== last) {
      starts.push(p);
      ends.push(q - 1);
      groups++;
    }
    last = q;
  }
  const out: string[] = new Array<string>(k).fill('');
  for (let g = 0; g < starts.length; g++) {
    const letter = letterName(g);
    for (let p = starts[g]!; p <= ends[g]!; p++) out[order[p]!] += letter;
  }
  return out;
}

/** Entries per storage word of a group's bit set (below 31, so words stay small integers). */
const BITS = 30;

/**
 * a … z, then A … Z; beyond 52 groups a bracketed number, so every letter stays one
 * readable unit in the concatenated display.
 */
export function letterName(index: number): string {
  if (index < 26) return String.fromCharCode(97 + index);
  if (index < 52) return String.fromCharCode(65 + index - 26);
  return `[${index + 1}]`;
}

/** Split a letter display back into its letters (inverse of the concatenation above). */
export function splitLetters(display: string): string[] {
  return display.match(/\[\d+\]|[a-zA-Z]/g) ?? [];
}
