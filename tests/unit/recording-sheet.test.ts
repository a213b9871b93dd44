/**
 * The recording sheet's columns: what the sheet prints is what the import reads back, for
 * traits of every kind and for both unit systems. Column names are our own (no outside source);
 * the units are the SI and US customary units of common/units.ts.
 */
import { describe, expect, it } from 'vitest';
import {
  defaultSheetUnits,
  headingWithUnit,
  readSheetColumn,
  sheetColumns,
  type SheetTrait,
} from '../../common/recording-sheet';

const trait = (
  t: Partial<SheetTrait> & Pick<SheetTrait, 'key' | 'label' | 'quantityKind' | 'basis'>,
) => ({ id: t.key, scaleMin: null, scaleMax: null, ...t }) satisfies SheetTrait;
const traits: SheetTrait[] = [
  trait({ key: 'plant_height', label: 'Plant height', quantityKind: 'length', basis: 'plant' }),
  trait({ key: 'pod_mass', label: 'Pod mass', quantityKind: 'mass', basis: 'plant' }),
  trait({
    key: 'vigor',
    label: 'Vigor',
    quantityKind: 'score',
    basis: 'plot',
    scaleMin: 1,
    scaleMax: 5,
  }),
  trait({ key: 'pods_set', label: 'Pods set', quantityKind: 'count', basis: 'plot' }),
  trait({ key: 'leaf_cover', label: 'Leaf cover', quantityKind: 'percent', basis: 'plot' }),
  trait({ key: 'first_flower', label: 'First flower', quantityKind: 'date', basis: 'plot' }),
  trait({
    key: 'marketable_yield',
    label: 'Marketable yield',
    quantityKind: 'mass',
    basis: 'harvest',
  }),
];
const all = traits.map((t) => t.id);

describe('the recording sheet', () => {
  it('names each blank column with its unit; a count has none, per-harvest traits come from the harvest columns', () => {
    const columns = sheetColumns(traits, {
      harvest: true,
      traitIds: all,
      plants: 2,
      ...defaultSheetUnits('metric'),
    });
    expect(columns.map((c) => [c.name, headingWithUnit(c)])).toEqual([
      ['marketable_count', 'Marketable count'],
      ['marketable_mass_g', 'Marketable mass (g)'],
      ['cull_count', 'Cull count'],
      ['cull_mass_g', 'Cull mass (g)'],
      ['plant_height_cm_p1', 'Plant height, plant 1 (cm)'],
      ['plant_height_cm_p2', 'Plant height, plant 2 (cm)'],
      ['pod_mass_g_p1', 'Pod mass, plant 1 (g)'],
      ['pod_mass_g_p2', 'Pod mass, plant 2 (g)'],
      ['vigor', 'Vigor (1–5)'],
      ['pods_set', 'Pods set'],
      ['leaf_cover', 'Leaf cover (%)'],
      ['first_flower', 'First flower (date)'],
    ]);
  });

  it.each(['metric', 'us'] as const)('reads back every column it prints (%s units)', (system) => {
    for (const massUnit of ['g', 'kg', 'oz', 'lb'] as const) {
      const columns = sheetColumns(traits, {
        harvest: true,
        traitIds: all,
        plants: 10,
        ...defaultSheetUnits(system),
        massUnit,
      });
      expect(columns).toHaveLength(4 + 10 + 10 + 4);
      for (const c of columns) expect(readSheetColumn(c.name, traits)).toEqual(c);
    }
  });

  it('keeps to the chosen traits and 1 to 10 sample plants', () => {
    const names = (plants: number) =>
      sheetColumns(traits, {
        harvest: false,
        traitIds: ['plant_height'],
        plants,
        ...defaultSheetUnits('us'),
      }).map((c) => c.name);
    expect(names(0)).toEqual(['plant_height_in_p1']);
    expect(names(40)).toHaveLength(10);
    expect(readSheetColumn('plant_height_in_p11', traits)).toEqual({
      problem: 'A sheet has at most 10 sample plants.',
    });
  });
});
