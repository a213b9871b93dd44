/**
 * Analysis values arrive in SI-based units (g, mm, g/m², kg/ha …); readers see metric or US
 * customary. Every value in a table scales by one factor, so means, SE, LSD and HSD convert
 * by it and sums of squares by its square; F and p never change. Factors: common/units.ts.
 */
import type { UnitSystem } from '@common/contracts/me';
import { decimalsInUnit, displayNumber } from '@common/precision';
import { G_PER_OUNCE, G_PER_POUND, M2_PER_ACRE, M2_PER_HECTARE, MM_PER_INCH } from '@common/units';

export interface DisplayUnit {
  label: string;
  factor: number;
}

const FT = 0.3048;
/** kg/ha → lb/acre */
const KG_HA_TO_LB_ACRE = ((1000 / G_PER_POUND) * M2_PER_ACRE) / M2_PER_HECTARE;

/** The unit to show a set of values in, chosen once for the whole table by its typical size. */
export function displayUnit(unit: string, system: UnitSystem, typical: number): DisplayUnit {
  const big = Math.abs(typical);
  if (system === 'metric') {
    if (unit === 'g' && big >= 1000) return { label: 'kg', factor: 1 / 1000 };
    if (unit === 'g/plant' && big >= 1000) return { label: 'kg/plant', factor: 1 / 1000 };
    if (unit === 'lb/acre') return { label: 'kg/ha', factor: 1 / KG_HA_TO_LB_ACRE };
    if (unit === 'count/acre') return { label: 'count/ha', factor: M2_PER_HECTARE / M2_PER_ACRE };
    return { label: unit, factor: 1 };
  }
  switch (unit) {
    case 'g':
    case 'g/plant': {
      const per = unit === 'g' ? '' : '/plant';
      return big / G_PER_OUNCE >= 16
        ? { label: `lb${per}`, factor: 1 / G_PER_POUND }
        : { label: `oz${per}`, factor: 1 / G_PER_OUNCE };
    }
    case 'g/m':
      return { label: 'oz/ft', factor: FT / G_PER_OUNCE };
    case 'g/m²':
      return { label: 'oz/ft²', factor: (FT * FT) / G_PER_OUNCE };
    case 'kg/ha':
      return { label: 'lb/acre', factor: KG_HA_TO_LB_ACRE };
    case 'mm':
      return { label: 'in', factor: 1 / MM_PER_INCH };
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
