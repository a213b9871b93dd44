// The sweep for one critical difference (equal replication) against insert-and-absorb (Piepho
// 2004, Journal of Computational and Graphical Statistics 13:456-466) on the same tests: the
// same letters, and given up at exactly the same work limit. Means are generated (fast-check):
// ties, runs of equal gaps, zero and infinite critical differences.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  compactLettersByDifference,
  compactLettersWithin,
} from '../../../server/analysis/engine/letters';

const sortedOrder = (means: readonly number[]) =>
  means.map((_, i) => i).sort((a, b) => means[b]! - means[a]!);

/** The smallest work limit at which the letters are given (the give-up point). */
function smallestLimit(attempt: (limit: number) => string[] | null): number {
  let lo = 0;
  let hi = 1;
  while (attempt(hi) === null) hi *= 2;
  while (lo < hi) {
    const mid = Math.floor((lo + hi) / 2);
    if (attempt(mid) === null) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

const meansArb = fc.array(
  fc.oneof(
    fc.integer({ min: 0, max: 12 }).map((v) => v / 4),
    fc.double({ min: -50, max: 50, noNaN: true }),
  ),
  { minLength: 0, maxLength: 70 },
);
const criticalArb = fc.oneof(
  fc.constantFrom(0, 0.25, 0.5, 1, Infinity),
  fc.double({ min: 0, max: 30, noNaN: true }),
);

describe('compact letters for one critical difference', () => {
  it('gives the letters of insert-and-absorb, and gives up at the same work limit', () => {
    fc.assert(
      fc.property(meansArb, criticalArb, (means, critical) => {
        const order = sortedOrder(means);
        const separated = (i: number, j: number) => Math.abs(means[i]! - means[j]!) > critical;
        expect(compactLettersByDifference(order, means, critical, Infinity)).toEqual(
          compactLettersWithin(order, separated, Infinity),
        );
        const sweepLimit = smallestLimit((l) =>
          compactLettersByDifference(order, means, critical, l),
        );
        expect(sweepLimit).toBe(smallestLimit((l) => compactLettersWithin(order, separated, l)));
      }),
      { numRuns: 400, seed: 20261203 },
    );
  });

  it('an order that does not sort the means from the highest takes insert-and-absorb', () => {
    const means = [3, 1, 2, 0];
    const order = [0, 1, 2, 3];
    const separated = (i: number, j: number) => Math.abs(means[i]! - means[j]!) > 1.5;
    expect(compactLettersByDifference(order, means, 1.5)).toEqual(
      compactLettersWithin(order, separated),
    );
  });

  it('a chain a, ab, bc, c and all-separated means (hand-checked)', () => {
    expect(compactLettersByDifference([0, 1, 2, 3], [4, 3, 2, 1], 1.5)).toEqual([
      'a',
      'ab',
      'bc',
      'c',
    ]);
    expect(compactLettersByDifference([2, 0, 1], [2, 1, 3], 0.5)).toEqual(['b', 'c', 'a']);
  });
});
