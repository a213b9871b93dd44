import { describe, expect, it } from 'vitest';
import { plantsPerPlot, plantsPerRow, plotAreaM2 } from '../../common/planting';
import { MM_PER_FOOT, MM_PER_INCH } from '../../common/units';

// Rule under test, common practice (no source): plants = floor(row length ÷ in-row spacing)
// per row, times the rows of the plot.
describe('plants per plot from row length and in-row spacing', () => {
  it('fits 10 plants in a 3 m row at 30 cm', () => {
    expect(plantsPerRow(3000, 300)).toBe(10);
  });

  it('drops the part of a spacing that does not fit', () => {
    expect(plantsPerRow(3000, 450)).toBe(6); // 6.67
    expect(plantsPerRow(2000, 600)).toBe(3); // 3.33
  });

  it('gives a bushy dwarf at three times the spacing a third of the plants', () => {
    expect(plantsPerRow(3000, 300)).toBe(10);
    expect(plantsPerRow(3000, 900)).toBe(3);
  });

  it('counts the same in US customary units (NIST: 1 ft = 304.8 mm, 1 in = 25.4 mm)', () => {
    // a 10 ft row at 12 in: 10 plants, even though 3048 / 304.8 may land a hair under 10
    expect(plantsPerRow(10 * MM_PER_FOOT, 12 * MM_PER_INCH)).toBe(10);
    expect(plantsPerRow(20 * MM_PER_FOOT, 18 * MM_PER_INCH)).toBe(13);
  });

  it('multiplies by the rows of a plot', () => {
    expect(plantsPerPlot(3000, 300, 2)).toBe(20);
    expect(plantsPerPlot(3000, 300)).toBe(10);
  });

  it('refuses lengths that are not positive and fractional rows', () => {
    expect(() => plantsPerRow(0, 300)).toThrow(RangeError);
    expect(() => plantsPerRow(3000, -1)).toThrow(RangeError);
    expect(() => plantsPerRow(Number.NaN, 300)).toThrow(RangeError);
    expect(() => plantsPerPlot(3000, 300, 1.5)).toThrow(RangeError);
  });

  it('gives the ground a plot covers', () => {
    expect(plotAreaM2(3000, 900)).toBeCloseTo(2.7, 12);
    expect(plotAreaM2(3000, 900, 2)).toBeCloseTo(5.4, 12);
  });
});
