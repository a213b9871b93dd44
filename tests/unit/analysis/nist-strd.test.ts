// Certified values: NIST StRD one-way ANOVA sets (https://www.itl.nist.gov/div898/strd/anova/),
// copies in fixtures/analysis/nist-strd-anova. Accuracy measured by the log relative error.
import { describe, expect, it } from 'vitest';
import {
  analyzeCsv,
  analyzePlotRows,
  type AnalysisResult,
} from '../../../server/analysis/engine/analyze.js';
import { lre, readNistSet, type NistSet } from './nist.js';

function check(result: AnalysisResult, set: NistSet, minLre: number) {
  const c = set.certified;
  const between = result.anova.find((l) => l.source === 'variety')!;
  const within = result.anova.find((l) => l.source === 'residual')!;
  // df are integers and must match exactly.
  expect(between.df).toBe(c.betweenDf);
  expect(within.df).toBe(c.withinDf);
  const got = {
    betweenSs: lre(between.ss, c.betweenSs),
    betweenMs: lre(between.ms!, c.betweenMs),
    f: lre(between.f!, c.f),
    withinSs: lre(within.ss, c.withinSs),
    withinMs: lre(within.ms!, c.withinMs),
    rSquared: lre(between.ss / (between.ss + within.ss), c.rSquared),
    residualSd: lre(Math.sqrt(within.ms!), c.residualSd),
  };
  for (const [name, value] of Object.entries(got)) {
    expect(value, `${set.name} ${name} LRE`).toBeGreaterThanOrEqual(minLre);
  }
}

const rowsOf = (set: NistSet) => set.data.map((d) => ({ variety: d.level, value: d.response }));
const csvOf = (set: NistSet) =>
  'variety,response\n' + set.data.map((d) => `${d.level},${d.response}`).join('\n') + '\n';

// Thresholds: LRE >= 11 for the lower-difficulty sets, >= 9 for AtmWtAg (average difficulty).
const sets: [string, number][] = [
  ['SiRstv.dat', 11],
  ['SmLs01.dat', 11],
  ['SmLs02.dat', 11],
  ['SmLs03.dat', 11],
  ['AtmWtAg.dat', 9],
];

describe('NIST StRD one-way ANOVA, certified values', () => {
  for (const [file, minLre] of sets) {
    const set = readNistSet(file);
    it(`${set.name}: data parse matches the stated observation count`, () => {
      expect(set.data.length).toBe(set.observations);
    });
    it(`${set.name}: group-means path, LRE >= ${minLre}`, () => {
      const r = analyzePlotRows(rowsOf(set), { design: 'crd' });
      expect(r.method).toBe('means');
      check(r, set, minLre);
    });
    it(`${set.name}: least-squares (QR) path, LRE >= ${minLre}`, () => {
      const r = analyzePlotRows(rowsOf(set), { design: 'crd', method: 'least-squares' });
      expect(r.method).toBe('least-squares');
      check(r, set, minLre);
    });
    it(`${set.name}: through the CSV-level function with the data text`, () => {
      check(analyzeCsv(csvOf(set)), set, minLre);
    });
  }
});

// SmLs04-09 are not in the folder. Its README says SmLs04-06 use the SmLs01-03 design with
// responses near 1000000.x and SmLs07-09 near 1000000000000.x. From memory, NIST built them
// by putting the constant in front of the SmLs01-03 responses (1.3 -> 1000000.3 and
// 1000000000000.3), so their certified SS and F equal SmLs01-03's (shift-invariant).
describe('SmLs04/07-style data (constant leading digits) keep all digits', () => {
  const base = readNistSet('SmLs01.dat');
  const shifted = (prefix: string): NistSet => ({
    ...base,
    data: base.data.map((d) => {
      expect(d.response.startsWith('1.')).toBe(true);
      return { level: d.level, response: prefix + d.response.slice(1) };
    }),
  });
  for (const [label, prefix] of [
    ['SmLs04-style (7 shared digits)', '1000000'],
    ['SmLs07-style (13 shared digits)', '1000000000000'],
  ] as const) {
    it(`${label}: equals SmLs01 certified values to LRE >= 11`, () => {
      const set = shifted(prefix);
      expect(set.data[1]!.response).toBe(`${prefix}.3`);
      check(analyzeCsv(csvOf(set)), base, 11);
      check(analyzePlotRows(rowsOf(set), { method: 'least-squares' }), base, 11);
    });
  }
  it('SmLs07-style: grand mean keeps its decimals', () => {
    const r = analyzeCsv(csvOf(shifted('1000000000000')));
    const plain = analyzeCsv(csvOf(base));
    // Mean of SmLs01 is 1.4 exactly (symmetric design), so the shifted mean is 1000000000000.4.
    expect(plain.grandMean).toBeCloseTo(1.4, 14);
    expect(r.grandMean).toBe(1000000000000.4);
  });
  it('one-pass textbook formula fails on the SmLs07-style data (the test would catch it)', () => {
    const ys = shifted('1000000000000').data.map((d) => Number(d.response));
    const n = ys.length;
    const sum = ys.reduce((a, b) => a + b, 0);
    const ss = ys.reduce((a, b) => a + b * b, 0) - (sum * sum) / n;
    expect(lre(ss, base.certified.betweenSs + base.certified.withinSs)).toBeLessThan(3);
  });
});
