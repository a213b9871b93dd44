import jStatDefault from 'jstat';
import { describe, expect, it } from 'vitest';
import { randomizeLayout } from '../../common/layout';

// The package ships no types for this part; the shape is jStat's documented chisquare API.
const jStat = jStatDefault as unknown as { chisquare: { cdf(x: number, df: number): number } };

const entries = ['VL', 'ML', 'CD', 'SR'];
const levels = ['none', 'pre-plant', 'side-dress'];
const layout = (arrangement: 'factorial' | 'split_plot', seed: number, replicates = 3) =>
  randomizeLayout({
    design: 'rcbd',
    entryIds: entries,
    replicates,
    siteIds: ['north'],
    seed,
    factor: { levels, arrangement },
  });
const cellsOf = (plots: { treatment: string | null; entryId: string }[]) =>
  plots.map((p) => `${p.treatment}/${p.entryId}`).sort();
const allCells = levels.flatMap((t) => entries.map((e) => `${t}/${e}`)).sort();

describe('factorial in complete blocks: 3 treatments × 4 entries × 3 blocks', () => {
  const plots = layout('factorial', 20260601);

  it('puts every treatment × entry plot exactly once in each block', () => {
    expect(plots).toHaveLength(36);
    for (const block of [1, 2, 3])
      expect(cellsOf(plots.filter((p) => p.block === block))).toEqual(allCells);
    expect(plots.every((p) => p.mainPlot === null)).toBe(true);
  });

  it('numbers plots block then position, 101 … 112, 201 …', () => {
    for (const p of plots) expect(p.plotNumber).toBe(p.block * 100 + p.position);
    expect(plots.filter((p) => p.block === 2).map((p) => p.position)).toEqual(
      Array.from({ length: 12 }, (_, i) => i + 1),
    );
  });

  it('mixes treatments along the block rather than keeping them together', () => {
    // 12 plots in one random order: the treatments of neighbouring plots change somewhere.
    const order = plots.filter((p) => p.block === 1).map((p) => p.treatment);
    const runs = order.filter((t, i) => i === 0 || t !== order[i - 1]).length;
    expect(runs).toBeGreaterThan(levels.length);
  });

  it('is reproducible from the seed', () => {
    expect(layout('factorial', 20260601)).toEqual(plots);
    expect(layout('factorial', 5).map((p) => p.entryId)).not.toEqual(plots.map((p) => p.entryId));
  });
});

describe('split plot: treatments on main plots, entries on subplots', () => {
  const plots = layout('split_plot', 20260601);

  it('gives each block one main plot per treatment, holding every entry once, side by side', () => {
    expect(plots).toHaveLength(36);
    for (const block of [1, 2, 3]) {
      const inBlock = plots.filter((p) => p.block === block);
      expect(cellsOf(inBlock)).toEqual(allCells);
      for (const m of [1, 2, 3]) {
        const main = inBlock.filter((p) => p.mainPlot === m);
        // one treatment on the whole main plot, every entry once on its subplots
        expect(new Set(main.map((p) => p.treatment)).size).toBe(1);
        expect(main.map((p) => p.entryId).sort()).toEqual([...entries].sort());
        // subplots of a main plot are neighbours along the block
        expect(main.map((p) => p.position)).toEqual([1, 2, 3, 4].map((i) => (m - 1) * 4 + i));
      }
    }
  });

  it('is reproducible from the seed', () => {
    expect(layout('split_plot', 20260601)).toEqual(plots);
  });

  // Uniformity: Pearson's chi-square goodness-of-fit test (NIST/SEMATECH e-Handbook of
  // Statistical Methods, 1.3.5.15), as for the one-factor layouts.
  it('randomizes treatments to main plots within blocks: each treatment first equally often', () => {
    const n = 3000;
    const first = levels.map(() => 0);
    for (let seed = 1; seed <= n; seed++) {
      const p = layout('split_plot', seed, 1).find((q) => q.mainPlot === 1)!;
      first[levels.indexOf(p.treatment!)]!++;
    }
    const expected = n / levels.length;
    const chi2 = first.reduce((s, o) => s + (o - expected) ** 2 / expected, 0);
    expect(1 - jStat.chisquare.cdf(chi2, levels.length - 1)).toBeGreaterThan(0.001);
  });

  it('randomizes entries to subplots afresh within every main plot', () => {
    const n = 3000;
    // counts[entry][subplot] over the second main plot of block 1
    const counts = entries.map(() => entries.map(() => 0));
    let sameAsFirst = 0;
    for (let seed = 1; seed <= n; seed++) {
      const plots1 = layout('split_plot', seed, 1);
      const main1 = plots1.filter((p) => p.mainPlot === 1).map((p) => p.entryId);
      const main2 = plots1.filter((p) => p.mainPlot === 2).map((p) => p.entryId);
      main2.forEach((e, i) => counts[entries.indexOf(e)]![i]!++);
      if (main1.join() === main2.join()) sameAsFirst++;
    }
    const expected = n / entries.length;
    const chi2 = counts.flat().reduce((s, o) => s + (o - expected) ** 2 / expected, 0);
    expect(1 - jStat.chisquare.cdf(chi2, (entries.length - 1) ** 2)).toBeGreaterThan(0.001);
    // independent orders agree 1 time in 4! = 24; a shared order would agree every time
    expect(sameAsFirst / n).toBeLessThan(0.1);
  });
});

describe('refusals', () => {
  it('needs complete blocks, two levels and distinct level names', () => {
    const base = { entryIds: entries, replicates: 2, siteIds: ['s'], seed: 1 };
    expect(() =>
      randomizeLayout({ ...base, design: 'crd', factor: { levels, arrangement: 'factorial' } }),
    ).toThrow('complete blocks');
    expect(() =>
      randomizeLayout({
        ...base,
        design: 'rcbd',
        factor: { levels: ['none'], arrangement: 'split_plot' },
      }),
    ).toThrow('two levels');
    expect(() =>
      randomizeLayout({
        ...base,
        design: 'rcbd',
        factor: { levels: ['none', 'none'], arrangement: 'split_plot' },
      }),
    ).toThrow('own name');
  });

  it('leaves one-factor plans as they were (no treatment)', () => {
    const plan = randomizeLayout({
      design: 'rcbd',
      entryIds: entries,
      replicates: 2,
      siteIds: ['s'],
      seed: 3,
    });
    expect(plan.every((p) => p.treatment === null && p.mainPlot === null)).toBe(true);
  });
});
