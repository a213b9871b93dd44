// Stability across environments against R 4.2.2's lm() on the same balanced subset, computed once
// by fixtures/analysis/r/stability.R (the call and version are in each stability-<name>.json).
// Methods: regression on the environment index (Finlay and Wilkinson 1963), deviation mean
// square (Eberhart and Russell 1966), ecovalence (Wricke 1962). Agreement: 9 significant digits.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import {
  StabilityInputError,
  stabilityAnalysis,
  type EnvironmentMean,
} from '../../../server/analysis/engine/stability.js';
import { repoRoot } from './nist.js';

interface Ref {
  pooledErrorOfMean: number;
  usedVarieties: string[];
  usedEnvironments: string[];
  grandMean: number;
  environments: { environment: string; mean: number; index: number }[];
  varieties: Record<string, number | string>[];
}

const dir = path.join(repoRoot, 'fixtures/analysis');
function load(name: string): { ref: Ref; cells: EnvironmentMean[] } {
  const ref = JSON.parse(readFileSync(path.join(dir, `stability-${name}.json`), 'utf8')) as Ref;
  const rows = parse(readFileSync(path.join(dir, `stability-${name}.csv`), 'utf8'), {
    columns: true,
  }) as { variety: string; environment: string; mean: string }[];
  return { ref, cells: rows.map((r) => ({ ...r, mean: Number(r.mean) })) };
}
const digits9 = (actual: number, expected: number) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(
    1e-9 * Math.max(Math.abs(expected), 1e-300),
  );

const figures = [
  'mean',
  'slope',
  'slopeSe',
  'rSquared',
  'slopeVersusOneT',
  'slopeVersusOneP',
  'deviationMs',
  'deviationVariance',
  'ecovalence',
] as const;

describe.each(['balanced', 'gaps'])('stability on the %s fixture', (name) => {
  const { ref, cells } = load(name);
  const result = stabilityAnalysis(cells, { pooledErrorOfMean: ref.pooledErrorOfMean });

  it('uses the same balanced subset as the reference', () => {
    expect(result.usedVarieties).toEqual(ref.usedVarieties);
    expect(result.usedEnvironments).toEqual(ref.usedEnvironments);
  });

  it('gives the grand mean and each environment index as R does', () => {
    digits9(result.grandMean, ref.grandMean);
    ref.environments.forEach((e, j) => {
      const got = result.environments[j]!;
      expect(got.environment).toBe(e.environment);
      digits9(got.mean, e.mean);
      digits9(got.index, e.index);
    });
  });

  it('gives every variety figure as lm() does, to 9 significant digits', () => {
    ref.varieties.forEach((v, i) => {
      const got = result.varieties[i]!;
      expect(got.variety).toBe(v.variety);
      expect(got.deviationDf).toBe(v.deviationDf);
      for (const f of figures) digits9(got[f] as number, v[f] as number);
    });
  });

  it('splits the whole variety × environment sum of squares into the ecovalences', () => {
    const total = result.varieties.reduce((s, v) => s + v.ecovalenceShare, 0);
    expect(total).toBeCloseTo(1, 12);
  });
});

describe('stability: which data it uses', () => {
  const { cells } = load('gaps');
  const result = stabilityAnalysis(cells);

  it('names what it left out and why', () => {
    expect(result.excludedVarieties).toEqual([
      { name: 'Hollis Red', reason: 'grown in 2 environments; stability needs at least 3' },
      { name: 'Goldhill', reason: 'not grown in every environment of the balanced subset' },
    ]);
    expect(result.excludedEnvironments).toEqual([
      {
        name: '2026 Upper Terrace',
        reason: 'not every variety of the balanced subset was grown here',
      },
    ]);
  });

  it('gives no s²d without the pooled error of a mean', () => {
    expect(result.varieties.every((v) => v.deviationVariance === null)).toBe(true);
  });

  it('refuses a cell given twice and too few environments, with a message', () => {
    expect(() => stabilityAnalysis([...cells, cells[0]!])).toThrow(/given twice/);
    const two = cells.filter((c) => c.environment.startsWith('2024'));
    expect(() => stabilityAnalysis(two)).toThrow(StabilityInputError);
  });
});
