// The analyze command run as a child process on fixture CSVs (fixtures/analysis).
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { repoRoot } from './nist.js';

function run(...args: string[]) {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'server/analysis/cli.ts', ...args], {
    cwd: repoRoot,
    encoding: 'utf8',
    timeout: 60_000,
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}
const fx = (name: string) => path.join('fixtures/analysis', name);

describe('analyze command', { timeout: 60_000 }, () => {
  it('prints one JSON object with the contract shape (R datasets::PlantGrowth)', () => {
    const r = run(fx('plantgrowth.csv'));
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.stdout.trim().split('\n')).toHaveLength(1);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out)).toEqual(
      expect.arrayContaining([
        'design',
        'trait',
        'alpha',
        'n',
        'grandMean',
        'cvPercent',
        'anova',
        'means',
        'lsd',
        'hsd',
        'warnings',
      ]),
    );
    expect(out.design).toBe('crd');
    expect(out.trait).toBe('value');
    expect(out.alpha).toBe(0.05);
    expect(out.n).toBe(30);
    // R: aov(weight ~ group, PlantGrowth): F = 4.846087862380136, residual MS 0.3885959259259259.
    expect(out.anova.map((l: { source: string }) => l.source)).toEqual([
      'variety',
      'residual',
      'total',
    ]);
    expect(out.anova[0].f).toBeCloseTo(4.846087862380136, 10);
    expect(out.anova[0].testedAgainst).toBe('residual');
    expect(out.anova[1]).toMatchObject({ df: 27, f: null, p: null, testedAgainst: null });
    expect(out.anova[2]).toMatchObject({ df: 29, ms: null, f: null, p: null, testedAgainst: null });
    expect(out.cvPercent).toBeCloseTo((100 * Math.sqrt(0.3885959259259259)) / 5.073, 10);
    expect(out.means.map((m: { variety: string }) => m.variety)).toEqual(['trt2', 'ctrl', 'trt1']);
    expect(out.means[0]).toMatchObject({ variety: 'trt2', n: 10, rank: 1, group: 'a' });
    expect(out.means[0].se).toBeCloseTo(out.means[0].sd / Math.sqrt(10), 14);
    expect(out.lsd.df).toBe(27);
    expect(out.hsd.q).toBeCloseTo(3.50642612339269, 8); // R qtukey(0.95, 3, 27)
    expect(out.lsd.t).toBeCloseTo(2.05183051648029, 8); // R qt(0.975, 27)
    expect(out.warnings).toEqual([]);
  });

  it('chooses multisite from site and block columns, with --alpha and --trait', () => {
    const r = run(fx('multisite.csv'), '--trait', 'value', '--alpha', '0.01');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.design).toBe('multisite');
    expect(out.alpha).toBe(0.01);
    expect(out.anova.map((l: { source: string }) => l.source)).toEqual([
      'site',
      'block',
      'variety',
      'site:variety',
      'residual',
      'total',
    ]);
    const ref = JSON.parse(readFileSync(path.join(repoRoot, fx('multisite.json')), 'utf8'));
    expect(out.anova[2].f).toBeCloseTo(ref.varietyF, 10);
    expect(out.lsd.df).toBe(8);
    expect(out.hsd.value).not.toBeNull();
  });

  it('--design rcbd on the npk subset', () => {
    const r = run(fx('npk-rcbd.csv'), '--design', 'rcbd');
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).design).toBe('rcbd');
  });

  it('--model mixed adds the REML fields beside the present ones (lme4/lmerTest fixture)', () => {
    // Reference: fixtures/analysis/mixed-network.json (R lme4 + lmerTest, call stored there).
    const ref = JSON.parse(readFileSync(path.join(repoRoot, fx('mixed-network.json')), 'utf8'));
    const r = run(fx('mixed-network.csv'), '--model', 'mixed');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.model).toBe('mixed');
    expect(out.fixedTest.method).toBe('satterthwaite');
    expect(Math.abs(out.fixedTest.denDf - ref.fixedTest.denDf) / ref.fixedTest.denDf).toBeLessThan(
      1e-4,
    );
    expect(Math.abs(out.logLik - ref.logLik)).toBeLessThan(1e-6);
    expect(out.boundary).toBe(false);
    expect(out.varianceComponents.map((c: { source: string }) => c.source)).toEqual([
      'site',
      'residual',
    ]);
    expect(out.means).toHaveLength(12);
    expect(out.anova.map((l: { source: string }) => l.source)).toContain('variety');
  });

  it('names the rows left out for having no value', () => {
    const r = run(fx('cli/missing-values.csv'));
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.n).toBe(7);
    expect(out.warnings).toContain('rows 7, 9 have no value: 2 rows left out');
  });

  // The file is two-factor-factorial.csv (4 blocks × 2 treatments × 4 varieties = 32 cells) with
  // the B2 / pre-plant / Sallow Bay row removed and a second B3 / none / Amberlow row added: 32
  // rows, one cell empty and one holding two plots, counted by hand from the file.
  it.each([
    ['a factorial', [], 'anova'],
    ['a split plot', ['--split-plot'], 'mixed'],
  ])(
    'counts the empty cell of %s with one cell doubled and one missing',
    (_label, extra, model) => {
      const r = run(
        fx('cli/two-factor-doubled-and-missing.csv'),
        '--factor',
        'treatment',
        ...extra,
      );
      expect(r.stderr).toBe('');
      expect(r.code).toBe(0);
      const out = JSON.parse(r.stdout);
      expect(out.model).toBe(model);
      expect(out.n).toBe(32);
      expect(out.counts).toMatchObject({ rows: 32, blocks: 4, treatments: 2, missingPlots: 1 });
      expect(out.warnings.filter((w: string) => w.startsWith('1 missing plot:'))).toHaveLength(1);
    },
  );

  const bad: [string, string[], RegExp][] = [
    ['empty file', [fx('cli/empty.csv')], /empty/],
    ['header only', [fx('cli/header-only.csv')], /no data rows/],
    ['no variety column', [fx('cli/no-variety.csv')], /column "variety": not found/],
    [
      'a non-number',
      [fx('cli/not-number.csv')],
      /^.*row 5, column "yield": "abc" is not a number$/,
    ],
    ['a single entry', [fx('cli/single-entry.csv')], /column "variety": only one entry/],
    ['no residual df', [fx('cli/no-residual.csv')], /no residual degrees of freedom/],
    ['two value columns without --trait', [fx('cli/two-traits.csv')], /several value columns/],
    ['unknown --trait', [fx('plantgrowth.csv'), '--trait', 'height'], /column "height": not found/],
    ['unknown option', [fx('plantgrowth.csv'), '--colour', 'red'], /Unknown option '--colour'/],
    ['bad --alpha', [fx('plantgrowth.csv'), '--alpha', '2'], /--alpha/],
    ['bad --design', [fx('plantgrowth.csv'), '--design', 'latin'], /--design/],
    [
      'bad --model',
      [fx('plantgrowth.csv'), '--model', 'bayes'],
      /--model: "bayes" is not anova or mixed/,
    ],
    [
      'a mixed model with no gardens or blocks',
      [fx('plantgrowth.csv'), '--model', 'mixed'],
      /needs a site or block column/,
    ],
    [
      'rcbd without blocks',
      [fx('plantgrowth.csv'), '--design', 'rcbd'],
      /column "block": required/,
    ],
    ['missing file', [fx('cli/nope.csv')], /cannot read file/],
    // 1e400 overflows a double (IEEE 754 binary64 largest finite ~1.8e308); 1e-400 underflows to 0.
    [
      'a value too large to analyse',
      [fx('cli/too-large.csv')],
      /row 4, column "yield": 1e400 is too large to analyse/,
    ],
    [
      'a nonzero value too small to analyse',
      [fx('cli/too-small.csv')],
      /row 5, column "yield": -1e-400 is too small to analyse/,
    ],
    [
      'a file separated by semicolons',
      [fx('cli/semicolons.csv')],
      /\(the header row is separated by semicolons, not commas/,
    ],
    [
      'a file separated by tabs',
      [fx('cli/tabs.csv')],
      /not found in the header \(the header row is separated by tabs, not commas/,
    ],
  ];
  for (const [label, args, pattern] of bad) {
    it(`exits non-zero with one line on stderr: ${label}`, () => {
      const r = run(...args);
      expect(r.code).not.toBe(0);
      expect(r.stdout).toBe('');
      const lines = r.stderr.split('\n').filter((l) => l !== '');
      expect(lines).toHaveLength(1);
      expect(lines[0]).toMatch(pattern);
    });
  }
});
