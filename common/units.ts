/**
 * Units at the edges. Records are stored in SI (grams, millimetres, square metres, minutes);
 * people read and type metric or US customary. Factors are the exact NIST definitions
 * (NIST Handbook 44, Appendix C; NIST SP 811): 1 in = 25.4 mm, 1 ft = 0.3048 m,
 * 1 lb = 453.59237 g, 1 oz = 1/16 lb, 1 acre = 4046.8564224 m², 1 US gal = 231 in³.
 */
export type UnitSystem = 'metric' | 'us';

export const MM_PER_INCH = 25.4;
export const MM_PER_FOOT = 304.8;
export const G_PER_POUND = 453.59237;
export const G_PER_OUNCE = G_PER_POUND / 16;
export const M2_PER_ACRE = 4046.8564224;
export const M2_PER_HECTARE = 10_000;
/** 231 cubic inches exactly, in litres: 231 × 0.0254³ × 1000. */
export const LITRES_PER_US_GALLON = 231 * 0.0254 ** 3 * 1000;

export type QuantityUnit = 'g' | 'kg' | 'oz' | 'lb' | 'mm' | 'cm' | 'm' | 'in' | 'ft';

const toSi: Record<QuantityUnit, number> = {
  g: 1,
  kg: 1000,
  oz: G_PER_OUNCE,
  lb: G_PER_POUND,
  mm: 1,
  cm: 10,
  m: 1000,
  in: MM_PER_INCH,
  ft: MM_PER_FOOT,
};

/** Decimal places of a number as JavaScript writes it (the shortest form that reads back). */
function decimalPlaces(n: number): number {
  const [digits = '', exponent = '0'] = String(Math.abs(n)).split('e');
  return Math.max(0, (digits.split('.')[1]?.length ?? 0) - Number(exponent));
}

/**
 * A typed value in `unit` to the stored SI value (grams or millimetres). Every factor is an
 * exact decimal, so the exact product has no more decimal places than the typed value and the
 * factor together; rounding the binary product to that many places takes off the noise of
 * binary arithmetic (2.2 kg is stored as 2200 g, not 2200.0000000000005) and nothing else.
 */
export function toStored(value: number, unit: QuantityUnit): number {
  const product = value * toSi[unit];
  const places = decimalPlaces(value) + decimalPlaces(toSi[unit]);
  if (!Number.isFinite(product) || places > 20) return product;
  return Number(product.toFixed(places));
}

export function fromStored(value: number, unit: QuantityUnit): number {
  return value / toSi[unit];
}

/** The unit a person types for a kind of quantity, by their chosen system. */
export function entryUnit(
  kind: 'mass' | 'length' | 'spacing' | 'depth',
  system: UnitSystem,
): QuantityUnit {
  if (kind === 'mass') return system === 'metric' ? 'g' : 'oz';
  if (kind === 'length') return system === 'metric' ? 'mm' : 'in';
  if (kind === 'spacing') return system === 'metric' ? 'cm' : 'in';
  return system === 'metric' ? 'mm' : 'in';
}

const fmt = (value: number, digits: number) =>
  value.toLocaleString('en', { maximumFractionDigits: digits, minimumFractionDigits: 0 });

/** Mass for reading: grams/kilograms or ounces/pounds, chosen by size. */
export function formatMass(grams: number, system: UnitSystem, digits = 1): string {
  if (system === 'metric')
    return grams >= 1000 ? `${fmt(grams / 1000, 2)} kg` : `${fmt(grams, digits)} g`;
  const oz = grams / G_PER_OUNCE;
  return oz >= 16 ? `${fmt(grams / G_PER_POUND, 2)} lb` : `${fmt(oz, digits)} oz`;
}

export function formatLength(mm: number, system: UnitSystem, digits = 0): string {
  if (system === 'metric') return mm >= 1000 ? `${fmt(mm / 1000, 2)} m` : `${fmt(mm, digits)} mm`;
  const inches = mm / MM_PER_INCH;
  return inches >= 36 ? `${fmt(mm / MM_PER_FOOT, 1)} ft` : `${fmt(inches, 1)} in`;
}

/** Depth of water (rain or irrigation). */
export function formatDepth(mm: number, system: UnitSystem): string {
  return system === 'metric' ? `${fmt(mm, 1)} mm` : `${fmt(mm / MM_PER_INCH, 2)} in`;
}
