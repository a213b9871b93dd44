// Reference values computed once by R 4.2.2 (Debian r-base-core) with fixtures/analysis/r/reference.R;
// each fixture JSON names the R version and the exact call. Datasets ship with R (datasets
// package) or are fictional sets generated there with a fixed seed.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeCsv } from '../../../server/analysis/engine/analyze.js';
import {
  studentTQuantile,
  studentizedRangeQuantile,
} from '../../../server/analysis/engine/distributions.js';
import { repoRoot } from './nist.js';

const dir = path.join(repoRoot, 'fixtures/analysis');
interface Ref {
  name: string;
  source: string;
  call: string;
  design: string;
  alpha: number;
  n: number;
  grandMean: number;
  anova: {
    source: string;
    df: number;
    ss: number;
    ms: number;
    f: number | null;
    p: number | null;
  }[];
  means: {
    variety: string;
    n: number;
    mean: number;
    sd: number;
    groupLsd: string;
    groupHsd: string;
  }[];
  error: { ms: number; df: number };
  qt: number;
  qtukey: number;
  lsd: number | null;
  hsd: number | null;
  tukey?: { pair: string; diff: number; lwr: number; upr: number; padj: number }[];
  varietyF?: number;
  varietyP?: number;
  siteF?: number;
  siteP?: number;
}
const load = (name: string) => ({
  ref: JSON.parse(readFileSync(path.join(dir, `${name}.json`), 'utf8')) as Ref,
  csv: readFileSync(path.join(dir, `${name}.csv`), 'utf8'),
});
const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

const names = [
  'plantgrowth',
  'plantgrowth-alpha01',
  'insectsprays',
  'chickwts',
  'npk-rcbd',
  'npk-n',
  'npk-rcbd-missing',
  'warpbreaks',
  'subsamples',
  'multisite',
  'multisite-missing',
];

