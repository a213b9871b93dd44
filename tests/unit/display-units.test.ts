/**
 * common/display-units.ts: one display unit per trait and per table. Conversion factors are
 * NIST's exact definitions (NIST Handbook 44, Appendix C; SP 811): 1 in = 25.4 mm,
 * 1 ft = 304.8 mm, 1 oz = 28.349523125 g, 1 lb = 453.59237 g. Which unit a trait shows in
 * (cm for heights and pod lengths, g or kg by a table's size) is common practice (no source).
 */
import { describe, expect, it } from 'vitest';
import {
  columnUnit,
  displayUnit,
  entryUnitsFor,
  formatInUnit,
  formatSpacing,
  formatTraitValue,
  traitUnit,
} from '../../common/display-units';
import { toStored } from '../../common/units';

describe('one unit per trait and per table', () => {
  it('shows a length in cm (metric) or inches (US), never mm and m mixed in one column', () => {
    const metric = displayUnit('mm', 'metric', 920);
    expect(metric.label).toBe('cm');
    // 920 mm and 1010 mm both in cm: "92 cm", "101 cm"
    expect(formatInUnit(920, metric)).toBe('92 cm');
    expect(formatInUnit(1010, metric)).toBe('101 cm');
    const us = displayUnit('mm', 'us', 920);
    expect(us.label).toBe('in');
    expect(formatInUnit(254, us)).toBe('10 in');
  });

  it('chooses g or kg once for a whole table by its typical size', () => {
    expect(displayUnit('g', 'metric', 850).label).toBe('g');
    const big = displayUnit('g', 'metric', 1942.6);
    expect(big.label).toBe('kg');
    // the small value in the same table stays in kg
    expect(formatInUnit(640, big)).toBe('0.64 kg');
    expect(displayUnit('g', 'us', 453.59237).label).toBe('lb');
    expect(displayUnit('g', 'us', 200).label).toBe('oz');
    expect(displayUnit('g/plant', 'metric', 2500)).toEqual({ label: 'kg/plant', factor: 1 / 1000 });
  });

  it('treats a count or a score as a number, not a unit', () => {
    expect(displayUnit('count', 'metric', 106.3)).toEqual({ label: '', factor: 1 });
    expect(displayUnit('score', 'us', 3)).toEqual({ label: '', factor: 1 });
    expect(formatInUnit(106.3, displayUnit('count', 'metric', 106.3))).toBe('106.3');
    // a count per area is a rate and keeps its unit
    expect(displayUnit('count/m²', 'metric', 4).label).toBe('count/m²');
  });

  it('follows the lead’s unit for the trait, with its US customary counterpart', () => {
    expect(displayUnit('mm', 'metric', 20, 'm')).toEqual({ label: 'm', factor: 1 / 1000 });
    expect(displayUnit('mm', 'metric', 2000, 'mm').label).toBe('mm');
    expect(displayUnit('mm', 'us', 2000, 'm').label).toBe('ft');
    expect(displayUnit('mm', 'us', 2000, 'cm').label).toBe('in');
    // a lead's g holds even for a big table; kg even for a small one
    expect(displayUnit('g', 'metric', 5000, 'g').label).toBe('g');
    expect(displayUnit('g', 'metric', 5, 'kg').label).toBe('kg');
    expect(displayUnit('g', 'us', 5, 'kg').label).toBe('lb');
    expect(traitUnit('g', 'us', 5000, 'g')).toBe('oz');
  });

  it('converts by the exact factors: 1 ft = 304.8 mm, 1 lb = 453.59237 g', () => {
    expect(formatInUnit(304.8, displayUnit('mm', 'us', 0, 'm'))).toBe('1 ft');
    expect(formatInUnit(453.59237, displayUnit('g', 'us', 0, 'kg'))).toBe('1 lb');
    expect(formatInUnit(28.349523125, displayUnit('g', 'us', 0, 'g'))).toBe('1 oz');
  });
});

describe('the entry form’s units', () => {
  it('offers the trait’s display unit first: plant height in cm, so "92" is 920 mm', () => {
    const units = entryUnitsFor('length', 'metric')!;
    expect(units[0]).toBe('cm');
    expect(toStored(92, units[0]!)).toBe(920);
    expect(entryUnitsFor('length', 'us')![0]).toBe('in');
    expect(entryUnitsFor('mass', 'metric')).toEqual(['g', 'kg']);
    expect(entryUnitsFor('mass', 'us')).toEqual(['oz', 'lb']);
  });

  it('starts with the lead’s unit when the trait has one', () => {
    expect(entryUnitsFor('length', 'metric', 'mm')).toEqual(['mm', 'cm', 'm']);
    expect(entryUnitsFor('length', 'metric', 'm')![0]).toBe('m');
    expect(entryUnitsFor('length', 'us', 'm')).toEqual(['ft', 'in']);
    expect(entryUnitsFor('mass', 'metric', 'kg')).toEqual(['kg', 'g']);
  });

  it('has no unit to choose for counts, scores, percentages and dates', () => {
    for (const kind of ['count', 'score', 'percent', 'date'])
      expect(entryUnitsFor(kind, 'metric')).toBeNull();
  });
});

describe('single values in a table of mixed traits', () => {
  it('writes each trait in its own unit', () => {
    expect(formatTraitValue(920, 'length', 'metric')).toBe('92 cm');
    expect(formatTraitValue(1010, 'length', 'metric')).toBe('101 cm');
    expect(formatTraitValue(1010, 'length', 'metric', 'm')).toBe('1.01 m');
    expect(formatTraitValue(42, 'count', 'metric')).toBe('42');
    expect(formatTraitValue(35, 'percent', 'us')).toBe('35 %');
  });
});

describe('spacing and record-table columns', () => {
  it('shows spacing in cm or inches, never mm (450 mm typed as 45 cm; 18 in = 457.2 mm)', () => {
    expect(formatSpacing(450, 'metric')).toBe('45 cm');
    expect(formatSpacing(305, 'metric')).toBe('30.5 cm');
    expect(formatSpacing(1200, 'metric')).toBe('120 cm');
    expect(formatSpacing(457.2, 'us')).toBe('18 in');
  });

  it('chooses one unit for a whole column from its median, so one giant fruit does not switch it', () => {
    // median 1,240 g: kg for every row; one 40 kg pumpkin among 300 g fruit stays in g
    expect(columnUnit('mass', 'metric', [980, 1240, 1500]).shown.label).toBe('kg');
    expect(columnUnit('mass', 'metric', [280, 300, 320, 40_000]).unit).toBe('g');
    expect(columnUnit('length', 'metric', [920, 1010]).unit).toBe('cm');
    expect(columnUnit('length', 'us', [920, 1010]).unit).toBe('in');
    expect(columnUnit('count', 'metric', [3, 4])).toEqual({
      unit: null,
      shown: { label: '', factor: 1 },
    });
  });
});
