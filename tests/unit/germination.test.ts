import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { germinationRate, wilsonInterval } from '../../common/germination.js';
import { repoRoot } from './analysis/nist.js';

interface Case {
  germinated: number;
  tested: number;
  lower: number;
  upper: number;
}
const reference = JSON.parse(
  readFileSync(path.join(repoRoot, 'fixtures/germination/wilson.json'), 'utf8'),
) as { cases: Case[] };

describe('germination rate with the 95 % Wilson score interval', () => {
  // Worked examples of the score interval without continuity correction (Newcombe R.G. 1998,
  // "Two-sided confidence intervals for the single proportion: comparison of seven methods",
  // Statistics in Medicine 17:857–872, method 3); the four-decimal values are quoted from
  // memory of that paper's table, and R's prop.test (the fixture below) agrees with each.
  it.each([
    [81, 263, 0.2553, 0.3662],
    [15, 148, 0.0624, 0.1605],
    [0, 20, 0, 0.1611],
    [1, 29, 0.0061, 0.1718],
  ])('%i of %i: %f to %f (Newcombe 1998)', (x, n, lower, upper) => {
    const ci = wilsonInterval(x, n);
    expect(ci.lower).toBeCloseTo(lower, 4);
    expect(ci.upper).toBeCloseTo(upper, 4);
  });

  // R 4.2.2 prop.test(x, n, correct = FALSE), stored in fixtures/germination/wilson.json.
  it.each(reference.cases)('$germinated of $tested equals R to 12 significant digits', (c) => {
    const ci = wilsonInterval(c.germinated, c.tested);
    const close = (a: number, b: number) => (b === 0 ? Math.abs(a) : Math.abs(a - b) / b);
    expect(close(ci.lower, c.lower)).toBeLessThan(1e-12);
    expect(close(ci.upper, c.upper)).toBeLessThan(1e-12);
  });

  it('reads as percentages and stays inside 0–100 %', () => {
    // 47 of 50: R's prop.test(47, 50, correct = FALSE) in fixtures/germination/wilson.json.
    const rate = germinationRate(47, 50);
    expect(rate.percent).toBe(94);
    expect(rate.lowerPercent).toBeCloseTo(83.78, 2);
    expect(rate.upperPercent).toBeCloseTo(97.94, 2);
    expect(germinationRate(50, 50).upperPercent).toBe(100);
    expect(germinationRate(0, 50).lowerPercent).toBe(0);
  });

  it('refuses counts that cannot be a germination test', () => {
    expect(() => wilsonInterval(5, 0)).toThrow(RangeError);
    expect(() => wilsonInterval(11, 10)).toThrow(RangeError);
    expect(() => wilsonInterval(2.5, 10)).toThrow(RangeError);
  });
});