describe('against R reference analyses', () => {
  for (const name of names) {
    const { ref, csv } = load(name);
    describe(`${name} (${ref.source})`, () => {
      const res = analyzeCsv(csv, { trait: 'value', alpha: ref.alpha });
      it('design, n, grand mean', () => {
        expect(res.design).toBe(ref.design);
        expect(res.n).toBe(ref.n);
        expect(rel(res.grandMean, ref.grandMean)).toBeLessThan(1e-13);
      });
      it('ANOVA table: df, SS and MS (R aov)', () => {
        for (const r of ref.anova) {
          const line = res.anova.find((l) => l.source === r.source)!;
          expect(line, r.source).toBeDefined();
          expect(line.df).toBe(r.df);
          expect(rel(line.ss, r.ss)).toBeLessThan(1e-11);
          expect(rel(line.ms!, r.ms)).toBeLessThan(1e-11);
        }
        const total = res.anova.find((l) => l.source === 'total')!;
        expect(total.df).toBe(ref.n - 1);
        expect(
          rel(
            total.ss,
            ref.anova.reduce((s, r) => s + r.ss, 0),
          ),
        ).toBeLessThan(1e-11);
      });
      it('F and p (R summary(aov); multisite F recomputed against the right error term)', () => {
        for (const r of ref.anova) {
          const line = res.anova.find((l) => l.source === r.source)!;
          let f = r.f;
          let p = r.p;
          if (ref.design === 'multisite' && r.source === 'variety')
            [f, p] = [ref.varietyF!, ref.varietyP!];
          if (ref.design === 'multisite' && r.source === 'site') [f, p] = [ref.siteF!, ref.siteP!];
          if (f === null) {
            expect(line.f).toBeNull();
            continue;
          }
          expect(rel(line.f!, f)).toBeLessThan(1e-11);
          // The incomplete beta (distributions.ts) is good to ~1e-13 relative.
          expect(rel(line.p!, p!)).toBeLessThan(1e-6);
        }
        if (ref.design === 'multisite') {
          expect(res.anova.find((l) => l.source === 'variety')!.testedAgainst).toBe('site:variety');
          expect(res.anova.find((l) => l.source === 'site')!.testedAgainst).toBe('block');
        }
      });
      it('entry means, SD, letters (R tapply; letters from R pairwise decisions)', () => {
        expect(res.means).toHaveLength(ref.means.length);
        for (const m of ref.means) {
          const got = res.means.find((x) => x.variety === m.variety)!;
          expect(got.n).toBe(m.n);
          expect(rel(got.mean, m.mean)).toBeLessThan(1e-13);
          expect(rel(got.sd!, m.sd)).toBeLessThan(1e-12);
          expect(got.groupLsd).toBe(m.groupLsd);
          expect(got.groupHsd).toBe(m.groupHsd);
        }
        const sorted = [...res.means].sort((a, b) => b.mean - a.mean);
        expect(res.means.map((m) => m.variety)).toEqual(sorted.map((m) => m.variety));
        expect(res.means[0]!.rank).toBe(1);
        expect(res.means[0]!.group).toContain('a');
      });
      it('LSD and HSD (R qt, qtukey)', () => {
        expect(res.errorTerm.df).toBe(ref.error.df);
        expect(rel(res.errorTerm.ms, ref.error.ms)).toBeLessThan(1e-11);
        expect(rel(res.lsd.t, ref.qt)).toBeLessThan(1e-12);
        expect(rel(res.hsd.q, ref.qtukey)).toBeLessThan(1e-8);
        if (ref.lsd === null) {
          expect(res.lsd.value).toBeNull();
          expect(res.hsd.value).toBeNull();
        } else {
          expect(rel(res.lsd.value!, ref.lsd)).toBeLessThan(1e-11);
          expect(rel(res.hsd.value!, ref.hsd!)).toBeLessThan(1e-8);
        }
      });
      if (ref.tukey) {
        it('pairwise HSD decisions agree with R TukeyHSD()', () => {
          const r = analyzeCsv(csv, { trait: 'value', includePairs: true });
          for (const t of ref.tukey!) {
            const [a, b] = t.pair.split('-') as [string, string];
            const pair = r.pairs!.find(
              (p) => (p.a === a && p.b === b) || (p.a === b && p.b === a),
            )!;
            expect(pair, t.pair).toBeDefined();
            const diff = pair.a === a ? pair.difference : -pair.difference;
            expect(rel(diff, t.diff)).toBeLessThan(1e-11);
            // TukeyHSD's interval half-width is q·SE/√2.
            const half = (r.hsd.q * pair.se) / Math.SQRT2;
            expect(rel(half, t.upr - t.diff)).toBeLessThan(1e-8);
            expect(pair.hsdSeparated).toBe(t.padj < 0.05);
          }
        });
      }
    });
  }

  it('warnings name the special cases', () => {
    const missing = analyzeCsv(load('npk-rcbd-missing').csv);
    expect(missing.method).toBe('least-squares');
    expect(missing.counts.missingPlots).toBe(1);
    expect(missing.warnings.some((w) => w.startsWith('unbalanced: 1 missing plot'))).toBe(true);
    expect(missing.warnings.join(' ')).toContain('sequential (type I) sums of squares');
    // Under the mixed model the same file is ranked on the model's means, and says so.
    const mixed = analyzeCsv(load('npk-rcbd-missing').csv, { model: 'mixed' });
    const unbalanced = mixed.warnings.find((w) => w.startsWith('unbalanced: 1 missing plot'))!;
    expect(unbalanced).toContain('estimated means (BLUEs)');
    expect(unbalanced).not.toContain('sequential');
    const sub = analyzeCsv(load('subsamples').csv);
    expect(sub.n).toBe(16);
    expect(sub.counts.rows).toBe(48);
    expect(sub.warnings.some((w) => w.startsWith('sub-samples averaged'))).toBe(true);
    const ms = analyzeCsv(load('multisite').csv);
    expect(ms.method).toBe('means');
    expect(ms.warnings).toEqual([]);
    // npk-rcbd-missing: variety p = 0.0546 > 0.05, so LSD is not protected.
    expect(missing.lsd.protected).toBe(false);
    expect(missing.warnings.some((w) => w.includes('not protected'))).toBe(true);
  });
});

describe('t and studentized range quantiles against R qt() and qtukey()', () => {
  const q = JSON.parse(readFileSync(path.join(dir, 'quantiles.json'), 'utf8')) as {
    rows: { alpha: number; k: number; df: number; qt: number; qtukey: number }[];
  };
  it('over a grid of alpha, k and df', () => {
    expect(q.rows.length).toBe(75);
    for (const r of q.rows) {
      expect(rel(studentTQuantile(1 - r.alpha / 2, r.df), r.qt)).toBeLessThan(1e-12);
      expect(rel(studentizedRangeQuantile(1 - r.alpha, r.k, r.df), r.qtukey)).toBeLessThan(1e-8);
    }
  });
});
