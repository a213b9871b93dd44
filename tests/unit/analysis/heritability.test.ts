// Varieties as random: variance components, BLUPs and heritability on an entry-mean basis,
// against R 4.2.2 with lme4 1.1-31, lmerTest 3.1-3 and emmeans 1.8.4-1, computed once by
// fixtures/analysis/r/heritability.R (the exact calls and versions are stored in each
// heritability-<name>.json). The heritability is Piepho & Möhring's (2007, Genetics 177:
// 1881–1888) σ²_g ÷ (σ²_g + v̄/2), v̄ the mean variance of a difference of two BLUEs.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeCsv } from '../../../server/analysis/engine/analyze.js';

const dir = path.join(import.meta.dirname, '../../../fixtures/analysis');
interface Ref {
  call: string;
  varianceComponents: { source: string; variance: number }[];
  blups: { variety: string; blup: number; predicted: number }[];
  meanVarianceOfBlueDifferences: number;
  heritability: number;
  logLik: number;
}
const ref = (name: string) =>
  JSON.parse(readFileSync(path.join(dir, `heritability-${name}.json`), 'utf8')) as Ref;
/** Relative difference, for "to n significant digits" (below 10⁻ⁿ). */
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
const csv = (file: string) => readFileSync(path.join(dir, file), 'utf8');

describe.each([
  ['network', 'mixed-network.csv'],
  ['multisite-missing', 'multisite-missing.csv'],
  ['multisite', 'multisite.csv'],
])('varieties as random on %s', (name, file) => {
  const r = ref(name);
  const result = analyzeCsv(csv(file), { model: 'mixed', varietiesRandom: true });
  const random = result.varietiesRandom!;

  it('variance components to 5 significant digits, the REML log-likelihood to 8', () => {
    const bySource = Object.fromEntries(random.varianceComponents.map((c) => [c.source, c]));
    expect(Object.keys(bySource).sort()).toEqual(r.varianceComponents.map((c) => c.source).sort());
    for (const c of r.varianceComponents)
      expect(rel(bySource[c.source]!.variance, c.variance)).toBeLessThan(1e-5);
    expect(rel(random.logLik, r.logLik)).toBeLessThan(1e-8);
  });

  it('predicted means (μ̂ + BLUP) to 6 significant digits, BLUPs to 4 decimals, best first', () => {
    for (const b of r.blups) {
      const mine = random.blups.find((x) => x.variety === b.variety)!;
      expect(rel(mine.predicted, b.predicted)).toBeLessThan(1e-6);
      expect(mine.blup).toBeCloseTo(b.blup, 4);
    }
    const predicted = random.blups.map((b) => b.predicted);
    expect(predicted).toEqual([...predicted].sort((a, b) => b - a));
  });

  // Ranks through the one ranking of every output, in the trait's direction: the order of R's
  // own predicted means, largest first when higher is better, smallest first when lower is.
  it.each(['higher', 'lower', 'none'] as const)(
    "ranks the predictions in the order of R's, %s is better",
    (direction) => {
      const ranked = analyzeCsv(csv(file), { model: 'mixed', varietiesRandom: true, direction })
        .varietiesRandom!.blups;
      const sign = direction === 'lower' ? 1 : -1;
      const order = [...r.blups].sort((a, b) => sign * (a.predicted - b.predicted));
      expect(ranked.map((b) => b.variety)).toEqual(order.map((b) => b.variety));
      expect(ranked.map((b) => b.rank)).toEqual(
        order.map((_, i) => (direction === 'none' ? null : i + 1)),
      );
    },
  );

  it('heritability and the mean variance of BLUE differences to 5 significant digits', () => {
    expect(rel(random.meanVarianceOfBlueDifferences, r.meanVarianceOfBlueDifferences)).toBeLessThan(
      1e-5,
    );
    expect(rel(random.heritability, r.heritability)).toBeLessThan(1e-5);
  });
});

it('on balanced data equals the classical entry-mean heritability σ²g ÷ (σ²g + σ²ge/s + σ²e/(rs))', () => {
  // The textbook form for s sites × r blocks (e.g. Holland, Nyquist & Cervantes-Martínez 2003,
  // Plant Breeding Reviews 22; from memory); multisite.csv is 3 sites × 3 blocks, balanced.
  const random = analyzeCsv(csv('multisite.csv'), {
    model: 'mixed',
    varietiesRandom: true,
  }).varietiesRandom!;
  const v = Object.fromEntries(random.varianceComponents.map((c) => [c.source, c.variance]));
  const classical = v.variety! / (v.variety! + v['site:variety']! / 3 + v.residual! / 9);
  expect(random.heritability).toBeCloseTo(classical, 7);
});

it('is left out, with the reason, below three entries; and not fitted unless asked', () => {
  const two = 'block,variety,value\n1,A,10\n1,B,12\n2,A,11\n2,B,14\n3,A,9\n3,B,13\n';
  const r = analyzeCsv(two, { model: 'mixed', varietiesRandom: true });
  expect(r.varietiesRandom).toBeUndefined();
  expect(r.warnings).toContain(
    'varieties as random: not fitted (varieties as random need at least 3 entries to estimate their variance)',
  );
  expect(analyzeCsv(csv('multisite.csv'), { model: 'mixed' }).varietiesRandom).toBeUndefined();
});
