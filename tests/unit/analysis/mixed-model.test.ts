// Mixed models (REML) against R 4.2.2 with lme4 1.1-31, lmerTest 3.1-3 (Satterthwaite) and
// emmeans 1.8.4-1, computed once by fixtures/analysis/r/mixed-models.R (the exact call, the
// versions and the refinement of lme4's optimum are stored in each mixed-<name>.json).
// The single-site incomplete-block case (mixed-incomplete-alpha) comes from
// fixtures/analysis/r/incomplete-alpha.R on a layout made by our own generator.
// Published data: R datasets::npk (Yates 1935). Agreement asked for: adjusted means and SEs to
// 6 significant digits, variance components to 5, Satterthwaite df to 4, p to 1e-6 absolute.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, analyzeCsv } from '../../../server/analysis/engine/analyze.js';
import { fitReml, varietyTestContrasts } from '../../../server/analysis/engine/mixed-model.js';
import { repoRoot } from './nist.js';

interface Ref {
  name: string;
  source: string;
  formula: string;
  varianceComponents: { source: string; variance: number }[];
  theta: number[];
  sigma: number;
  vcovVarpar: number[][];
  logLik: number;
  boundary: boolean;
  adjustedMeans: { variety: string; mean: number; se: number; df: number }[];
  fixedTest: { numDf: number; denDf: number; f: number; p: number; method: string };
  pairs: { a: string; b: string; difference: number; se: number; df: number; p: number }[];
}

const dir = path.join(repoRoot, 'fixtures/analysis');
const load = (name: string) => ({
  ref: JSON.parse(readFileSync(path.join(dir, `mixed-${name}.json`), 'utf8')) as Ref,
  csv: readFileSync(path.join(dir, `mixed-${name}.csv`), 'utf8'),
});
const rel = (a: number, b: number) => (b === 0 ? Math.abs(a) : Math.abs(a - b) / Math.abs(b));

/** The model the fixture's formula names, built straight from its CSV (engine level). */
function fitFixture(ref: Ref, csv: string) {
  const rows = parse(csv, { columns: true }) as Record<string, string>[];
  const code = (values: string[]) => {
    const map = new Map<string, number>();
    const cells = Int32Array.from(values, (v) => {
      if (!map.has(v)) map.set(v, map.size);
      return map.get(v)!;
    });
    return { cells, levels: map.size, names: [...map.keys()] };
  };
  const y = Float64Array.from(rows, (r) => Number(r.value));
  const variety = code(rows.map((r) => r.variety!));
  const counts = new Array<number>(variety.levels).fill(0);
  for (const c of variety.cells) counts[c]!++;
  const sources = [...ref.formula.matchAll(/\(1 \| ([a-z:]+)\)/g)].map((m) => m[1]!);
  const random = sources.map((source) => {
    const c = code(
      rows.map((r) =>
        source
          .split(':')
          .map((col) => r[col])
          .join('\u0000'),
      ),
    );
    return { source, cells: c.cells, levels: c.levels };
  });
  return {
    fit: fitReml({ y, fixedCells: variety.cells, fixedLevels: variety.levels, random }),
    counts,
    variety,
  };
}

const cases = [
  'npk-missing2',
  'npk-missing5',
  'multisite-missing',
  'multisite-missing-sv',
  'network',
  'boundary',
  'incomplete-alpha',
];

describe('REML fits against lme4 / lmerTest / emmeans', () => {
  for (const name of cases) {
    const { ref, csv } = load(name);
    describe(`${name}: ${ref.formula} (${ref.source})`, () => {
      const { fit, counts, variety } = fitFixture(ref, csv);

      it('variance components (VarCorr) to 5 significant digits, REML log-likelihood, boundary', () => {
        for (const c of ref.varianceComponents) {
          const got = fit.varianceComponents.find((g) => g.source === c.source)!;
          if (c.variance === 0) expect(got.variance).toBe(0);
          else expect(rel(got.variance, c.variance)).toBeLessThan(1e-5);
        }
        expect(Math.abs(fit.logLik - ref.logLik)).toBeLessThan(1e-8 * Math.abs(ref.logLik));
        expect(fit.boundary).toBe(ref.boundary);
      });

      it("SEs of the variance components from lmerTest's vcov_varpar (delta method)", () => {
        // R's vcov_varpar is over (theta in VarCorr order, sigma); σ_k² = θ_k² σ².
        const k = ref.theta.length;
        const s = ref.sigma;
        ref.varianceComponents.forEach((c, i) => {
          const g = new Array<number>(k + 1).fill(0);
          if (i < k) {
            g[i] = 2 * ref.theta[i]! * s * s;
            g[k] = 2 * ref.theta[i]! ** 2 * s;
          } else g[k] = 2 * s;
          let v = 0;
          for (let a = 0; a <= k; a++)
            for (let b = 0; b <= k; b++) v += g[a]! * ref.vcovVarpar[a]![b]! * g[b]!;
          const got = fit.varianceComponents.find((x) => x.source === c.source)!;
          if (c.variance === 0) expect(got.se).toBeNull();
          else expect(rel(got.se!, Math.sqrt(v))).toBeLessThan(1e-4);
        });
      });

      it('BLUEs of the variety means and SEs (emmeans) to 6 digits, their Satterthwaite df to 4', () => {
        for (const m of ref.adjustedMeans) {
          const l = new Float64Array(variety.levels);
          l[variety.names.indexOf(m.variety)] = 1;
          const c = fit.contrast(l);
          expect(rel(c.estimate, m.mean)).toBeLessThan(1e-6);
          expect(rel(c.se, m.se)).toBeLessThan(1e-6);
          expect(rel(c.df, m.df)).toBeLessThan(1e-4);
        }
      });

      it('variety F test (anova, ddf = "Satterthwaite"): F, df and p', () => {
        const t = fit.waldF(varietyTestContrasts(counts));
        expect(ref.fixedTest.method).toBe('satterthwaite');
        expect(t.numDf).toBe(ref.fixedTest.numDf);
        expect(rel(t.f, ref.fixedTest.f)).toBeLessThan(1e-6);
        expect(rel(t.denDf, ref.fixedTest.denDf)).toBeLessThan(1e-4);
        expect(Math.abs(t.p - ref.fixedTest.p)).toBeLessThan(1e-6);
      });
    });
  }
});

