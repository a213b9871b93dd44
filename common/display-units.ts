/**
 * Analysis values arrive in SI-based units (g, mm, g/m², kg/ha …); readers see metric or US
 * customary. Every value in a table scales by one factor, so means, SE, LSD and HSD convert
 * by it and sums of squares by its square; F and p never change. Factors: common/units.ts.
 *
 * One display unit per trait and per table, chosen here for the web sheet, the PDF, the
 * analysis pages, the record tables and the entry forms alike (common practice, no source):
 * the lead's own unit for the trait when set; otherwise lengths (heights, pod lengths) in cm
 * or inches, masses in g or kg (oz or lb) chosen once for the whole table by its typical
 * size. A count or a score is a number, not a unit.
 */
import type { UnitSystem } from './contracts/me';
import type { TraitDisplayUnit } from './contracts/trials';
import { decimalsInUnit, displayNumber } from './precision';
import {
  G_PER_OUNCE,
  G_PER_POUND,
  M2_PER_ACRE,
  M2_PER_HECTARE,
  MM_PER_FOOT,
  MM_PER_INCH,
  entryUnit,
  type QuantityUnit,
} from './units';

export interface DisplayUnit {
  label: string;
  factor: number;
}

const FT = 0.3048;
/** kg/ha → lb/acre */
const KG_HA_TO_LB_ACRE = ((1000 / G_PER_POUND) * M2_PER_ACRE) / M2_PER_HECTARE;

/** What `1` of a stored value (g or mm) is in each unit a trait can be shown in. */
const perStored: Record<QuantityUnit, number> = {
  g: 1,
  kg: 1 / 1000,
  oz: 1 / G_PER_OUNCE,
  lb: 1 / G_PER_POUND,
  mm: 1,
  cm: 1 / 10,
  m: 1 / 1000,
  in: 1 / MM_PER_INCH,
  ft: 1 / MM_PER_FOOT,
};

/** The US customary unit that stands in for a lead's metric choice. */
const customaryFor: Record<TraitDisplayUnit, QuantityUnit> = {
  mm: 'in',
  cm: 'in',
  m: 'ft',
  g: 'oz',
  kg: 'lb',
};

/** The unit a trait's single values (a mass in g, a length in mm) are shown and typed in. */
export function traitUnit(
  base: 'g' | 'mm',
  system: UnitSystem,
  typical: number,
  chosen?: TraitDisplayUnit | null,
): QuantityUnit {
  const big = Math.abs(typical);
  if (base === 'mm') {
    if (system === 'metric') return chosen === 'mm' || chosen === 'm' ? chosen : 'cm';
    return chosen ? customaryFor[chosen] : 'in';
  }
  if (system === 'metric')
    return chosen === 'g' || chosen === 'kg' ? chosen : big >= 1000 ? 'kg' : 'g';
  if (chosen) return customaryFor[chosen];
  return big / G_PER_OUNCE >= 16 ? 'lb' : 'oz';
}

/**
 * The unit to show a set of values in, chosen once for the whole table by its typical size
 * (or the lead's unit for the trait, `chosen`).
 */
export function displayUnit(
  unit: string,
  system: UnitSystem,
  typical: number,
  chosen?: TraitDisplayUnit | null,
): DisplayUnit {
  if (unit === 'count' || unit === 'score') return { label: '', factor: 1 };
  if (unit === 'mm' || unit === 'g' || unit === 'g/plant') {
    const base = unit === 'mm' ? 'mm' : 'g';
    const shown = traitUnit(base, system, typical, chosen);
    const per = unit === 'g/plant' ? '/plant' : '';
    return { label: `${shown}${per}`, factor: perStored[shown] };
  }
  if (system === 'metric') {
    if (unit === 'lb/acre') return { label: 'kg/ha', factor: 1 / KG_HA_TO_LB_ACRE };
    if (unit === 'count/acre') return { label: 'count/ha', factor: M2_PER_HECTARE / M2_PER_ACRE };
    return { label: unit, factor: 1 };
  }
  switch (unit) {
    case 'g/m':
      return { label: 'oz/ft', factor: FT / G_PER_OUNCE };
    case 'g/m²':
      return { label: 'oz/ft²', factor: (FT * FT) / G_PER_OUNCE };
    case 'kg/ha':
      return { label: 'lb/acre', factor: KG_HA_TO_LB_ACRE };
    case 'count/m':
      return { label: 'count/ft', factor: FT };
    case 'count/m²':
      return { label: 'count/ft²', factor: FT * FT };
    case 'count/ha':
      return { label: 'count/acre', factor: M2_PER_ACRE / M2_PER_HECTARE };
    default:
      return { label: unit, factor: 1 };
  }
}

/**
 * The units a grower may type a trait's value in, its display unit first (so a plant height
 * is typed in cm unless the lead chose otherwise); null for kinds without a unit.
 */
