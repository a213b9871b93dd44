import jStatDefault from 'jstat';
import { describe, expect, it } from 'vitest';
import {
  fitToPage,
  layoutProblem,
  LayoutRefused,
  mapGeometry,
  paperSizes,
  randomizeLayout,
} from '../../common/layout';
import { MM_PER_INCH } from '../../common/units';

// The package ships no types for this part; the shape is jStat's documented chisquare API.
const jStat = jStatDefault as unknown as {
  chisquare: { cdf(x: number, df: number): number; inv(p: number, df: number): number };
};

const entries = ['VL', 'ML', 'CD', 'SR', 'PB'];

describe('randomized complete blocks: 5 entries × 3 blocks', () => {
  const plots = randomizeLayout({
    design: 'rcbd',
    entryIds: entries,
    replicates: 3,
    siteIds: ['north'],
    seed: 20260504,
  });

  it('puts each entry exactly once in every block', () => {
    expect(plots).toHaveLength(15);
    for (const block of [1, 2, 3]) {
      const inBlock = plots.filter((p) => p.block === block).map((p) => p.entryId);
      expect([...inBlock].sort()).toEqual([...entries].sort());
    }
  });

  it('numbers plots field style: block digit then position (101 … 105, 201 …)', () => {
    expect(plots.map((p) => p.plotNumber)).toEqual([
      101, 102, 103, 104, 105, 201, 202, 203, 204, 205, 301, 302, 303, 304, 305,
    ]);
    for (const p of plots) expect(p.plotNumber).toBe(p.block * 100 + p.position);
  });

  it('gives the same layout for the same seed, and another for another seed', () => {
    const again = randomizeLayout({
      design: 'rcbd',
      entryIds: entries,
      replicates: 3,
      siteIds: ['north'],
      seed: 20260504,
    });
    expect(again).toEqual(plots);
    const other = randomizeLayout({
      design: 'rcbd',
      entryIds: entries,
      replicates: 3,
      siteIds: ['north'],
      seed: 7,
    });
    expect(other.map((p) => p.entryId)).not.toEqual(plots.map((p) => p.entryId));
  });
});

describe('blocks at several sites', () => {
  it('lays out entries × blocks plots at every site, each block complete', () => {
    const sites = ['a', 'b', 'c'];
    const plots = randomizeLayout({
      design: 'multisite',
      entryIds: entries,
      replicates: 4,
      siteIds: sites,
      seed: 99,
    });
    for (const site of sites) {
      const here = plots.filter((p) => p.siteId === site);
      expect(here).toHaveLength(entries.length * 4);
      for (let block = 1; block <= 4; block++)
        expect(
          here
            .filter((p) => p.block === block)
            .map((p) => p.entryId)
            .sort(),
        ).toEqual([...entries].sort());
    }
    // each site gets its own randomization
    const orderAt = (s: string) =>
      plots
        .filter((p) => p.siteId === s)
        .map((p) => p.entryId)
        .join();
    expect(new Set(sites.map(orderAt)).size).toBeGreaterThan(1);
  });
});

