// Invariance properties of the analysis (fast-check). Data are generated: fictional entries.
import Decimal from 'decimal.js';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  analyzePlotRows,
  type AnalysisResult,
  type PlotRow,
} from '../../../server/analysis/engine/analyze.js';
import { compactLetters, splitLetters } from '../../../server/analysis/engine/letters.js';

const NAMES = [
  'Velvet Lantern',
  'Mossbank Long',
  'Copper Thimble',
  'Harrow Gold',
  'Quillfeather',
  'Dunmere Red',
];
const close = (a: number, b: number, tol = 1e-9) =>
  Math.abs(a - b) <= tol * Math.max(1, Math.abs(a), Math.abs(b));

/** Balanced layout: sites × blocks × entries, one plot each, values with 2 decimals. */
const layoutArb = fc
  .record({
    sites: fc.integer({ min: 1, max: 3 }),
    blocks: fc.integer({ min: 2, max: 4 }),
    entries: fc.integer({ min: 2, max: 5 }),
  })
  .chain(({ sites, blocks, entries }) =>
    fc
      .array(fc.integer({ min: 1000, max: 9999 }), {
        minLength: sites * blocks * entries,
        maxLength: sites * blocks * entries,
      })
      .map((vals) => {
        const rows: PlotRow[] = [];
        let i = 0;
        for (let s = 0; s < sites; s++)
          for (let b = 0; b < blocks; b++)
            for (let e = 0; e < entries; e++)
              rows.push({
                site: `S${s}`,
                block: `B${b}`,
                variety: NAMES[e]!,
                value: (vals[i++]! / 100).toFixed(2),
              });
        return { rows, sites };
      }),
  );

const sharesLetter = (r: AnalysisResult, a: string, b: string, key: 'groupLsd' | 'groupHsd') => {
  const la = splitLetters(r.means.find((m) => m.variety === a)![key]);
  const lb = new Set(splitLetters(r.means.find((m) => m.variety === b)![key]));
  return la.some((l) => lb.has(l));
};

function expectSameAnalysis(
  x: AnalysisResult,
  y: AnalysisResult,
  rename: (s: string) => string = (s) => s,
) {
  expect(y.anova.map((l) => l.source)).toEqual(x.anova.map((l) => l.source));
  x.anova.forEach((l, i) => {
    const m = y.anova[i]!;
    expect(m.df).toBe(l.df);
    expect(close(m.ss, l.ss, 1e-9) || Math.abs(m.ss - l.ss) < 1e-9).toBe(true);
  });
  for (const m of x.means) {
    const o = y.means.find((z) => z.variety === rename(m.variety))!;
    expect(close(o.mean, m.mean, 1e-12)).toBe(true);
    expect(o.rank).toBe(m.rank);
  }
  for (const a of x.means)
    for (const b of x.means) {
      if (a === b) continue;
      for (const key of ['groupLsd', 'groupHsd'] as const) {
        expect(sharesLetter(y, rename(a.variety), rename(b.variety), key)).toBe(
          sharesLetter(x, a.variety, b.variety, key),
        );
      }
    }
}