export function entryUnitsFor(
  quantityKind: string,
  system: UnitSystem,
  chosen?: TraitDisplayUnit | null,
): QuantityUnit[] | null {
  if (quantityKind !== 'length' && quantityKind !== 'mass') return null;
  const first = traitUnit(quantityKind === 'length' ? 'mm' : 'g', system, 0, chosen);
  const others: QuantityUnit[] =
    quantityKind === 'length'
      ? system === 'metric'
        ? ['cm', 'mm', 'm']
        : ['in', 'ft']
      : system === 'metric'
        ? ['g', 'kg']
        : ['oz', 'lb'];
  return [first, ...others.filter((u) => u !== first)];
}

/** A column's typical size, its median: one giant fruit does not turn a column of grams into kg. */
export function typicalOf(values: readonly number[]): number {
  if (values.length === 0) return 0;
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

/**
 * The one unit a column of a trait's values is shown and edited in (record tables): chosen once
 * from the column's values, never row by row; `unit` is null for a count, a score or a percent.
 */
export function columnUnit(
  quantityKind: string,
  system: UnitSystem,
  values: readonly number[],
  chosen?: TraitDisplayUnit | null,
): { unit: QuantityUnit | null; shown: DisplayUnit } {
  if (quantityKind !== 'length' && quantityKind !== 'mass')
    return { unit: null, shown: { label: quantityKind === 'percent' ? '%' : '', factor: 1 } };
  const base = quantityKind === 'length' ? 'mm' : 'g';
  const typical = typicalOf(values);
  return {
    unit: traitUnit(base, system, typical, chosen),
    shown: displayUnit(base, system, typical, chosen),
  };
}

/** The unit spacings are shown in: always cm (or inches), never mm on one line and m on the next. */
export function spacingDisplayUnit(system: UnitSystem): DisplayUnit {
  const unit = entryUnit('spacing', system);
  return { label: unit, factor: perStored[unit] };
}

/** A plant or row spacing with its unit. */
export function formatSpacing(mm: number, system: UnitSystem): string {
  return formatInUnit(mm, spacingDisplayUnit(system));
}

/** One trait value with its unit, for a table whose rows mix traits (the observation log). */
export function formatTraitValue(
  value: number,
  quantityKind: string,
  system: UnitSystem,
  chosen?: TraitDisplayUnit | null,
): string {
  return formatInUnit(value, columnUnit(quantityKind, system, [], chosen).shown);
}

/** A column header for one quantity with its unit ("Marketable yield (kg/m²)"); unitless stays plain. */
export const withUnit = (header: string, unit: DisplayUnit) =>
  unit.label ? `${header} (${unit.label})` : header;

/** Numbers for tables: about four significant digits, grouped thousands. */
export function formatNumber(value: number | null | undefined, significant = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const abs = Math.abs(value);
  // Far below the digits shown elsewhere in a table: a zero with float noise, not a value.
  if (abs < 1e-9) return '0';
  if (abs >= 10 ** significant) return value.toLocaleString('en', { maximumFractionDigits: 0 });
  return value.toLocaleString('en', { maximumSignificantDigits: significant });
}

export const formatF = (f: number | null) => (f === null ? '—' : f.toFixed(2));

export function formatP(p: number | null): string {
  if (p === null) return '—';
  if (p < 0.001) return '< 0.001';
  return p.toFixed(3);
}

export const cToF = (c: number) => (c * 9) / 5 + 32;

export function formatTemperature(c: number | null, system: UnitSystem): string {
  if (c === null) return '—';
  return system === 'metric' ? `${c.toFixed(1)} °C` : `${cToF(c).toFixed(1)} °F`;
}

/** Degree days scale by 9/5 in Fahrenheit degrees (a difference, not a reading). */
export function formatDegreeDays(dd: number, system: UnitSystem): string {
  return system === 'metric' ? `${Math.round(dd)} °C·d` : `${Math.round((dd * 9) / 5)} °F·d`;
}

/**
 * A value in a chosen display unit, with its label. With `decimals` (of the stored value, from
 * common/precision.ts) the same absolute precision is kept in the shown unit.
 */
export function formatInUnit(
  value: number | null | undefined,
  unit: DisplayUnit,
  decimals?: number,
): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const shown =
    decimals === undefined
      ? formatNumber(value * unit.factor)
      : displayNumber(value * unit.factor, decimalsInUnit(decimals, unit.factor));
  return unit.label ? `${shown} ${unit.label}` : shown;
}

/** A bare number in a display unit (the unit named once in the column heading). */
export function formatScaled(
  value: number | null | undefined,
  unit: DisplayUnit,
  decimals: number,
): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return displayNumber(value * unit.factor, decimalsInUnit(decimals, unit.factor));
}