describe('completely randomized', () => {
  it('plants every entry `replicates` times in one numbered run', () => {
    const plots = randomizeLayout({
      design: 'crd',
      entryIds: entries,
      replicates: 4,
      siteIds: ['only'],
      seed: 3,
    });
    expect(plots).toHaveLength(20);
    for (const e of entries) expect(plots.filter((p) => p.entryId === e)).toHaveLength(4);
    expect(plots.map((p) => p.plotNumber)).toEqual(Array.from({ length: 20 }, (_, i) => 101 + i));
  });

  it('refuses designs it cannot lay out', () => {
    const base = { entryIds: entries, replicates: 2, seed: 1 };
    expect(() => randomizeLayout({ ...base, design: 'rcbd', siteIds: ['a', 'b'] })).toThrow(
      /lays out one site/,
    );
    expect(() =>
      randomizeLayout({ ...base, design: 'rcbd', siteIds: ['a'], entryIds: ['x'] }),
    ).toThrow(/two entries/);
  });

  // The product's own rules (no outside source): one check of the layout's arguments names the
  // field of the layout form the lead can change, or none when the trial itself must change.
  it('names the form field a refusal is about', () => {
    const base = { entryIds: entries, replicates: 2, siteIds: ['a'] };
    expect(layoutProblem({ ...base, design: 'rcbd' })).toBeNull();
    expect(layoutProblem({ ...base, design: 'rcbd', siteIds: ['a', 'b'] })?.field).toBeNull();
    expect(layoutProblem({ ...base, design: 'incomplete' })).toEqual({
      field: 'blockSize',
      message: 'Give how many entries each block holds.',
    });
    expect(layoutProblem({ ...base, design: 'incomplete', blockSize: 5 })).toEqual({
      field: 'blockSize',
      message:
        'With 5 entries, each block holds from 2 to 4 of them (all 5 would be complete blocks).',
    });
    expect(
      layoutProblem({ ...base, design: 'incomplete', blockSize: 2, replicates: 1 })?.field,
    ).toBe('replicates');
    expect(
      layoutProblem({
        ...base,
        design: 'crd',
        factor: { levels: ['none', 'mulch'], arrangement: 'factorial' },
      })?.field,
    ).toBe('factorName');
    expect(() => randomizeLayout({ ...base, design: 'incomplete', seed: 1 })).toThrow(
      LayoutRefused,
    );
  });
});

describe('randomization is uniform (Pearson chi-square goodness-of-fit test)', () => {
  // Reference: Pearson's chi-square goodness-of-fit test as given in the NIST/SEMATECH
  // e-Handbook of Statistical Methods, 1.3.5.15; critical values from its table 1.3.6.7.4.
  it('uses a chi-square distribution that agrees with the handbook table', () => {
    // upper 5 % points from the table: df 4 → 9.488, df 16 → 26.296
    expect(jStat.chisquare.inv(0.95, 4)).toBeCloseTo(9.488, 3);
    expect(jStat.chisquare.inv(0.95, 16)).toBeCloseTo(26.296, 3);
  });

  it('places each entry at each position equally often over many seeds', () => {
    const n = 5000;
    const counts = entries.map(() => entries.map(() => 0));
    for (let seed = 1; seed <= n; seed++) {
      const block = randomizeLayout({
        design: 'rcbd',
        entryIds: entries,
        replicates: 1,
        siteIds: ['s'],
        seed,
      });
      block.forEach((p) => counts[entries.indexOf(p.entryId)]![p.position - 1]!++);
    }
    const expected = n / entries.length;
    const chi2 = counts.flat().reduce((s, o) => s + (o - expected) ** 2 / expected, 0);
    // rows and columns both sum to n: (5 − 1) × (5 − 1) = 16 degrees of freedom
    const p = 1 - jStat.chisquare.cdf(chi2, 16);
    expect(p).toBeGreaterThan(0.001);
  });

  it('draws all 120 orders of five entries equally often', () => {
    const n = 24_000;
    const seen = new Map<string, number>();
    for (let seed = 1; seed <= n; seed++) {
      const key = randomizeLayout({
        design: 'rcbd',
        entryIds: entries,
        replicates: 1,
        siteIds: ['s'],
        seed,
      })
        .map((p) => p.entryId)
        .join();
      seen.set(key, (seen.get(key) ?? 0) + 1);
    }
    expect(seen.size).toBe(120);
    const expected = n / 120;
    const chi2 = [...seen.values()].reduce((s, o) => s + (o - expected) ** 2 / expected, 0);
    expect(1 - jStat.chisquare.cdf(chi2, 119)).toBeGreaterThan(0.001);
  });
});

