/**
 * common/plausibility.ts: values outside a trait's plausible range are asked about, never
 * refused. The ranges (common/trait-presets.ts) are common practice (no source); the cases here
 * are the ones a grower meets: 9,999 fruit weighing 5 g, a height typed in mm meant as cm.
 */
import { describe, expect, it } from 'vitest';
import { describeRange, harvestDoubts, observationDoubt } from '../../common/plausibility';
import { defaultPlausibleRange, traitPresets } from '../../common/trait-presets';

const height = {
  label: 'Plant height',
  quantityKind: 'length',
  basis: 'plant',
  displayUnit: null,
  plausibleMin: 20,
  plausibleMax: 4000,
};
const harvestMass = {
  label: 'Marketable yield',
  quantityKind: 'mass',
  basis: 'harvest',
  displayUnit: null,
  plausibleMin: 0.5,
  plausibleMax: 5000,
};

describe('harvest records', () => {
  it('asks about 9,999 fruit weighing 5 g: too many fruit, too light per fruit', () => {
    const doubts = harvestDoubts({ fruitCount: 9999, massG: 5 }, [harvestMass], 'metric');
    expect(doubts).toEqual([
      '9,999 fruit in one harvest is outside the plausible 0–1,000.',
      // 5 g / 9,999 = 0.0005 g per fruit
      '0.0005 g per fruit is outside the plausible 0.5–5,000 g per fruit.',
    ]);
  });

  it('lets an ordinary okra picking through without a word (24 pods, 410 g)', () => {
    expect(harvestDoubts({ fruitCount: 24, massG: 410 }, [harvestMass], 'metric')).toEqual([]);
  });

  it('uses the usual harvest ranges when the trial has no harvest traits', () => {
    expect(harvestDoubts({ fruitCount: 9999, massG: 5 }, [], 'metric')).toHaveLength(2);
  });

  it('follows the lead’s range and unit for the harvest mass', () => {
    const pumpkins = { ...harvestMass, displayUnit: 'kg' as const, plausibleMax: 40_000 };
    expect(harvestDoubts({ fruitCount: 1, massG: 12_000 }, [pumpkins], 'metric')).toEqual([]);
    expect(harvestDoubts({ fruitCount: 1, massG: 55_000 }, [pumpkins], 'metric')).toEqual([
      '55 kg per fruit is outside the plausible 0.0005–40 kg per fruit.',
    ]);
  });

  it('asks about a mass with no fruit counted', () => {
    expect(harvestDoubts({ fruitCount: 0, massG: 300 }, [harvestMass], 'metric')).toEqual([
      'A mass with no fruit counted: was the count left out?',
    ]);
  });
});

describe('measurements', () => {
  it('asks about a height far below the range (9.2 mm, shown as 0.92 cm)', () => {
    expect(observationDoubt(92 / 10, height, 'metric')).toBe(
      'Plant height 0.92 cm is outside the plausible 2–400 cm.',
    );
    expect(observationDoubt(920, height, 'metric')).toBeNull();
  });

  it('writes the question in the reader’s units', () => {
    expect(observationDoubt(5000, height, 'us')).toBe(
      'Plant height 197 in is outside the plausible 0.787–157 in.',
    );
  });

  it('never asks about scores or dates (a score’s scale is a rule of its own)', () => {
    const vigor = { ...height, quantityKind: 'score', plausibleMin: 1, plausibleMax: 5 };
    expect(observationDoubt(9, vigor, 'metric')).toBeNull();
  });

  it('describes open-ended ranges', () => {
    expect(describeRange({ min: 20, max: null }, 'length', 'metric')).toBe('from 2 cm');
    expect(describeRange({ min: null, max: 100 }, 'percent', 'metric')).toBe('up to 100 %');
  });
});

describe('starting ranges', () => {
  it('come from the preset, or per fruit and per harvest for harvest traits', () => {
    expect(
      defaultPlausibleRange({ key: 'plant_height', quantityKind: 'length', basis: 'plant' }),
    ).toEqual({
      plausibleMin: 20,
      plausibleMax: 4000,
    });
    expect(
      defaultPlausibleRange({ key: 'pod_count', quantityKind: 'count', basis: 'harvest' }),
    ).toEqual({
      plausibleMin: 0,
      plausibleMax: 1000,
    });
    expect(defaultPlausibleRange({ key: 'vigor', quantityKind: 'score', basis: 'plot' })).toEqual({
      plausibleMin: null,
      plausibleMax: null,
    });
  });

  it('are in order wherever a preset has one', () => {
    for (const p of traitPresets)
      if (p.plausibleMin !== null && p.plausibleMax !== null)
        expect(p.plausibleMin, p.key).toBeLessThan(p.plausibleMax);
  });
});
