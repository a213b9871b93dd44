// Two-factor trials (treatment × variety) against R 4.2.2 with emmeans 1.8.4.1, computed once
// by fixtures/analysis/r/two-factor.R (the exact calls and versions are stored in each
// two-factor-<name>.json): a factorial in complete blocks, aov(value ~ block + treatment *
// variety); a split plot with the treatment on main plots, strata from aov(... +
// Error(block/treatment)) and means from emmeans with blocks fixed; and the published split
// plot nlme::Oats (Yates 1935). The factorial with one and with two plots lost is checked against
// fixtures/analysis/r/two-factor-unbalanced.R: anova(lm(value ~ block + treatment * variety))
// (sequential SS) and emmeans on that fit. Agreement: sums of squares, means and SEs to 6
// significant digits, df to 4, p to an absolute 1e-6.
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  AnalysisInputError,
  analyzeTwoFactorCsv,
} from '../../../server/analysis/engine/analyze.js';
import { repoRoot } from './nist.js';

interface Ref {
  splitPlot: boolean;
  call: string;
  anova: {
    source: string;
    df: number;
    ss: number;
    ms: number;
    f: number | null;
    p: number | null;
    testedAgainst: string | null;
  }[];
  cellMeans: { variety: string; treatment: string; mean: number; se: number; df: number }[];
  treatmentMeans: { treatment: string; mean: number; se: number; df: number }[];
  varietyMeans: { variety: string; mean: number; se: number; df: number }[];
  treatmentWithinVariety: Effect[];
  varietyWithinTreatment: Effect[];
}
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
const dir = path.join(repoRoot, 'fixtures/analysis');
const load = (name: string) => ({
  ref: JSON.parse(readFileSync(path.join(dir, `two-factor-${name}.json`), 'utf8')) as Ref,
  csv: readFileSync(path.join(dir, `two-factor-${name}.csv`), 'utf8'),
});
const close = (actual: number, expected: number, digits: number) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(
    Math.max(Math.abs(expected), 1e-300) * 10 ** -digits,
  );

describe.each(['factorial', 'split-plot', 'oats', 'factorial-missing1', 'factorial-missing2'])(
  'two-factor trial: %s',
  (name) => {
    const { ref, csv } = load(name);
    const result = analyzeTwoFactorCsv(csv, {
      factor: 'treatment',
      splitPlot: ref.splitPlot,
      trait: 'value',
    });

    it('has R’s error strata: each source, df, SS, F, p and what it is tested against', () => {
      const lines = result.anova.filter((l) => l.source !== 'total');
      expect(lines.map((l) => [l.source, l.df, l.testedAgainst])).toEqual(
        ref.anova.map((l) => [l.source, l.df, l.testedAgainst]),
      );
      lines.forEach((l, i) => {
        const r = ref.anova[i]!;
        close(l.ss, r.ss, 6);
        if (r.f === null) expect(l.f).toBeNull();
        else {
          close(l.f!, r.f, 6);
          expect(Math.abs(l.p! - r.p!)).toBeLessThan(1e-6);
        }
      });
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
        // The ranked variety means carry the same numbers.
        close(result.means.find((x) => x.variety === r.variety)!.mean, r.mean, 6);
      }
    });

    it('gives the simple effects with the SE and df of each kind of comparison', () => {
      for (const [ours, theirs] of [
        [result.treatmentWithinVariety, ref.treatmentWithinVariety],
        [result.varietyWithinTreatment, ref.varietyWithinTreatment],
      ] as const) {
        expect(ours).toHaveLength(theirs.length);
        for (const r of theirs) {
          // Levels come in the file's order here and sorted in R: a pair may be the other way round.
          const e = ours.find(
            (x) =>
              x.within === r.within &&
              ((x.a === r.a && x.b === r.b) || (x.a === r.b && x.b === r.a)),
          )!;
          close(e.a === r.a ? e.difference : -e.difference, r.difference, 6);
          close(e.se, r.se, 6);
          close(e.df, r.df, 4);
          expect(Math.abs(e.p - r.p)).toBeLessThan(1e-6);
        }
      }
    });
  },
);

