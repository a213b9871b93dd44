// A split plot with the treatment on main plots as a mixed model against R 4.2.2 with lme4,
// lmerTest and emmeans, computed once by fixtures/analysis/r/split-plot-mixed.R (the exact calls
// and versions are stored in each split-plot-mixed-<name>.json):
//   lmer(value ~ treatment * variety + (1 | block) + (1 | block:treatment)) by REML,
//   anova(fit, type = 1, ddf = "Satterthwaite"), emmeans(..., lmer.df = "satterthwaite").
// Cases: the invented split plot with every plot, with 1 and with 3 plots lost, and the published
// split plot nlme::Oats (Yates 1935). Agreement (the analysis contract): fixed effects, means and
// SEs to 6 significant digits, variance components to 5, Satterthwaite df to 4, p to an absolute
// 1e-6. On the balanced layouts (every REML variance positive) the mixed model's tests equal the
// classical strata of aov(... + Error(block/treatment)) (two-factor-<name>.json, from
// fixtures/analysis/r/two-factor.R).
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  AnalysisInputError,
  analyzeTwoFactorCsv,
} from '../../../server/analysis/engine/analyze.js';
import { repoRoot } from './nist.js';

interface Effect {
  within: string;
  a: string;
  b: string;
  difference: number;
  se: number;
  df: number;
  t: number;
  p: number;
}
interface Mean {
  mean: number;
  se: number;
  df: number;
}
interface Ref {
  source: string;
  varianceComponents: { source: string; variance: number }[];
  logLik: number;
  boundary: boolean;
  fixedEffects: { name: string; estimate: number }[];
  fixedTests: { source: string; numDf: number; denDf: number; f: number; p: number }[];
  cellMeans: (Mean & { variety: string; treatment: string })[];
  treatmentMeans: (Mean & { treatment: string })[];
  varietyMeans: (Mean & { variety: string })[];
  treatmentWithinVariety: Effect[];
  varietyWithinTreatment: Effect[];
}
const dir = path.join(repoRoot, 'fixtures/analysis');
const read = (file: string) => readFileSync(path.join(dir, file), 'utf8');
const load = (name: string) => ({
  ref: JSON.parse(read(`split-plot-mixed-${name}.json`)) as Ref,
  csv: read(`split-plot-mixed-${name}.csv`),
});
const close = (actual: number, expected: number, digits: number) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(
    Math.max(Math.abs(expected), 1e-300) * 10 ** -digits,
  );
const mixed = (csv: string) =>
  analyzeTwoFactorCsv(csv, {
    factor: 'treatment',
    splitPlot: true,
    trait: 'value',
    model: 'mixed',
  });

/** One pair of R's simple effects in ours (R may list the pair the other way round). */
function sameEffect(ours: Effect[], r: Effect) {
  const e = ours.find(
    (x) => x.within === r.within && ((x.a === r.a && x.b === r.b) || (x.a === r.b && x.b === r.a)),
  )!;
  expect(e).toBeDefined();
  return { e, sign: e.a === r.a ? 1 : -1 };
}

describe.each(['balanced', 'missing1', 'missing3', 'oats'])(
  'split plot, mixed model: %s',
  (name) => {
    const { ref, csv } = load(name);
    const result = mixed(csv);

    it('says it is the mixed model and counts the lost plots', () => {
      expect(result.model).toBe('mixed');
      expect(result.layout).toBe('split-plot');
      expect(result.counts.missingPlots).toBe(
        name === 'missing1' ? 1 : name === 'missing3' ? 3 : 0,
      );
      expect(result.boundary).toBe(ref.boundary);
    });

    it('has lme4’s REML variance components and log-likelihood', () => {
      const ours = result.varianceComponents!;
      expect(ours.map((c) => c.source).sort()).toEqual(
        ref.varianceComponents.map((c) => c.source).sort(),
      );
      for (const r of ref.varianceComponents)
        close(ours.find((c) => c.source === r.source)!.variance, r.variance, 5);
      close(result.logLik!, ref.logLik, 6);
    });

    it('has lmerTest’s sequential Wald F tests with Satterthwaite’s df', () => {
      const tests = result.fixedTests!;
      expect(tests.map((t) => [t.source, t.numDf])).toEqual(
        ref.fixedTests.map((t) => [t.source, t.numDf]),
      );
      tests.forEach((t, i) => {
        const r = ref.fixedTests[i]!;
        close(t.f, r.f, 6);
        close(t.denDf, r.denDf, 4);
        expect(Math.abs(t.p - r.p)).toBeLessThan(1e-6);
        expect(t.method).toBe('satterthwaite');
      });
      // The variety test also stands where a one-factor analysis gives it.
      expect(result.fixedTest).toEqual({ ...tests[1]!, source: 'variety' });
    });

    it('gives lme4’s fixed effects (treatment coding) from the cell means', () => {
      const treatments = [...new Set(result.adjustedMeans.map((m) => m.treatment))];
      const varieties = [...new Set(result.adjustedMeans.map((m) => m.variety))];
      const m = (t: string, v: string) =>
        result.adjustedMeans.find((x) => x.treatment === t && x.variety === v)!.mean;
      const [t0, v0] = [treatments[0]!, varieties[0]!];
      const coded = new Map<string, number>([['(Intercept)', m(t0, v0)]]);
      for (const t of treatments.slice(1)) coded.set(`treatment${t}`, m(t, v0) - m(t0, v0));
      for (const v of varieties.slice(1)) coded.set(`variety${v}`, m(t0, v) - m(t0, v0));
      for (const t of treatments.slice(1))
        for (const v of varieties.slice(1))
          coded.set(`treatment${t}:variety${v}`, m(t, v) - m(t, v0) - m(t0, v) + m(t0, v0));
      expect([...coded.keys()].sort()).toEqual(ref.fixedEffects.map((f) => f.name).sort());
      for (const f of ref.fixedEffects) close(coded.get(f.name)!, f.estimate, 6);
    });

    it('gives emmeans’ cell, treatment and variety means with their SEs and df', () => {
      expect(result.adjustedMeans).toHaveLength(ref.cellMeans.length);
      for (const r of ref.cellMeans) {
        const m = result.adjustedMeans.find(
          (x) => x.variety === r.variety && x.treatment === r.treatment,
        )!;
        close(m.mean, r.mean, 6);
        close(m.se, r.se, 6);
        close(m.df, r.df, 4);
      }
      for (const r of ref.treatmentMeans) {
        const m = result.treatmentMeans.find((x) => x.treatment === r.treatment)!;
        close(m.mean, r.mean, 6);
        close(m.se, r.se, 6);
        close(m.df, r.df, 4);
      }
      for (const r of ref.varietyMeans) {
        const m = result.varietyMeans.find((x) => x.variety === r.variety)!;
        close(m.mean, r.mean, 6);
        close(m.se, r.se, 6);
        close(m.df, r.df, 4);
        const ranked = result.means.find((x) => x.variety === r.variety)!;
        close(ranked.mean, r.mean, 6);
        close(ranked.se, r.se, 6);
      }
    });

    it('gives the simple effects of the treatment within each variety (and the reverse)', () => {
      for (const [ours, theirs] of [
        [result.treatmentWithinVariety, ref.treatmentWithinVariety],
        [result.varietyWithinTreatment, ref.varietyWithinTreatment],
      ] as const) {
        expect(ours).toHaveLength(theirs.length);
        for (const r of theirs) {
          const { e, sign } = sameEffect(ours, r);
          close(sign * e.difference, r.difference, 6);
          close(e.se, r.se, 6);
          close(e.df, r.df, 4);
          expect(Math.abs(e.p - r.p)).toBeLessThan(1e-6);
        }
      }
    });
  },
);