describe('invariance properties', () => {
  it('permuting rows changes nothing', () => {
    fc.assert(
      fc.property(layoutArb, fc.integer(), ({ rows }, seed) => {
        const shuffled = fc.sample(
          fc.shuffledSubarray(rows, { minLength: rows.length, maxLength: rows.length }),
          { seed, numRuns: 1 },
        )[0]!;
        expectSameAnalysis(analyzePlotRows(rows), analyzePlotRows(shuffled));
      }),
      { numRuns: 60 },
    );
  });

  it('renaming entries changes nothing but the names', () => {
    fc.assert(
      fc.property(layoutArb, ({ rows }) => {
        const rename = (s: string) => `${s.split('').reverse().join('')} No. ${s.length}`;
        const renamed = rows.map((r) => ({ ...r, variety: rename(r.variety) }));
        expectSameAnalysis(analyzePlotRows(rows), analyzePlotRows(renamed), rename);
      }),
      { numRuns: 60 },
    );
  });

  it('scaling values by c scales every SS by c²', () => {
    fc.assert(
      fc.property(
        layoutArb,
        fc.constantFrom('0.001', '0.5', '2', '-3', '1000', '12.5'),
        ({ rows }, c) => {
          const scaled = rows.map((r) => ({
            ...r,
            value: new Decimal(r.value as string).times(c).toString(),
          }));
          const a = analyzePlotRows(rows);
          const b = analyzePlotRows(scaled);
          const c2 = Number(c) ** 2;
          a.anova.forEach((l, i) => {
            expect(Math.abs(b.anova[i]!.ss - c2 * l.ss)).toBeLessThanOrEqual(
              1e-9 * c2 * Math.max(l.ss, 1e-6),
            );
            if (l.f !== null) expect(close(b.anova[i]!.f!, l.f, 1e-8)).toBe(true);
          });
        },
      ),
      { numRuns: 60 },
    );
  });

  it('adding a constant (even 13 digits) changes no SS, F or letter; means shift by the constant', () => {
    fc.assert(
      fc.property(
        layoutArb,
        fc.constantFrom('1000', '-250.5', '1000000', '1000000000000'),
        ({ rows }, k) => {
          const shifted = rows.map((r) => ({
            ...r,
            value: new Decimal(r.value as string).plus(k).toString(),
          }));
          const a = analyzePlotRows(rows);
          const b = analyzePlotRows(shifted);
          a.anova.forEach((l, i) => {
            expect(b.anova[i]!.df).toBe(l.df);
            expect(Math.abs(b.anova[i]!.ss - l.ss)).toBeLessThanOrEqual(
              1e-11 * Math.max(l.ss, 1e-3),
            );
          });
          for (const m of a.means) {
            const o = b.means.find((z) => z.variety === m.variety)!;
            // The shifted mean is the same to rounding of its own magnitude.
            const want = new Decimal(m.mean).plus(k).toNumber();
            expect(Math.abs(o.mean - want)).toBeLessThanOrEqual(
              4 * Number.EPSILON * Math.max(1, Math.abs(want)) + 1e-12,
            );
            expect(close(o.sd!, m.sd!, 1e-11)).toBe(true);
            expect(o.groupLsd).toBe(m.groupLsd);
            expect(o.groupHsd).toBe(m.groupHsd);
          }
        },
      ),
      { numRuns: 60 },
    );
  });

  it('group-means and least-squares (QR) paths agree on balanced layouts', () => {
    fc.assert(
      fc.property(layoutArb, ({ rows, sites }) => {
        const design = sites >= 2 ? 'multisite' : 'rcbd';
        const a = analyzePlotRows(rows, { design, method: 'means' });
        const b = analyzePlotRows(rows, { design, method: 'least-squares' });
        expect(a.method).toBe('means');
        expect(b.method).toBe('least-squares');
        a.anova.forEach((l, i) => {
          expect(b.anova[i]!.df).toBe(l.df);
          expect(Math.abs(b.anova[i]!.ss - l.ss)).toBeLessThanOrEqual(1e-10 * Math.max(l.ss, 1e-3));
        });
      }),
      { numRuns: 80 },
    );
  });
});

describe('compact letter display property (insert-and-absorb)', () => {
  it('two entries share a letter exactly when the test does not separate them; best mean gets "a"', () => {
    const arb = fc.integer({ min: 1, max: 12 }).chain((k) =>
      fc.record({
        k: fc.constant(k),
        order: fc.shuffledSubarray([...Array(k).keys()], { minLength: k, maxLength: k }),
        sep: fc.array(fc.boolean(), { minLength: (k * (k - 1)) / 2, maxLength: (k * (k - 1)) / 2 }),
      }),
    );
    fc.assert(
      fc.property(arb, ({ k, order, sep }) => {
        const m: boolean[][] = Array.from({ length: k }, () => new Array<boolean>(k).fill(false));
        let idx = 0;
        for (let i = 0; i < k; i++)
          for (let j = i + 1; j < k; j++) m[i]![j] = m[j]![i] = sep[idx++]!;
        const letters = compactLetters(order, (i, j) => m[i]![j]!);
        for (let i = 0; i < k; i++) {
          expect(letters[i]!.length).toBeGreaterThan(0);
          for (let j = i + 1; j < k; j++) {
            const li = new Set(splitLetters(letters[i]!));
            const share = splitLetters(letters[j]!).some((l) => li.has(l));
            expect(share).toBe(!m[i]![j]);
          }
        }
        expect(letters[order[0]!]!.startsWith('a')).toBe(true);
      }),
      { numRuns: 300 },
    );
  });

  it('a chain of overlapping groups (hand-checked)', () => {
    // Means in order 0 > 1 > 2 > 3; only 0-2, 0-3 and 1-3 are separated.
    const sep = new Set(['0-2', '0-3', '1-3']);
    const letters = compactLetters([0, 1, 2, 3], (i, j) =>
      sep.has(`${Math.min(i, j)}-${Math.max(i, j)}`),
    );
    expect(letters).toEqual(['a', 'ab', 'bc', 'c']);
  });

  it('no separations: one letter for all; everything separated: one letter each', () => {
    expect(compactLetters([2, 0, 1], () => false)).toEqual(['a', 'a', 'a']);
    expect(compactLetters([2, 0, 1], () => true)).toEqual(['b', 'c', 'a']);
  });
});
