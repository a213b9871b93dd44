/**
 * Traits that trials of fruiting vegetables usually score, ready to add to a trial. Choices of
 * basis, direction and score scales are common practice (no source); a lead may edit them or
 * add custom traits.
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
    hint: '0 = smooth, no irritation; 3 = stiff spines or hairs that irritate bare skin.',
    caution: 'spiny-crop',
  },
];

export function presetByKey(key: string): TraitPreset | undefined {
  return traitPresets.find((p) => p.key === key);
}
