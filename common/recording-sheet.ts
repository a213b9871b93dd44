/**
 * The paper recording sheet for one site and round, and the CSV that carries it back: one row
 * per plot in field order, blank columns for the round's harvest and the trial's own traits, each
 * column named once for both (the printed heading shows the same name under the words). Pure:
 * the print view, the CSV template and the import all read these columns.
 */
import type { TraitRule } from './contracts/records';
import type { QuantityUnit, UnitSystem } from './units';

export interface SheetTrait extends TraitRule {
  id: string;
  key: string;
  basis: 'plant' | 'plot' | 'harvest';
}

export const sheetMassUnits = ['g', 'kg', 'oz', 'lb'] as const satisfies QuantityUnit[];
export const sheetLengthUnits = ['mm', 'cm', 'in'] as const satisfies QuantityUnit[];
export type SheetMassUnit = (typeof sheetMassUnits)[number];
export type SheetLengthUnit = (typeof sheetLengthUnits)[number];
export const MAX_SHEET_PLANTS = 10;

/** Columns every sheet starts with (site, plot, entry code, the round's date) and ends with. */
export const sheetLeadColumns = ['site', 'plot_number', 'entry_code', 'recorded_on'] as const;
export const sheetNoteColumn = 'note';

export interface SheetOptions {
  /** marketable and cull count and mass */
  harvest: boolean;
  /** the traits on the sheet, in the trial's order */
  traitIds: string[];
  /** sample plants per plot for per-plant traits */
  plants: number;
  massUnit: SheetMassUnit;
  lengthUnit: SheetLengthUnit;
}

interface ColumnBase {
  /** the CSV header, printed small under the heading */
  name: string;
  heading: string;
  /** what the blank takes: a unit, a scale, "%" or "date"; null for a plain count */
  unit: string | null;
}
export type SheetColumn =
  | (ColumnBase & {
      kind: 'harvest-count';
      grade: 'marketable' | 'cull';
    })
  | (ColumnBase & {
      kind: 'harvest-mass';
      grade: 'marketable' | 'cull';
      valueUnit: SheetMassUnit;
    })
  | (ColumnBase & {
      kind: 'trait';
      trait: SheetTrait;
      plant: number | null;
      /** the unit typed values are in, for a mass or a length */
      valueUnit: QuantityUnit | null;
    });

/** Traits recorded by hand; harvest-basis traits come from the harvest columns. */
export const sheetTraitsOf = <T extends SheetTrait>(traits: readonly T[]): T[] =>
  traits.filter((t) => t.quantityKind === 'score' || t.basis !== 'harvest');

/** Units a grower weighs and measures in by default (the field log's first choices). */
export function defaultSheetUnits(system: UnitSystem) {
  return system === 'metric'
    ? { massUnit: 'g' as const, lengthUnit: 'cm' as const }
    : { massUnit: 'oz' as const, lengthUnit: 'in' as const };
}

const grades = [
  ['marketable', 'Marketable'],
  ['cull', 'Cull'],
] as const;

function traitUnit(t: SheetTrait, valueUnit: QuantityUnit | null): string | null {
  switch (t.quantityKind) {
    case 'mass':
    case 'length':
      return valueUnit;
    case 'score':
      return `${t.scaleMin}–${t.scaleMax}`;
    case 'percent':
      return '%';
    case 'date':
      return 'date';
    case 'count':
      return null;
  }
}

function traitColumns(
  t: SheetTrait,
  plants: number,
  valueUnit: QuantityUnit | null,
): SheetColumn[] {
  const base = valueUnit ? `${t.key}_${valueUnit}` : t.key;
  const unit = traitUnit(t, valueUnit);
  if (t.basis !== 'plant')
    return [
      {
        kind: 'trait' as const,
        name: base,
        heading: t.label,
        unit,
        trait: t,
        plant: null,
        valueUnit,
      },
    ];
  return Array.from({ length: plants }, (_, i) => ({
    kind: 'trait' as const,
    name: `${base}_p${i + 1}`,
    heading: `${t.label}, plant ${i + 1}`,
    unit,
    trait: t,
    plant: i + 1,
    valueUnit,
  }));
}

const unitFor = (t: SheetTrait, o: Pick<SheetOptions, 'massUnit' | 'lengthUnit'>) =>
  t.quantityKind === 'mass' ? o.massUnit : t.quantityKind === 'length' ? o.lengthUnit : null;

