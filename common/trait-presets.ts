/**
 * Traits that trials of fruiting vegetables usually score, ready to add to a trial. Choices of
 * basis, direction, score scales and plausible ranges are common practice (no source); the
 * ranges are wide on purpose (okra and pole beans near 4 m tall, yardlong bean pods near
 * 60 cm, from memory) because a value outside is only asked about. A lead may edit them or add
 * custom traits.
 */
import type { CautionId } from './cautions';

import type { quantityKinds, traitBases, traitDirections } from './contracts/trials';

export interface TraitPreset {
  key: string;
  label: string;
  quantityKind: (typeof quantityKinds)[number];
  basis: (typeof traitBases)[number];
  direction: (typeof traitDirections)[number];
  scaleMin: number | null;
  scaleMax: number | null;
  /** null: shown in the kind's usual unit (common/display-units.ts). */
  displayUnit: null;
  /** Values outside are asked about, never refused; in g, mm, counts or % (common/plausibility.ts). */
  plausibleMin: number | null;
  plausibleMax: number | null;
  /** What the grower is asked to record, in a sentence. */
  hint: string;
  caution?: CautionId;
}

export const traitPresets: readonly TraitPreset[] = [
  {
    key: 'marketable_yield',
    label: 'Marketable yield',
    quantityKind: 'mass',
    basis: 'plot',
    direction: 'higher',
    scaleMin: null,
    scaleMax: null,
    displayUnit: null,
    plausibleMin: null,
    plausibleMax: null,
    hint: 'Mass of marketable fruit or pods per plot, summed over the harvests.',
  },
  {
    key: 'fruit_count',
    label: 'Fruit or pod count',
    quantityKind: 'count',
    basis: 'plot',
    direction: 'higher',
    scaleMin: null,
    scaleMax: null,
    displayUnit: null,
    plausibleMin: 0,
    plausibleMax: 5000,
    hint: 'Number of marketable fruit or pods per plot.',
  },
  {
    key: 'plant_height',
    label: 'Plant height',
    quantityKind: 'length',
    basis: 'plant',
    direction: 'none',
    scaleMin: null,
    scaleMax: null,
    displayUnit: null,
    plausibleMin: 20,
    plausibleMax: 4000,
    hint: 'From the soil to the top of the main stem, on sample plants.',
  },
  {
    key: 'pod_length_at_toughness',
    label: 'Pod length at toughness',
    quantityKind: 'length',
    basis: 'plant',
    direction: 'higher',
    scaleMin: null,
    scaleMax: null,
    displayUnit: null,
    plausibleMin: 20,
    plausibleMax: 600,
    hint: 'Length of a pod when it first turns too tough to eat; longer means it stays tender longer.',
  },
  {
    key: 'days_to_first_harvest',
    label: 'Days to first harvest',
    quantityKind: 'date',
    basis: 'plot',
    direction: 'lower',
    scaleMin: null,
    scaleMax: null,
    displayUnit: null,
    plausibleMin: null,
    plausibleMax: null,
    hint: 'The date of the first marketable harvest; days are counted from sowing or transplant.',
  },
  {
    key: 'vigor',
    label: 'Vigor',
    quantityKind: 'score',
    basis: 'plot',
    direction: 'higher',
    scaleMin: 1,
    scaleMax: 5,
    displayUnit: null,
    plausibleMin: null,
    plausibleMax: null,
    hint: '1 = weak, stunted plants; 5 = strong, even growth.',
  },
  {
    key: 'heat_tolerance',
    label: 'Heat tolerance',
    quantityKind: 'score',
    basis: 'plot',
    direction: 'higher',
    scaleMin: 1,
    scaleMax: 5,
    displayUnit: null,
    plausibleMin: null,
    plausibleMax: null,
    hint: '1 = wilting, flower or fruit drop in hot spells; 5 = no visible stress.',
    caution: 'field-heat',
  },
  {
    key: 'disease',
    label: 'Disease',
    quantityKind: 'score',
    basis: 'plot',
    direction: 'lower',
    scaleMin: 0,
    scaleMax: 5,
    displayUnit: null,
    plausibleMin: null,
    plausibleMax: null,
    hint: '0 = no symptoms; 5 = most of the foliage affected or plants dying.',
  },
  {
    key: 'spines',
    label: 'Spines or skin irritation',
    quantityKind: 'score',
    basis: 'plot',
    direction: 'lower',
    scaleMin: 0,
    scaleMax: 3,
    displayUnit: null,
    plausibleMin: null,
    plausibleMax: null,
    hint: '0 = smooth, no irritation; 3 = stiff spines or hairs that irritate bare skin.',
    caution: 'spiny-crop',
  },
];

export function presetByKey(key: string): TraitPreset | undefined {
  return traitPresets.find((p) => p.key === key);
}

/** Per fruit (g) and per harvest (fruit) for the amounts read from harvest records. */
export const harvestRanges = {
  massPerFruitG: { min: 0.5, max: 5000 },
  fruitPerHarvest: { min: 0, max: 1000 },
} as const;

/**
 * The plausible range a new trait starts with: its preset's, or for a trait fed by harvest
 * records the harvest ranges (a mass per fruit, a count per harvest).
 */
export function defaultPlausibleRange(t: { key: string; quantityKind: string; basis: string }): {
  plausibleMin: number | null;
  plausibleMax: number | null;
} {
  if (t.basis === 'harvest' && t.quantityKind === 'mass')
    return {
      plausibleMin: harvestRanges.massPerFruitG.min,
      plausibleMax: harvestRanges.massPerFruitG.max,
    };
  if (t.basis === 'harvest' && t.quantityKind === 'count')
    return {
      plausibleMin: harvestRanges.fruitPerHarvest.min,
      plausibleMax: harvestRanges.fruitPerHarvest.max,
    };
  const preset = presetByKey(t.key);
  if (preset && preset.quantityKind === t.quantityKind)
    return { plausibleMin: preset.plausibleMin, plausibleMax: preset.plausibleMax };
  return { plausibleMin: null, plausibleMax: null };
}
