// Student t quantiles and t / F tail probabilities against R 4.2.2's qt, pt and pf (base R),
// computed once by fixtures/analysis/r/distributions.R into fixtures/analysis/distributions.json
// (R version and call stored there). The grid covers df 1–10,000 (two non-integer df too)
// and two-sided alpha 0.001–0.2.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  fUpperTail,
  incompleteBeta,
  studentTQuantile,
  studentTTwoSided,
  studentTUpperTail,
} from '../../../server/analysis/engine/distributions.js';
import { repoRoot } from './nist.js';

interface Grid {
  r: string;
  call: string;
  qt: { alpha: number; df: number; qt: number }[];
  pt: { t: number; df: number; p: number }[];
  pf: { f: number; df1: number; df2: number; p: number }[];
}
const grid = JSON.parse(
  readFileSync(path.join(repoRoot, 'fixtures/analysis/distributions.json'), 'utf8'),
) as Grid;
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('t and F distributions against R qt, pt and pf', () => {
  it('t quantile to 12 significant digits or better over df 1–10,000, alpha 0.001–0.2 (R qt)', () => {
    expect(grid.qt.length).toBe(462);
    for (const r of grid.qt) {
      expect(
        rel(studentTQuantile(1 - r.alpha / 2, r.df), r.qt),
        `df ${r.df}, alpha ${r.alpha}`,
      ).toBeLessThan(1e-12);
      // The lower quantile is the mirror image.
      expect(rel(studentTQuantile(r.alpha / 2, r.df), -r.qt)).toBeLessThan(1e-12);
    }
  });

  it('t upper tail to 12 significant digits (R pt(t, df, lower.tail = FALSE))', () => {
    for (const r of grid.pt) {
      if (r.p < 1e-300) {
        // R's value is subnormal there (few significant digits left).
        expect(studentTUpperTail(r.t, r.df)).toBeLessThan(1e-300);
        continue;
      }
      expect(rel(studentTUpperTail(r.t, r.df), r.p), `t ${r.t}, df ${r.df}`).toBeLessThan(1e-12);
      expect(rel(studentTTwoSided(-r.t, r.df), 2 * r.p)).toBeLessThan(1e-12);
      expect(Math.abs(studentTUpperTail(-r.t, r.df) - (1 - r.p))).toBeLessThan(1e-13);
    }
  });

  it('F upper tail to 12 significant digits, or below 1e-300 where R gives 0 (R pf)', () => {
    for (const r of grid.pf) {
      const p = fUpperTail(r.f, r.df1, r.df2);
      if (r.p === 0) expect(p).toBeLessThan(1e-300);
      else expect(rel(p, r.p), `F ${r.f} on ${r.df1}, ${r.df2}`).toBeLessThan(1e-12);
    }
  });

  it('edge cases: both tails add to 1, limits, invalid input', () => {
    const { lower, upper } = incompleteBeta(3, 4, 0.3);
    expect(Math.abs(lower + upper - 1)).toBeLessThan(1e-15);
    expect(studentTUpperTail(0, 7)).toBe(0.5);
    expect(studentTUpperTail(Infinity, 7)).toBe(0);
    expect(studentTQuantile(0.5, 7)).toBe(0);
    expect(studentTQuantile(1, 7)).toBeNaN();
    expect(fUpperTail(0, 2, 3)).toBe(1);
    expect(fUpperTail(-1, 2, 3)).toBeNaN();
  });
});
