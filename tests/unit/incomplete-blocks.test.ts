import { describe, expect, it } from 'vitest';
import {
  blockSizes,
  concurrences,
  efficiencyFactor,
  planIncompleteBlocks,
  summarizeConcurrences,
} from '../../common/incomplete-blocks';
import { gardensPerReplicate, randomizeLayout } from '../../common/layout';
import { createRandom } from '../../common/random';

const ids = (n: number) =>
  Array.from({ length: n }, (_, i) => `E${String(i + 1).padStart(2, '0')}`);

/** Counts of each entry over a list of blocks. */
const replication = (blocks: number[][], v: number) => {
  const r = new Array<number>(v).fill(0);
  for (const b of blocks) for (const e of b) r[e]! += 1;
  return r;
};

describe('resolvable incomplete blocks', () => {
  for (const [v, k, r] of [
    [12, 4, 3],
    [20, 5, 2],
    [30, 6, 4],
  ] as const) {
    it(`${v} entries in blocks of ${k}, ${r} replicates: each replicate holds every entry once`, () => {
      const plan = planIncompleteBlocks(v, k, r, createRandom(7));
      expect(plan.replicates).toHaveLength(r);
      for (const rep of plan.replicates) {
        expect(rep).toHaveLength(v / k);
        for (const block of rep) expect(block).toHaveLength(k);
        expect(rep.flat().sort((a, b) => a - b)).toEqual([...Array(v).keys()]);
      }
      expect(replication(plan.replicates.flat(), v)).toEqual(new Array(v).fill(r));
      // Concurrences counted pair by pair agree with the totals: every entry shares a block
      // with k − 1 others in each replicate, r(k − 1) meetings in all.
      const together = concurrences(plan.replicates.flat(), v);
      for (let a = 0; a < v; a++) {
        let meetings = 0;
        for (let b = 0; b < v; b++) if (b !== a) meetings += together[a * v + b]!;
        expect(meetings).toBe(r * (k - 1));
      }
    });
  }

  it('k not dividing v: blocks of k and k − 1, still every entry once per replicate', () => {
    expect(blockSizes(10, 4)).toEqual([4, 3, 3]);
    expect(blockSizes(13, 4)).toEqual([4, 3, 3, 3]);
    const plan = planIncompleteBlocks(10, 4, 3, createRandom(11));
    for (const rep of plan.replicates) {
      expect(rep.map((b) => b.length).sort()).toEqual([3, 3, 4]);
      expect(rep.flat().sort((a, b) => a - b)).toEqual([...Array(10).keys()]);
    }
  });

  it('concurrences as even as they can be: 12 entries, blocks of 4, 3 replicates meet 0 to 2 times', () => {
    // Arithmetic of the design (no source needed): with only 3 blocks per replicate, a block of
    // 4 in replicate 2 must take two entries from one block of replicate 1, so some pair meets
    // twice; each entry meets 9 of the 11 others' worth of times, so some pairs never meet.
    for (const seed of [1, 2, 3, 4]) {
      const s = summarizeConcurrences(
        planIncompleteBlocks(12, 4, 3, createRandom(seed)).replicates.flat(),
        12,
      );
      expect([s.min, s.max]).toEqual([0, 2]);
      // Pairs: 66 in all, 54 meetings (12 × 9 / 2).
      expect(s.histogram.reduce((a, b) => a + b, 0)).toBe(66);
      expect(s.histogram.reduce((a, n, c) => a + n * c, 0)).toBe(54);
    }
  });

  it('s ≥ k: an alpha (0,1) plan where no pair meets twice (30 entries, blocks of 5, 3 replicates)', () => {
    const s = summarizeConcurrences(
      planIncompleteBlocks(30, 5, 3, createRandom(5)).replicates.flat(),
      30,
    );
    expect([s.min, s.max]).toEqual([0, 1]);
  });

  // Published plans (from memory): the balanced lattices of Cochran & Cox, Experimental Designs
  // (2nd ed. 1957), plans 10.1 (3 × 3, 4 replicates) and 10.2 (4 × 4, 5 replicates). In a
  // balanced lattice every pair of entries shares exactly one block, and its efficiency factor
  // is that of a balanced incomplete-block design, E = v(k − 1)/((v − 1)k) (Yates 1936):
  // 9·2/(8·3) = 0.75 and 16·3/(15·4) = 0.8. The generator should find plans as good.
  for (const [v, k, r, e] of [
    [9, 3, 4, 0.75],
    [16, 4, 5, 0.8],
  ] as const) {
    it(`matches the ${k} × ${k} balanced lattice: every pair meets once, E = ${e}`, () => {
      for (const seed of [1, 2, 3, 20261202]) {
        const blocks = planIncompleteBlocks(v, k, r, createRandom(seed)).replicates.flat();
        const s = summarizeConcurrences(blocks, v);
        expect([s.min, s.max]).toEqual([1, 1]);
        expect(efficiencyFactor(blocks, v)).toBeCloseTo(e, 12);
      }
    });
  }

  it('efficiency factor: 1 for complete blocks, null when unequally replicated or not connected', () => {
    // Complete blocks lose nothing to blocking (E = 1 by definition of the factor).
    expect(
      efficiencyFactor(
        [
          [0, 1, 2],
          [2, 0, 1],
        ],
        3,
      ),
    ).toBeCloseTo(1, 12);
    expect(
      efficiencyFactor(
        [
          [0, 1],
          [0, 2],
        ],
        3,
      ),
    ).toBeNull();
    expect(
      efficiencyFactor(
        [
          [0, 1],
          [2, 3],
          [0, 1],
          [2, 3],
        ],
        4,
      ),
    ).toBeNull();
  });

  it('refuses a block as large as the trial or smaller than two', () => {
    expect(() => planIncompleteBlocks(6, 6, 2, createRandom(1))).toThrow(/from 2 to 5/);
    expect(() => planIncompleteBlocks(6, 1, 2, createRandom(1))).toThrow(/from 2 to 5/);
  });
});

