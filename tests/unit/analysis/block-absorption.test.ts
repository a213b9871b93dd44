// The block-absorbed least-squares path against the general Householder QR fit, on generated
// unbalanced layouts (fictional data). Both are exact least squares, so they must agree to
// rounding; the QR fit is the textbook definition of sequential (type I) sums of squares.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  analyseVariance,
  qrSequentialSs,
  type PlotLayout,
} from '../../../server/analysis/engine/anova.js';

/** Random layout: sites × blocks × entries, some plots dropped, some cells doubled. */
const unbalancedArb = fc
  .record({
    sites: fc.integer({ min: 1, max: 3 }),
    blocks: fc.integer({ min: 2, max: 4 }),
    entries: fc.integer({ min: 2, max: 6 }),
    seed: fc.integer({ min: 1, max: 2 ** 30 }),
  })
  .map(({ sites, blocks, entries, seed }) => {
    let a = seed >>> 0;
    const rnd = () => {
      a = (a * 1103515245 + 12345) >>> 0;
      return a / 2 ** 32;
    };
    const y: number[] = [];
    const entry: number[] = [];
    const block: number[] = [];
    const site: number[] = [];
    for (let s = 0; s < sites; s++)
      for (let b = 0; b < blocks; b++)
        for (let e = 0; e < entries; e++) {
          const copies = rnd() < 0.15 ? 0 : rnd() < 0.1 ? 2 : 1;
          for (let c = 0; c < copies; c++) {
            y.push(Math.round(1000 + 300 * rnd() + 40 * e + 90 * s) / 10);
            entry.push(e);
            block.push(s * blocks + b);
            site.push(s);
          }
        }
    const layout: PlotLayout = {
      y: Float64Array.from(y),
      entry: Int32Array.from(entry),
      entries,
      block: Int32Array.from(block),
      blocks: sites * blocks,
      site: Int32Array.from(site),
      sites,
    };
    return { layout, design: sites >= 2 ? ('multisite' as const) : ('rcbd' as const) };
  });

describe('block absorption agrees with the QR fit', () => {
  it('on unbalanced and aliased layouts: same df, same SS to 1e-9 relative', () => {
    fc.assert(
      fc.property(unbalancedArb, ({ layout, design }) => {
        if (layout.y.length < 3) return;
        const fast = analyseVariance(design, layout, 'least-squares');
        const qr = qrSequentialSs(design, layout);
        expect(fast.method).toBe('least-squares');
        qr.terms.forEach((t) => {
          const line = fast.lines.find((l) => l.source === t.source)!;
          expect(line.df).toBe(t.df);
          expect(Math.abs(line.ss - t.ss)).toBeLessThanOrEqual(1e-9 * Math.max(qr.totalSs, 1));
        });
        const res = fast.lines.find((l) => l.source === 'residual')!;
        expect(res.df).toBe(qr.residualDf);
        expect(Math.abs(res.ss - qr.residualSs)).toBeLessThanOrEqual(
          1e-9 * Math.max(qr.totalSs, 1),
        );
      }),
      { numRuns: 200 },
    );
  });

  it('a variety missing from a whole site loses its site × variety degree of freedom there', () => {
    // 2 sites × 2 blocks × 3 entries; entry 2 never grown at site 1.
    const y: number[] = [];
    const entry: number[] = [];
    const block: number[] = [];
    const site: number[] = [];
    for (let s = 0; s < 2; s++)
      for (let b = 0; b < 2; b++)
        for (let e = 0; e < 3; e++) {
          if (s === 1 && e === 2) continue;
          y.push(10 + e + 2 * s + 0.5 * b + ((e * 7 + b * 3 + s) % 5) / 10);
          entry.push(e);
          block.push(s * 2 + b);
          site.push(s);
        }
    const layout: PlotLayout = {
      y: Float64Array.from(y),
      entry: Int32Array.from(entry),
      entries: 3,
      block: Int32Array.from(block),
      blocks: 4,
      site: Int32Array.from(site),
      sites: 2,
    };
    const fast = analyseVariance('multisite', layout, 'least-squares');
    const df = Object.fromEntries(fast.lines.map((l) => [l.source, l.df]));
    // Counted by hand: 10 plots in 5 site × variety cells; site 1, block within site 4 − 2 = 2,
    // variety 2, site × variety 5 cells − (1 + 1 + 2) = 1, residual 10 − 4 blocks − (5 − 2) = 3.
    expect(df).toEqual({ site: 1, block: 2, variety: 2, 'site:variety': 1, residual: 3, total: 9 });
    const qr = qrSequentialSs('multisite', layout);
    expect(qr.terms.map((t) => t.df)).toEqual([1, 2, 2, 1]);
  });
});