describe('planting map geometry', () => {
  const plots = randomizeLayout({
    design: 'rcbd',
    entryIds: entries,
    replicates: 3,
    siteIds: ['s'],
    seed: 11,
  });
  const geometry = mapGeometry(plots, {
    plotsPerRange: 5,
    rowLengthMm: 3000,
    rowSpacingMm: 900,
    rowsPerPlot: 1,
    alleyMm: 1000,
    wrapSingleBlock: true,
  });

  it('draws each plot to scale: one row wide, one row length long', () => {
    expect(geometry.plots).toHaveLength(15);
    expect(geometry.widthMm).toBe(5 * 900);
    expect(geometry.heightMm).toBe(3 * 3000 + 2 * 1000);
    for (const r of geometry.plots) {
      expect(r.width).toBe(900);
      expect(r.height).toBe(3000);
      expect(r.x).toBe((r.position - 1) * 900);
      expect(r.y).toBe((r.block - 1) * 4000);
    }
  });

  it('never overlaps two plots and keeps every plot inside the field', () => {
    const g = geometry.plots;
    for (let i = 0; i < g.length; i++) {
      const a = g[i]!;
      expect(a.x + a.width).toBeLessThanOrEqual(geometry.widthMm);
      expect(a.y + a.height).toBeLessThanOrEqual(geometry.heightMm);
      for (const b of g.slice(i + 1)) {
        const apart =
          a.x + a.width <= b.x ||
          b.x + b.width <= a.x ||
          a.y + a.height <= b.y ||
          b.y + b.height <= a.y;
        expect(apart).toBe(true);
      }
    }
  });

  it('wraps a completely randomized run into ranges of one plot per entry', () => {
    const crd = randomizeLayout({
      design: 'crd',
      entryIds: entries,
      replicates: 2,
      siteIds: ['s'],
      seed: 2,
    });
    const g = mapGeometry(crd, {
      plotsPerRange: 5,
      rowLengthMm: 2000,
      rowSpacingMm: 600,
      rowsPerPlot: 2,
      alleyMm: 500,
      wrapSingleBlock: true,
    });
    expect(g.ranges.map((r) => r.range)).toEqual([1, 2]);
    expect(g.widthMm).toBe(5 * 1200);
    expect(g.heightMm).toBe(2 * 2000 + 500);
  });
});

describe('fitting the map on one sheet', () => {
  it('knows the sheet sizes: ISO 216 A4 is 210 × 297 mm, US Letter 8.5 × 11 in', () => {
    expect(paperSizes.a4).toMatchObject({ widthMm: 210, heightMm: 297 });
    expect(paperSizes.letter.widthMm).toBeCloseTo(8.5 * MM_PER_INCH, 9);
    expect(paperSizes.letter.heightMm).toBeCloseTo(11 * MM_PER_INCH, 9);
  });

  for (const paper of ['a4', 'letter'] as const) {
    it(`keeps a tall and a wide field inside the printable box of ${paper}`, () => {
      for (const [w, h] of [
        [4500, 11000],
        [30_000, 6000],
        [900, 900],
      ] as const) {
        const fit = fitToPage(w, h, paper, 12, 60);
        const sheet = paperSizes[paper];
        const [sw, sh] =
          fit.orientation === 'portrait'
            ? [sheet.widthMm, sheet.heightMm]
            : [sheet.heightMm, sheet.widthMm];
        expect(fit.drawingWidthMm).toBeLessThanOrEqual(sw - 24 + 1e-9);
        expect(fit.drawingHeightMm).toBeLessThanOrEqual(sh - 24 - 60 + 1e-9);
        expect(fit.drawingWidthMm / fit.drawingHeightMm).toBeCloseTo(w / h, 9);
        expect(fit.scale).toBeCloseTo(w / fit.drawingWidthMm, 9);
      }
      // a wide field prints landscape, a tall one portrait
      expect(fitToPage(30_000, 6000, paper).orientation).toBe('landscape');
      expect(fitToPage(4500, 11000, paper).orientation).toBe('portrait');
    });
  }
});
