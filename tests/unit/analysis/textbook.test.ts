// Textbook worked example and hand-sized cases for the ANOVA and mean separation.
import { describe, expect, it } from 'vitest';
import { analyzeCsv, analyzePlotRows } from '../../../server/analysis/engine/analyze.js';

describe('textbook worked example', () => {
  // Plasma etch rate (Å/min) at four RF power settings, 5 runs each: D. C. Montgomery,
  // "Design and Analysis of Experiments", Example 3.1 (from memory). Stated ANOVA:
  // SS treatments 66 870.55 (df 3), SS error 5 339.20 (df 16), total 72 209.75, F = 66.80.
  const csv = [
    'variety,etch',
    ...['575', '542', '530', '539', '570'].map((v) => `160 W,${v}`),
    ...['565', '593', '590', '579', '610'].map((v) => `180 W,${v}`),
    ...['600', '651', '610', '637', '629'].map((v) => `200 W,${v}`),
    ...['725', '700', '715', '685', '710'].map((v) => `220 W,${v}`),
  ].join('\n');
  it('reproduces the stated ANOVA', () => {
    const r = analyzeCsv(csv);
    const [v, e, t] = r.anova;
    expect(v).toMatchObject({ source: 'variety', df: 3 });
    expect(v!.ss).toBeCloseTo(66870.55, 8);
    expect(e!.ss).toBeCloseTo(5339.2, 8);
    expect(t!.ss).toBeCloseTo(72209.75, 8);
    expect(v!.f!).toBeCloseTo(66.8, 1);
    expect(r.means.map((m) => m.mean)).toEqual([707, 625.4, 587.4, 551.2]);
    expect(r.means.map((m) => m.group)).toEqual(['a', 'b', 'c', 'd']);
  });
});

describe('hand-sized cases', () => {
  it('unbalanced crd: hand-computed sums of squares, null LSD/HSD, Tukey-Kramer pairs', () => {
    // A: 1, 2, 3 (mean 2); B: 5, 7 (mean 6). Grand mean 18/5 = 3.6.
    // SS variety = 3·1.6² + 2·2.4² = 19.2; residual = 2 + 2 = 4 (df 3); MS 4/3.
    const r = analyzeCsv('variety,y\nA,1\nA,2\nA,3\nB,5\nB,7\n', { includePairs: true });
    expect(r.anova[0]!.ss).toBeCloseTo(19.2, 13);
    expect(r.anova[1]!.ss).toBeCloseTo(4, 13);
    expect(r.anova[1]!.ms).toBeCloseTo(4 / 3, 13);
    expect(r.lsd.value).toBeNull();
    expect(r.hsd.value).toBeNull();
    expect(r.pairs![0]!.se).toBeCloseTo(Math.sqrt((4 / 3) * (1 / 3 + 1 / 2)), 13);
    expect(r.warnings.some((w) => w.startsWith('unequal replication'))).toBe(true);
    expect(r.method).toBe('means');
    const qr = analyzeCsv('variety,y\nA,1\nA,2\nA,3\nB,5\nB,7\n', { method: 'least-squares' });
    expect(qr.anova[0]!.ss).toBeCloseTo(19.2, 12);
  });

  it('rcbd with a missing plot keeps the other plots of that block', () => {
    // 3 blocks × 3 varieties, plot (block 3, C) missing: 8 plots, residual df 8 − 1 − 2 − 2 = 3.
    const rows = [
      ['1', 'A', '10'],
      ['1', 'B', '12'],
      ['1', 'C', '15'],
      ['2', 'A', '11'],
      ['2', 'B', '14'],
      ['2', 'C', '16'],
      ['3', 'A', '9'],
      ['3', 'B', '13'],
    ].map(([block, variety, value]) => ({ block, variety: variety!, value: value! }));
    const r = analyzePlotRows(rows);
    expect(r.design).toBe('rcbd');
    expect(r.method).toBe('least-squares');
    expect(r.anova.map((l) => l.df)).toEqual([2, 2, 3, 7]);
    expect(r.counts.missingPlots).toBe(1);
    const ss = r.anova.map((l) => l.ss);
    expect(ss[0]! + ss[1]! + ss[2]!).toBeCloseTo(ss[3]!, 12);
  });

  it('alpha other than 0.05 changes the critical values and letters consistently', () => {
    const csv =
      'variety,y\n' +
      ['A,10', 'A,11', 'A,12', 'B,12', 'B,13', 'B,14', 'C,14', 'C,15', 'C,16'].join('\n');
    const a05 = analyzeCsv(csv);
    const a20 = analyzeCsv(csv, { alpha: 0.2 });
    expect(a20.alpha).toBe(0.2);
    expect(a20.lsd.value!).toBeLessThan(a05.lsd.value!);
    expect(a20.hsd.value!).toBeLessThan(a05.hsd.value!);
    // MS = 1, m = 3: LSD = t·√(2/3). Differences of 2 vs LSD(0.05, 6 df) = 2.4469·0.8165 = 1.998.
    expect(a05.lsd.value!).toBeCloseTo(2.446911851 * Math.sqrt(2 / 3), 7);
  });

  it('a value that is not a number names row and column (spreadsheet rows)', () => {
    expect(() => analyzeCsv('variety,yield\nA,1\nB,x1\n')).toThrow(
      'row 3, column "yield": "x1" is not a number',
    );
  });
});