describe('analyze --model mixed picks the model from the layout and reports it', () => {
  // The layouts whose model the engine chooses equals the fixture's formula.
  for (const name of ['npk-missing2', 'npk-missing5', 'multisite-missing-sv', 'network']) {
    const { ref, csv } = load(name);
    it(`${name}: ${ref.formula}`, () => {
      const res = analyzeCsv(csv, { trait: 'value', model: 'mixed', includePairs: true });
      expect(res.model).toBe('mixed');
      expect(res.varianceComponents!.map((c) => c.source).sort()).toEqual(
        ref.varianceComponents.map((c) => (c.source === 'residual' ? 'residual' : c.source)).sort(),
      );
      for (const c of ref.varianceComponents) {
        const got = res.varianceComponents!.find((g) => g.source === c.source)!;
        expect(rel(got.variance, c.variance)).toBeLessThan(1e-5);
      }
      expect(rel(res.logLik!, ref.logLik)).toBeLessThan(1e-8);
      expect(res.boundary).toBe(ref.boundary);
      expect(rel(res.fixedTest!.denDf, ref.fixedTest.denDf)).toBeLessThan(1e-4);
      expect(Math.abs(res.fixedTest!.p - ref.fixedTest.p)).toBeLessThan(1e-6);
      for (const m of ref.adjustedMeans) {
        const got = res.adjustedMeans.find((a) => a.variety === m.variety)!;
        expect(rel(got.mean, m.mean)).toBeLessThan(1e-6);
        expect(rel(got.se, m.se)).toBeLessThan(1e-6);
      }
      // Pairwise differences (emmeans pairs, adjust = "none"): SE, and p on each pair's own df.
      for (const pr of ref.pairs) {
        const got = res.pairs!.find(
          (x) => (x.a === pr.a && x.b === pr.b) || (x.a === pr.b && x.b === pr.a),
        )!;
        const sign = got.a === pr.a ? 1 : -1;
        expect(rel(sign * got.difference, pr.difference)).toBeLessThan(1e-6);
        expect(rel(got.se, pr.se)).toBeLessThan(1e-6);
        expect(Math.abs(got.p! - pr.p)).toBeLessThan(1e-6);
      }
      // Ranks follow the BLUEs (higher is better by default).
      const order = [...ref.adjustedMeans].sort((a, b) => b.mean - a.mean).map((m) => m.variety);
      expect(res.means.find((m) => m.rank === 1)!.variety).toBe(order[0]);
      expect(res.adjustedMeans.map((m) => m.variety)).toEqual(order);
      expect(res.varianceSummary).toMatch(
        /^Of the variation left once varieties are accounted for/,
      );
    });
  }

  it('a lower-is-better trait ranks the smallest BLUE first', () => {
    const { ref, csv } = load('network');
    const res = analyzeCsv(csv, { trait: 'value', model: 'mixed', direction: 'lower' });
    const smallest = [...ref.adjustedMeans].sort((a, b) => a.mean - b.mean)[0]!.variety;
    expect(res.means.find((m) => m.rank === 1)!.variety).toBe(smallest);
  });

  it('balanced complete blocks: BLUEs equal the arithmetic means (no adjustment to make)', () => {
    // Algebra of the balanced randomized complete block design (every block holds every
    // entry once): the generalised least-squares means are the plain means.
    const csv = readFileSync(path.join(dir, 'npk-rcbd.csv'), 'utf8');
    const res = analyzeCsv(csv, { trait: 'value', model: 'mixed' });
    for (const m of res.means) {
      const adj = res.adjustedMeans.find((a) => a.variety === m.variety)!;
      expect(rel(adj.mean, m.mean)).toBeLessThan(1e-10);
    }
    const classical = analyzeCsv(csv, { trait: 'value' });
    expect(classical.model).toBe('anova');
    expect(classical.varianceComponents).toBeUndefined();
  });

  it('a layout with neither gardens nor blocks is refused with a reason', () => {
    const csv = readFileSync(path.join(dir, 'chickwts.csv'), 'utf8');
    expect(() => analyzeCsv(csv, { model: 'mixed' })).toThrow(AnalysisInputError);
    expect(() => analyzeCsv(csv, { model: 'mixed' })).toThrow(/site or block column/);
  });

  it('a variance at zero is said in the warnings and in the summary', () => {
    const { csv } = load('boundary');
    const res = analyzeCsv(csv, { trait: 'value', model: 'mixed' });
    expect(res.boundary).toBe(true);
    expect(res.varianceComponents!.find((c) => c.source === 'site:block')!.variance).toBe(0);
    expect(res.warnings.join('\n')).toMatch(/site:block variance was estimated as zero/);
    expect(res.varianceSummary).toMatch(/no variation of their own for blocks within gardens/);
  });
});
