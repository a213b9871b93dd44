import { entryUnit, fromStored, type QuantityUnit, type UnitSystem } from '@common/units';

/** Spacing is typed in cm or inches, row length in metres or feet. */
export const spacingUnit = (s: UnitSystem): QuantityUnit => entryUnit('spacing', s);
export const rowLengthUnit = (s: UnitSystem): QuantityUnit => (s === 'metric' ? 'm' : 'ft');

/** A stored length shown in `unit`, rounded for a form field. */
export function lengthInput(mm: number | null | undefined, unit: QuantityUnit): string {
  if (mm == null) return '';
  return String(Math.round(fromStored(mm, unit) * 100) / 100);
}