describe('split plot, balanced: the mixed model equals the classical strata', () => {
  // Both balanced layouts have every REML variance component positive (see their fixtures).
  for (const [mixedName, classicalName] of [
    ['balanced', 'split-plot'],
    ['oats', 'oats'],
  ] as const) {
    it(`${mixedName}: F, df and p of each test, and the simple effects`, () => {
      const ref = JSON.parse(read(`two-factor-${classicalName}.json`)) as {
        anova: {
          source: string;
          df: number;
          f: number | null;
          p: number | null;
          testedAgainst: string | null;
        }[];
        treatmentWithinVariety: Effect[];
        varietyWithinTreatment: Effect[];
      };
      const { csv } = load(mixedName);
      const result = mixed(csv);
      expect(result.varianceComponents!.every((c) => c.variance > 0)).toBe(true);
      for (const t of result.fixedTests!) {
        const line = ref.anova.find((l) => l.source === t.source)!;
        const error = ref.anova.find((l) => l.source === line.testedAgainst)!;
        expect(t.numDf).toBe(line.df);
        close(t.f, line.f!, 6);
        close(t.denDf, error.df, 4);
        expect(Math.abs(t.p - line.p!)).toBeLessThan(1e-6);
      }
      for (const [ours, theirs] of [
        [result.treatmentWithinVariety, ref.treatmentWithinVariety],
        [result.varietyWithinTreatment, ref.varietyWithinTreatment],
      ] as const)
        for (const r of theirs) {
          const { e, sign } = sameEffect(ours, r);
          close(sign * e.difference, r.difference, 6);
          close(e.se, r.se, 6);
          close(e.df, r.df, 4);
        }
    });
  }
});

describe('choosing the model for a split plot with missing plots', () => {
  const { csv } = load('missing1');
  it('gives the mixed model unless the classical one is asked for, and says why', () => {
    const r = analyzeTwoFactorCsv(csv, { factor: 'treatment', splitPlot: true, trait: 'value' });
    expect(r.model).toBe('mixed');
    expect(r.anova).toEqual([]);
    expect(r.warnings).toContain(
      "1 missing plot: the split plot's classical strata need every plot, so it is analysed by the mixed model (REML: blocks and main plots random; sequential Wald F tests in the order treatment, variety, variety × treatment with Satterthwaite's df; means are the model's, averaged with equal weights).",
    );
  });
  it('refuses the classical analysis by name, pointing to the mixed model', () => {
    const run = () =>
      analyzeTwoFactorCsv(csv, {
        factor: 'treatment',
        splitPlot: true,
        trait: 'value',
        model: 'anova',
      });
    expect(run).toThrow(AnalysisInputError);
    expect(run).toThrow(
      /missing plots \(block \/ treatment \/ variety: B1 \/ pre-plant \/ Fenwick Red\).*analysed by the mixed model \(choose the mixed model, or leave the model unset\)/,
    );
  });
  it('refuses the mixed model for a factorial in blocks', () => {
    expect(() =>
      analyzeTwoFactorCsv(csv, { factor: 'treatment', trait: 'value', model: 'mixed' }),
    ).toThrow(/the mixed model is offered for split plots/);
  });
});