/** The blank columns of a sheet, between the lead columns and the note. */
export function sheetColumns(traits: readonly SheetTrait[], o: SheetOptions): SheetColumn[] {
  const plants = Math.min(MAX_SHEET_PLANTS, Math.max(1, Math.round(o.plants)));
  const harvest: SheetColumn[] = o.harvest
    ? grades.flatMap(([grade, word]) => [
        {
          kind: 'harvest-count' as const,
          name: `${grade}_count`,
          heading: `${word} count`,
          unit: null,
          grade,
        },
        {
          kind: 'harvest-mass' as const,
          name: `${grade}_mass_${o.massUnit}`,
          heading: `${word} mass`,
          unit: o.massUnit,
          grade,
          valueUnit: o.massUnit,
        },
      ])
    : [];
  const chosen = sheetTraitsOf(traits).filter((t) => o.traitIds.includes(t.id));
  return [...harvest, ...chosen.flatMap((t) => traitColumns(t, plants, unitFor(t, o)))];
}

/**
 * What a column named in a typed-in sheet's header means, or why it means nothing: any of the
 * units a sheet may be printed with is read, so a sheet printed in kg comes back in kg.
 */
export function readSheetColumn(
  name: string,
  traits: readonly SheetTrait[],
): SheetColumn | { problem: string } {
  const harvest = /^(marketable|cull)_(count|mass_(g|kg|oz|lb))$/.exec(name);
  if (harvest) {
    const grade = harvest[1] as 'marketable' | 'cull';
    const word = grade === 'marketable' ? 'Marketable' : 'Cull';
    if (harvest[2] === 'count')
      return { kind: 'harvest-count', name, heading: `${word} count`, unit: null, grade };
    const valueUnit = harvest[3] as SheetMassUnit;
    return {
      kind: 'harvest-mass',
      name,
      heading: `${word} mass`,
      unit: valueUnit,
      grade,
      valueUnit,
    };
  }
  const unnamed = /^(marketable|cull)_mass/.exec(name);
  if (unnamed)
    return {
      problem: `Name the mass unit as the sheet does: ${unnamed[1]}_mass_g, _kg, _oz or _lb.`,
    };
  const perPlant = /^(.+)_p([1-9]\d?)$/.exec(name);
  for (const [base, plant] of [
    ...(perPlant ? [[perPlant[1]!, Number(perPlant[2])] as const] : []),
    [name, null] as const,
  ]) {
    for (const t of sheetTraitsOf(traits)) {
      const units: (QuantityUnit | null)[] =
        t.quantityKind === 'mass'
          ? [...sheetMassUnits]
          : t.quantityKind === 'length'
            ? [...sheetLengthUnits]
            : [null];
      const valueUnit = units.find((u) => (u ? `${t.key}_${u}` : t.key) === base);
      if (valueUnit === undefined) continue;
      if ((t.basis === 'plant') !== (plant !== null))
        return {
          problem:
            t.basis === 'plant'
              ? `${t.label} is recorded per plant: name the plant, as in ${base}_p1.`
              : `${t.label} is recorded once per plot: drop the plant number.`,
        };
      if (plant !== null && plant > MAX_SHEET_PLANTS)
        return { problem: `A sheet has at most ${MAX_SHEET_PLANTS} sample plants.` };
      const unit = traitUnit(t, valueUnit);
      const heading = plant ? `${t.label}, plant ${plant}` : t.label;
      return { kind: 'trait', name, heading, unit, trait: t, plant, valueUnit };
    }
  }
  const measured = sheetTraitsOf(traits).find(
    (t) =>
      (t.quantityKind === 'mass' || t.quantityKind === 'length') && name.startsWith(`${t.key}`),
  );
  if (measured)
    return {
      problem: `${measured.label} is typed in ${(measured.quantityKind === 'mass' ? sheetMassUnits : sheetLengthUnits).join(', ')}: name the unit, as in ${measured.key}_${measured.quantityKind === 'mass' ? 'g' : 'cm'}.`,
    };
  return { problem: `Unknown column "${name}".` };
}

/** The printed heading's unit in brackets, or nothing for a plain count. */
export const headingWithUnit = (c: Pick<SheetColumn, 'heading' | 'unit'>) =>
  c.unit ? `${c.heading} (${c.unit})` : c.heading;
