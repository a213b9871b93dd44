/**
 * The variety page's chart table: one row per trial in the record's order, one column per site,
 * values in the shown unit rounded to the table's precision. The ounce is 28.349523125 g exactly
 * (NIST Handbook 44, Appendix C: 1 lb = 453.59237 g, 16 oz to the pound).
 */
import { describe, expect, it } from 'vitest';
import type { VarietyTrial } from '../../common/contracts/varieties';
import { seasonSiteTable } from '../../src/features/varieties/components/season-chart-data';

const trait = (sites: { site: string; mean: number }[]) => ({
  key: 'marketable_yield',
  label: 'Marketable yield',
  unit: 'g',
  direction: 'higher' as const,
  decimals: 1,
  mean: 0,
  rank: 1,
  entryCount: 4,
  group: 'a',
  sites: sites.map((s) => ({ ...s, n: 3 })),
});
const trial = (slug: string, season: string, sites: { site: string; mean: number }[]) =>
  ({
    slug,
    title: `Trial ${slug}`,
    season,
    view: 'trial',
    version: null,
    entry: { name: 'Velvet Lantern', code: 'VL', notes: '' },
    sites: sites.map((s) => ({ name: s.site, region: '' })),
    traits: [trait(sites)],
    warnings: [],
  }) satisfies VarietyTrial;

describe('seasonSiteTable', () => {
  const record = [
    trial('a', '2025', [
      { site: 'Quarry', mean: 1234.5678 },
      { site: 'Mill Pond', mean: 987.6 },
    ]),
    trial('b', '2026', [{ site: 'Quarry', mean: 1000 }]),
    trial('c', '2026', [{ site: 'Fennick', mean: 500 }]),
  ];

  it('gives one line per site and one point per trial, naming trials that share a season', () => {
    const table = seasonSiteTable(record, 'marketable_yield', 1);
    expect(table.series).toEqual([
      { key: 's0', name: 'Quarry' },
      { key: 's1', name: 'Mill Pond' },
      { key: 's2', name: 'Fennick' },
    ]);
    expect(table.rows).toEqual([
      { label: '2025', s0: 1234.6, s1: 987.6, s2: null },
      { label: '2026 · Trial b', s0: 1000, s1: null, s2: null },
      { label: '2026 · Trial c', s0: null, s1: null, s2: 500 },
    ]);
  });

  it('converts to ounces and keeps the precision shown, with no float noise', () => {
    const table = seasonSiteTable(record, 'marketable_yield', 1 / 28.349523125);
    // 1234.5678 g = 43.5481 oz; 987.6 g = 34.8366 oz; one more decimal than grams, as shown.
    expect(table.rows[0]).toEqual({ label: '2025', s0: 43.55, s1: 34.84, s2: null });
  });

  it('leaves out trials that did not measure the trait', () => {
    expect(seasonSiteTable(record, 'plant_height', 1)).toEqual({ rows: [], series: [] });
  });
});