describe('incomplete-block layouts', () => {
  it('one site: blocks numbered across replicates, plot numbers block then position', () => {
    const plots = randomizeLayout({
      design: 'incomplete',
      entryIds: ids(12),
      replicates: 3,
      blockSize: 4,
      siteIds: ['field'],
      seed: 42,
    });
    expect(plots).toHaveLength(36);
    for (let block = 1; block <= 9; block++) {
      const inBlock = plots.filter((p) => p.block === block);
      expect(inBlock).toHaveLength(4);
      expect(new Set(inBlock.map((p) => p.replicate))).toEqual(new Set([Math.ceil(block / 3)]));
      expect(inBlock.map((p) => p.plotNumber)).toEqual([1, 2, 3, 4].map((i) => block * 100 + i));
    }
    for (const rep of [1, 2, 3])
      expect(
        plots
          .filter((p) => p.replicate === rep)
          .map((p) => p.entryId)
          .sort(),
      ).toEqual(ids(12));
    // The stored seed reproduces the plan.
    expect(
      randomizeLayout({
        design: 'incomplete',
        entryIds: ids(12),
        replicates: 3,
        blockSize: 4,
        siteIds: ['field'],
        seed: 42,
      }),
    ).toEqual(plots);
  });

  it('a network: each garden grows k entries, gardens beyond the last full replicate make a partial one', () => {
    const gardens = Array.from({ length: 20 }, (_, i) => `garden-${i + 1}`);
    expect(gardensPerReplicate(12, 4)).toBe(3);
    const plots = randomizeLayout({
      design: 'network',
      entryIds: ids(12),
      replicates: 0,
      blockSize: 4,
      siteIds: gardens,
      seed: 2026,
    });
    expect(plots).toHaveLength(80);
    for (const g of gardens) {
      const mine = plots.filter((p) => p.siteId === g);
      expect(mine).toHaveLength(4);
      expect(new Set(mine.map((p) => p.entryId)).size).toBe(4);
      expect(new Set(mine.map((p) => p.replicate)).size).toBe(1);
    }
    // 6 full replicates of 3 gardens hold every entry once each; 2 more gardens hold 8 entries.
    for (let rep = 1; rep <= 6; rep++)
      expect(
        plots
          .filter((p) => p.replicate === rep)
          .map((p) => p.entryId)
          .sort(),
      ).toEqual(ids(12));
    const extra = plots.filter((p) => p.replicate === 7);
    expect(extra).toHaveLength(8);
    const counts = ids(12).map((e) => plots.filter((p) => p.entryId === e).length);
    expect(counts.filter((c) => c === 7)).toHaveLength(8);
    expect(counts.filter((c) => c === 6)).toHaveLength(4);
  });

  it('a network needs gardens for two replicates; one site only for incomplete blocks', () => {
    const base = { entryIds: ids(12), replicates: 2, blockSize: 4, seed: 1 };
    expect(() =>
      randomizeLayout({ ...base, design: 'network', siteIds: ['a', 'b', 'c', 'd', 'e'] }),
    ).toThrow(/at least 6 \(the trial has 5\)/);
    expect(() => randomizeLayout({ ...base, design: 'incomplete', siteIds: ['a', 'b'] })).toThrow(
      /one site/,
    );
    expect(() =>
      randomizeLayout({ ...base, design: 'incomplete', siteIds: ['a'], replicates: 34 }),
    ).toThrow(/more than 99 blocks/);
  });
});