describe('two-factor trials the classical analysis cannot take', () => {
  const { csv } = load('split-plot');
  it('refuses a missing plot, naming its block, treatment and variety', () => {
    const lines = csv.trim().split('\n');
    const without = [lines[0], ...lines.slice(2)].join('\n');
    // The classical strata asked for by name (by default the mixed model takes it).
    const classical = {
      factor: 'treatment',
      splitPlot: true,
      trait: 'value',
      model: 'anova',
    } as const;
    expect(() => analyzeTwoFactorCsv(without, classical)).toThrow(AnalysisInputError);
    expect(() => analyzeTwoFactorCsv(without, classical)).toThrow(
      /missing plots \(block \/ treatment \/ variety: B1 \/ none \/ Amberlow\)/,
    );
  });
  it('names the treatment as the sheet does in its refusals', () => {
    const lines = csv.trim().split('\n');
    const renamed = [lines[0]!.replace('treatment', 'Mulch'), ...lines.slice(2)].join('\n');
    const classical = { factor: 'Mulch', splitPlot: true, trait: 'value', model: 'anova' } as const;
    expect(() => analyzeTwoFactorCsv(renamed, classical)).toThrow(
      /missing plots \(block \/ Mulch \/ variety: B1 \/ none \/ Amberlow\)/,
    );
    const oneLevel = [lines[0], ...lines.slice(1).filter((l) => l.includes(',none,'))]
      .join('\n')
      .replace('treatment', 'Mulch');
    expect(() => analyzeTwoFactorCsv(oneLevel, { factor: 'Mulch', trait: 'value' })).toThrow(
      'Mulch has only one level ("none")',
    );
  });
  it('says a factorial that lost plots is fitted by least squares, and counts them', () => {
    const { csv: lost } = load('factorial-missing2');
    const r = analyzeTwoFactorCsv(lost, { factor: 'treatment', trait: 'value' });
    expect(r.method).toBe('least-squares');
    expect(r.counts.missingPlots).toBe(2);
    expect(r.warnings).toContain(
      '2 missing plots: sequential sums of squares in the order block, treatment, variety, variety × treatment; means are least-squares means averaged over blocks.',
    );
  });
  // A cell that lost every plot has no estimable mean (from memory: Searle, Linear Models for
  // Unbalanced Data, 1987, on empty cells), so both engines that take lost plots refuse it alike.
  it('refuses a variety × treatment cell with no plot left, by least squares and by the mixed model', () => {
    const lines = csv.trim().split('\n');
    const without = lines.filter((l) => !/^B\d+,none,Amberlow,/.test(l)).join('\n');
    expect(without.split('\n').length).toBeLessThan(lines.length - 1);
    const message = /no plot left of Amberlow \/ none: a cell without plots has no mean/;
    for (const options of [
      { factor: 'treatment', trait: 'value' },
      { factor: 'treatment', splitPlot: true, trait: 'value', model: 'mixed' },
    ] as const) {
      expect(() => analyzeTwoFactorCsv(without, options)).toThrow(AnalysisInputError);
      expect(() => analyzeTwoFactorCsv(without, options)).toThrow(message);
    }
  });
  it('refuses a factor column that is not there', () => {
    expect(() => analyzeTwoFactorCsv(csv, { factor: 'irrigation', trait: 'value' })).toThrow(
      /column "irrigation": not found/,
    );
  });
});

describe('the analyze command with --factor and --split-plot', () => {
  it('prints the same strata, cell means and treatment means as the engine', () => {
    const file = path.join(dir, 'two-factor-oats.csv');
    const run = spawnSync(
      process.execPath,
      ['--import', 'tsx', 'server/analysis/cli.ts', file, '--factor', 'treatment', '--split-plot'],
      { encoding: 'utf8', timeout: 60_000, cwd: repoRoot },
    );
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    const { ref, csv } = load('oats');
    const engine = JSON.parse(
      JSON.stringify(analyzeTwoFactorCsv(csv, { factor: 'treatment', splitPlot: true })),
    );
    expect(out).toEqual(engine);
    expect(out.anova.find((l: { source: string }) => l.source === 'treatment').testedAgainst).toBe(
      'block:treatment',
    );
    expect(out.adjustedMeans).toHaveLength(ref.cellMeans.length);
    expect(Object.keys(out.treatmentMeans[0]).sort()).toEqual(['df', 'mean', 'se', 'treatment']);
  }, 60_000);
});
