/** common/units.ts against NIST's exact definitions (NIST Handbook 44, Appendix C; SP 811). */
import { describe, expect, it } from 'vitest';
import {
  entryUnit,
  formatDepth,
  formatLength,
  formatMass,
  fromStored,
  G_PER_OUNCE,
  G_PER_POUND,
  LITRES_PER_US_GALLON,
  M2_PER_ACRE,
  MM_PER_FOOT,
  MM_PER_INCH,
  toStored,
} from '../../common/units';

describe('exact factors', () => {
  it('1 in = 25.4 mm and 1 ft = 0.3048 m exactly (international yard and pound, 1959)', () => {
    expect(MM_PER_INCH).toBe(25.4);
    expect(MM_PER_FOOT).toBe(304.8);
    expect(toStored(1, 'in')).toBe(25.4);
    expect(toStored(1, 'ft')).toBe(304.8);
    expect(toStored(12, 'in')).toBeCloseTo(toStored(1, 'ft'), 12);
  });

  it('1 lb = 453.59237 g exactly and 1 oz = 1/16 lb = 28.349523125 g', () => {
    expect(G_PER_POUND).toBe(453.59237);
    expect(G_PER_OUNCE).toBeCloseTo(28.349523125, 12);
    expect(toStored(1, 'lb')).toBe(453.59237);
    expect(toStored(16, 'oz')).toBeCloseTo(453.59237, 10);
  });

  it('1 acre = 4046.8564224 m² (43,560 ft²) and 1 US gallon = 3.785411784 L (231 in³)', () => {
    expect(M2_PER_ACRE).toBe(4046.8564224);
    expect(43_560 * 0.3048 ** 2).toBeCloseTo(M2_PER_ACRE, 9);
    expect(LITRES_PER_US_GALLON).toBeCloseTo(3.785411784, 12);
  });

  it('metric prefixes: 1 kg = 1000 g, 1 cm = 10 mm, 1 m = 1000 mm', () => {
    expect(toStored(2.5, 'kg')).toBe(2500);
    expect(toStored(3, 'cm')).toBe(30);
    expect(toStored(1.2, 'm')).toBe(1200);
  });

  it('fromStored undoes toStored', () => {
    for (const unit of ['g', 'kg', 'oz', 'lb', 'mm', 'cm', 'm', 'in', 'ft'] as const) {
      expect(fromStored(toStored(7.3, unit), unit)).toBeCloseTo(7.3, 12);
    }
  });
});

describe('no binary noise in stored values', () => {
  // Each expected value is the exact decimal product of the typed value and the exact factor
  // (NIST Handbook 44, Appendix C: 1 lb = 453.59237 g, 1 oz = 28.349523125 g, 1 in = 25.4 mm,
  // 1 ft = 304.8 mm; SI prefixes for kg, cm, m), worked by hand. Plain binary multiplication
  // gives the values in the comments.
  it.each([
    [2.2, 'kg', 2200],
    [1.005, 'kg', 1005], // 1004.9999999999999
    [2.2, 'lb', 997.903214], // 997.9032140000002
    [1.1, 'oz', 31.1844754375], // 31.184475437500005
    [0.1, 'ft', 30.48], // 30.480000000000004
    [36.3, 'in', 922.02], // 922.0199999999999
    [0.17, 'cm', 1.7], // 1.7000000000000002
    [12.7, 'in', 322.58],
    [0.3, 'm', 300],
    [1234.5, 'g', 1234.5],
  ] as const)('%s %s is stored as %s exactly', (typed, unit, stored) => {
    expect(toStored(typed, unit)).toBe(stored);
  });

  it('keeps what needs more digits than a double holds as the plain product', () => {
    expect(toStored(1e-30, 'kg')).toBe(1e-30 * 1000);
    expect(toStored(0.123456789012, 'oz')).toBeCloseTo(0.123456789012 * 28.349523125, 12);
  });
});

describe('what people type and read', () => {
  it('types grams and millimetres in metric, ounces and inches in US customary', () => {
    expect(entryUnit('mass', 'metric')).toBe('g');
    expect(entryUnit('mass', 'us')).toBe('oz');
    expect(entryUnit('length', 'us')).toBe('in');
    expect(entryUnit('depth', 'metric')).toBe('mm');
  });

  it('shows units with every number', () => {
    expect(formatMass(453.59237, 'us')).toBe('1 lb');
    expect(formatMass(1500, 'metric')).toBe('1.5 kg');
    expect(formatMass(28.349523125, 'us')).toBe('1 oz');
    expect(formatLength(254, 'us')).toBe('10 in');
    expect(formatDepth(25.4, 'us')).toBe('1 in');
    expect(formatDepth(12.25, 'metric')).toBe('12.3 mm');
  });
});
