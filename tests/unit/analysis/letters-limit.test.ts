// Letters and critical values at sizes and tails where the plain algorithms give out: the
// letter display is given up (and says so) instead of exhausting memory or time, and the
// studentized range quantile is found where jstat's own inverse stops.
import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { analyzePlotRows, type PlotRow } from '../../../server/analysis/engine/analyze';
import { studentizedRangeQuantile } from '../../../server/analysis/engine/distributions';
import { compactLetters, compactLettersWithin } from '../../../server/analysis/engine/letters';
import { separateMeans } from '../../../server/analysis/engine/mean-separation';

describe('letters within a work limit', () => {
  it('6,000 entries: no table of pairs, letters given up with a reason, ranks still there', () => {
    // Means 0, 1, 2, … with a tiny error: every pair is separated, the worst case for letters.
    const k = 6000;
    const means = Array.from({ length: k }, (_, i) => ({ entry: `E${i}`, mean: i, n: 3 }));
    const before = process.memoryUsage().heapUsed;
    const sep = separateMeans(means, 1e-6, 2 * k, 0.05, 0.001);
    const grown = process.memoryUsage().heapUsed - before;
    expect(sep.pairs).toBeUndefined();
    expect(sep.lettersOmitted).toMatch(/letters not computed: with 6000 entries/);
    expect(sep.warnings).toContain(sep.lettersOmitted);
    expect(sep.ranked).toHaveLength(k);
    expect(sep.ranked[0]).toMatchObject({ entry: 'E5999', rank: 1, hsdGroup: '', lsdGroup: '' });
    // k² booleans alone would be 36 million values; what is kept stays near linear in k.
    expect(grown).toBeLessThan(200 * 1024 * 1024);
  });

  it('a limit that is enough gives the same letters as no limit (hand-checked chain)', () => {
    const sep = new Set(['0-2', '0-3', '1-3']);
    const separated = (i: number, j: number) => sep.has(`${Math.min(i, j)}-${Math.max(i, j)}`);
    expect(compactLettersWithin([0, 1, 2, 3], separated, 1_000)).toEqual(['a', 'ab', 'bc', 'c']);
    expect(compactLettersWithin([0, 1, 2, 3], separated, 3)).toBeNull();
    expect(compactLetters([0, 1, 2, 3], separated)).toEqual(['a', 'ab', 'bc', 'c']);
  });

  it('analysis past the letter limit still gives the ANOVA and the means, and says why', () => {
    const rows: PlotRow[] = [];
    for (let e = 0; e < 30; e++)
      for (let r = 0; r < 3; r++) rows.push({ variety: `V${e}`, value: e * 10 + r });
    const full = analyzePlotRows(rows);
    const cut = analyzePlotRows(rows, { letterWorkLimit: 100 });
    expect(full.lettersOmitted).toBeNull();
    expect(cut.lettersOmitted).toMatch(/letters not computed/);
    expect(cut.warnings).toContain(cut.lettersOmitted);
    expect(cut.anova).toEqual(full.anova);
    expect(cut.means.map((m) => [m.variety, m.mean, m.rank])).toEqual(
      full.means.map((m) => [m.variety, m.mean, m.rank]),
    );
    expect(cut.means.every((m) => m.group === '')).toBe(true);
  });

  it('rows and entries beyond the limits are refused, naming the limit', () => {
    const rows: PlotRow[] = [];
    for (let e = 0; e < 5; e++)
      for (let r = 0; r < 2; r++) rows.push({ variety: `V${e}`, value: e + r });
    expect(() => analyzePlotRows(rows, { limits: { maxRows: 9 } })).toThrow(
      'The data has 10 rows; the limit is 9 rows per analysis.',
    );
    expect(() => analyzePlotRows(rows, { limits: { maxEntries: 4 } })).toThrow(
      'The data has 5 entries (varieties); the limit is 4 entries per analysis.',
    );
  });
});

describe('studentized range quantile', () => {
  it('agrees with the published table where jstat converges', () => {
    // q(0.05; k = 3, df = 10) = 3.877 (Harter 1960 studentized range tables, as reprinted in
    // experimental design texts; from memory).
    expect(studentizedRangeQuantile(0.95, 3, 10)).toBeCloseTo(3.877, 2);
  });

  it('is still found where jstat reports "failed to converge"', () => {
    // Many means at a large alpha, and a small alpha with few error df: jstat's inverse throws.
    for (const [p, k, df] of [
      [0.5, 50, 100],
      [0.0001, 20, 2],
    ] as const) {
      expect(() => jStat.tukey.inv(p, k, df)).toThrow(/failed to converge/);
      const q = studentizedRangeQuantile(p, k, df);
      expect(Number.isFinite(q)).toBe(true);
      // Round trip through the cdf (the definition of a quantile).
      expect(jStat.tukey.cdf(q, k, df)).toBeCloseTo(p, 6);
    }
  });

  it('an alpha beyond what the cdf resolves is an input error, not a fault', () => {
    const rows: PlotRow[] = [];
    // 50 entries × 3 plots: 100 error df, where the cdf cannot resolve a 1e-12 upper tail.
    for (let e = 0; e < 50; e++)
      for (let r = 0; r < 3; r++) rows.push({ variety: `V${e}`, value: e + r / 10 });
    expect(() => analyzePlotRows(rows, { alpha: 1e-12 })).toThrow(
      /HSD critical value cannot be computed at alpha = 1e-12/,
    );
  });
});
