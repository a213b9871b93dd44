import { describe, expect, it } from 'vitest';
import { cautions } from '../../common/cautions';
import { traitBody } from '../../common/contracts/design';
import { quantityKinds } from '../../common/contracts/trials';
import { traitPresets } from '../../common/trait-presets';

describe('trait presets', () => {
  it('offers the traits fruiting-vegetable trials usually score', () => {
    expect(traitPresets.map((p) => p.label)).toEqual([
      'Marketable yield',
      'Fruit or pod count',
      'Plant height',
      'Pod length at toughness',
      'Days to first harvest',
      'Vigor',
      'Heat tolerance',
      'Disease',
      'Spines or skin irritation',
    ]);
  });

  it('are each a valid trait for the API (the same contract the server parses)', () => {
    for (const p of traitPresets) {
      const parsed = traitBody.safeParse(p);
      expect(parsed.success, p.key).toBe(true);
      expect(quantityKinds).toContain(p.quantityKind);
    }
    expect(new Set(traitPresets.map((p) => p.key)).size).toBe(traitPresets.length);
  });

  it('give scores a scale and nothing else one', () => {
    for (const p of traitPresets) {
      if (p.quantityKind === 'score') {
        expect(p.scaleMin).not.toBeNull();
        expect(p.scaleMax!).toBeGreaterThan(p.scaleMin!);
      } else {
        expect([p.scaleMin, p.scaleMax]).toEqual([null, null]);
      }
    }
  });

  // Directions, common practice (no source): more marketable produce and longer tender pods are
  // better; earlier first harvest, less disease and fewer spines are better; height is neither.
  it('point each trait the way a grower would rank it', () => {
    const dir = Object.fromEntries(traitPresets.map((p) => [p.key, p.direction]));
    expect(dir).toMatchObject({
      marketable_yield: 'higher',
      fruit_count: 'higher',
      plant_height: 'none',
      pod_length_at_toughness: 'higher',
      days_to_first_harvest: 'lower',
      vigor: 'higher',
      heat_tolerance: 'higher',
      disease: 'lower',
      spines: 'lower',
    });
  });

  it('carry the safety caution where the scoring means handling spines or working in heat', () => {
    const spines = traitPresets.find((p) => p.key === 'spines')!;
    expect(spines.caution).toBe('spiny-crop');
    expect(cautions[spines.caution!].points.join(' ')).toMatch(/gloves/);
    expect(cautions[spines.caution!].points.join(' ')).toMatch(/long sleeves/);
    expect(traitPresets.find((p) => p.key === 'heat_tolerance')!.caution).toBe('field-heat');
    expect(cautions['irrigation-backflow'].points.join(' ')).toMatch(/local plumbing code/);
  });
});
