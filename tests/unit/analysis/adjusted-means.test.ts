// Adjusted (least-squares) means against R emmeans 1.8.4.1 on R 4.2.2, computed once by
// fixtures/analysis/r/adjusted-means.R (versions and the exact call stored in each
// adjusted-<name>.json). Letters in the fixtures come from R's pairwise p-values (unadjusted
// for LSD, Tukey for HSD) through the insert-and-absorb function in r/letters.R.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeCsv, analyzePlotRows } from '../../../server/analysis/engine/analyze.js';
import { repoRoot } from './nist.js';

interface Ref {
  name: string;
  source: string;
  call: string;
  alpha: number;
  df: number;
  adjustedMeans: {
    variety: string;
    mean: number;
    se: number;
    groupLsd: string;
    groupHsd: string;
  }[];
  pairs: {
    a: string;
    b: string;
    difference: number;
    se: number;
    t: number;
    p: number;
    pTukey: number;
  }[];
}
const dir = path.join(repoRoot, 'fixtures/analysis');
const load = (name: string) => ({
  ref: JSON.parse(readFileSync(path.join(dir, `adjusted-${name}.json`), 'utf8')) as Ref,
  csv: readFileSync(path.join(dir, `adjusted-${name}.csv`), 'utf8'),
});
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

const cases = [
  'npk-balanced',
  'npk-missing1',
  'npk-missing2',
  'npk-missing5',
  'chickwts',
  'multisite-missing',
];

describe('adjusted means against R emmeans', () => {
  for (const name of cases) {
    const { ref, csv } = load(name);
    describe(`${name} (${ref.source})`, () => {
      const res = analyzeCsv(csv, { trait: 'value', includePairs: true });
      it('means and standard errors (emmean, SE) to 10 significant digits', () => {
        expect(res.model).toBe('anova');
        expect(res.errorTerm.df).toBe(ref.df);
        expect(res.adjustedMeans).toHaveLength(ref.adjustedMeans.length);
        for (const m of ref.adjustedMeans) {
          const got = res.adjustedMeans.find((a) => a.variety === m.variety)!;
          expect(rel(got.mean, m.mean), m.variety).toBeLessThan(1e-10);
          expect(rel(got.se, m.se), m.variety).toBeLessThan(1e-10);
        }
      });
      it('pairwise differences: estimate, SE, t, p and Tukey p (pairs(emm))', () => {
        for (const p of ref.pairs) {
          const q = res.pairs!.find(
            (x) => (x.a === p.a && x.b === p.b) || (x.a === p.b && x.b === p.a),
          )!;
          const sign = q.a === p.a ? 1 : -1;
          expect(Math.abs(sign * q.difference - p.difference)).toBeLessThan(1e-10 * Math.abs(p.se));
          expect(rel(q.se, p.se)).toBeLessThan(1e-10);
          expect(Math.abs(sign * q.t - p.t)).toBeLessThan(1e-9);
          expect(Math.abs(q.p - p.p)).toBeLessThan(1e-10);
          // Tukey p from the studentized range (jstat, ~1e-8): the 1e-6 absolute.
          expect(Math.abs(q.pTukey - p.pTukey)).toBeLessThan(1e-6);
        }
      });
      it('ranks and letters follow the adjusted means', () => {
        const order = [...ref.adjustedMeans].sort((a, b) => b.mean - a.mean);
        expect(res.means.map((m) => m.variety)).toEqual(order.map((m) => m.variety));
        expect(res.adjustedMeans.map((m) => m.variety)).toEqual(order.map((m) => m.variety));
        res.means.forEach((m, i) => expect(m.rank).toBe(i + 1));
        for (const m of ref.adjustedMeans) {
          const got = res.means.find((x) => x.variety === m.variety)!;
          expect(got.groupLsd, m.variety).toBe(m.groupLsd);
          expect(got.groupHsd, m.variety).toBe(m.groupHsd);
        }
      });
    });
  }

  it('balanced data: adjusted means are the arithmetic means and SE = √(MS/r), exactly', () => {
    for (const name of ['npk-balanced', 'chickwts']) {
      const res = analyzeCsv(load(name).csv, { trait: 'value' });
      for (const a of res.adjustedMeans) {
        const m = res.means.find((x) => x.variety === a.variety)!;
        expect(a.mean).toBe(m.mean);
        expect(a.se).toBe(Math.sqrt(res.errorTerm.ms / m.n));
      }
      expect(res.warnings.some((w) => w.includes('adjusted'))).toBe(false);
    }
    // And the single LSD/HSD values stay (equal replication).
    const npk = analyzeCsv(load('npk-balanced').csv, { trait: 'value' });
    expect(npk.lsd.value).not.toBeNull();
  });

  it('a variety that lost its plot in the best block is ranked by its adjusted mean, not its arithmetic one', () => {
    // Invented: block III is about 6 units better than I and II; B is about 2 above A and loses
    // its plot in block III. Arithmetic means: C 8, A 6.07, B 6 (B last, robbed of the best
    // block); the block-adjusted means put B above A.
    const rows = [
      ['I', 'A', 4],
      ['I', 'B', 6],
      ['I', 'C', 6.2],
      ['II', 'A', 4.2],
      ['II', 'B', 6],
      ['II', 'C', 5.8],
      ['III', 'A', 10],
      ['III', 'B', null],
      ['III', 'C', 12],
    ].map(([block, variety, value]) => ({
      block: block as string,
      variety: variety as string,
      value: value as number | null,
    }));
    const res = analyzePlotRows(rows);
    const arith = Object.fromEntries(res.means.map((m) => [m.variety, m.mean]));
    expect(arith.B).toBeCloseTo(6, 12);
    expect(arith.A).toBeCloseTo(6.066666666666666, 12);
    const adj = Object.fromEntries(res.adjustedMeans.map((m) => [m.variety, m.mean]));
    expect(adj.B).toBeGreaterThan(adj.A!);
    expect(res.means.find((m) => m.variety === 'B')!.rank!).toBeLessThan(
      res.means.find((m) => m.variety === 'A')!.rank!,
    );
    expect(res.warnings.some((w) => w.includes('adjusted (least-squares) means'))).toBe(true);
    // The missing-plot row is named.
    expect(res.warnings).toContain('row 8 has no value: left out');
  });
});
