/**
 * Safety cautions shown where the work happens: one text each, shared by the design pages
 * (field sheet, map, traits, sites, fertilizer policy) and the field log. They are general
 * reminders, not advice for a particular site: local codes and licensed practice come first.
 */
export interface Caution {
  id: CautionId;
  title: string;
  points: readonly string[];
}

export type CautionId = 'spiny-crop' | 'field-heat' | 'irrigation-backflow' | 'fertilizer-handling';

export const cautions: Record<CautionId, Caution> = {
  'spiny-crop': {
    id: 'spiny-crop',
    title: 'Spiny or irritating plants',
    points: [
      'Wear gloves and long sleeves when harvesting, measuring or handling the plants: fine spines and hairs on leaves, stems and pods can irritate the skin.',
      'Wash skin and clothing after work; keep hands away from the eyes until washed.',
      'Anyone who reacts strongly should stop handling the plants and seek medical advice.',
    ],
  },
  'field-heat': {
    id: 'field-heat',
    title: 'Field work in heat',
    points: [
      'Work in the cooler hours of the morning or evening when you can.',
      'Drink water often, wear a hat and light clothing, and rest in the shade.',
      'Stop and get help at signs of heat illness: dizziness, headache, nausea, confusion, or hot dry skin. Follow local heat-safety guidance.',
    ],
  },
  'irrigation-backflow': {
    id: 'irrigation-backflow',
    title: 'Irrigation connected to drinking water',
    points: [
      'An irrigation line connected to a drinking-water supply needs backflow prevention, so water from the line (and anything injected into it) cannot flow back into the supply.',
      'The kind of device, its installation and testing are set by the local plumbing code; have it installed or checked by a licensed plumber where the code requires.',
      'Never put fertilizer or other products into a line connected to drinking water without the protection the code requires.',
    ],
  },
  'fertilizer-handling': {
    id: 'fertilizer-handling',
    title: 'Handling fertilizer',
    points: [
      'Read and follow the product label: rate, protective equipment and the waiting time before harvest.',
      'Wear gloves when handling fertilizer and manure; wash hands before eating, drinking or smoking.',
      'Store products in their original containers, out of reach of children and pets, away from water sources. Follow local rules on application near water.',
    ],
  },
};

/** Crops whose plants commonly carry irritating spines or hairs (from memory). */
const spinyCrops = ['okra', 'cucumber', 'squash', 'pumpkin', 'eggplant', 'aubergine', 'artichoke'];

export function isSpinyCrop(crop: string): boolean {
  const c = crop.toLowerCase();
  return spinyCrops.some((name) => c.includes(name));
}

/** Words that mark a treatment as fertilizer applied to plots (common practice, no source). */
const fertilizerWords = ['fertili', 'manure', 'compost', 'nitrogen', 'feed', 'npk'];

/** Whether a trial's second factor applies fertilizer: its name or a level names one. */
export function isFertilizerFactor(factor: { name: string; levels: readonly string[] }): boolean {
  return [factor.name, ...factor.levels].some((text) =>
    fertilizerWords.some((w) => text.toLowerCase().includes(w)),
  );
}
