/**
 * The published sheet's ranking and entry-means tables: rows stay in rank order (the order is
 * the content, so the headers do not sort), a lower-is-better trait ranks its smallest mean
 * first, a trait with no preferred direction has no rank column, an unbalanced trait ranks on
 * its adjusted mean, and each trait's column says its unit once in the header in the reader's
 * unit system while the cells hold bare numbers with the trait's decimals (no float noise).
 * Unit factors are exact (NIST Handbook 44, Appendix C: 1 in = 25.4 mm,
 * 1 oz = 28.349523125 g).
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { ResultSnapshot } from '../../common/contracts/results';
import type { UnitSystem } from '../../common/contracts/me';
import { SheetView } from '../../src/features/results/components/sheet-view';

const mean = (variety: string, value: number, se: number, group: string, n = 3) => ({
  variety,
  n,
  mean: value,
  sd: null,
  se,
  rank: null,
  group,
});
const trait = {
  basis: 'plot' as const,
  design: 'rcbd' as const,
  weight: 1,
  n: 12,
  cvPercent: 8.25,
  anova: [],
  lsd: { value: 30, df: 6, t: 2.447 },
  hsd: { value: 40, q: 4.34 },
  warnings: [],
};

// Invented varieties; the stored ranking puts Quillhaven first although it sorts last by name.
const sheet: ResultSnapshot = {
  trial: {
    title: 'Fernwick bush bean, one garden',
    slug: 'fernwick-bush-bean',
    crop: 'Bush bean',
    season: '2026',
    design: 'rcbd',
    description: '',
    sowingDate: null,
    transplantDate: null,
  },
  version: 1,
  publishedAt: '2026-09-01T10:00:00.000Z',
  changeNote: '',
  alpha: 0.05,
  letters: 'lsd',
  license: 'CC-BY-4.0',
  summary: '',
  methods: 'Four varieties in three blocks.',
  plotCount: 12,
  sites: [],
  entries: [],
  traits: [
    {
      ...trait,
      key: 'pod_yield',
      label: 'Pod yield',
      unit: 'g',
      displayUnit: 'g',
      quantityKind: 'mass',
      direction: 'higher',
      decimals: { plotValue: 0, mean: 1 },
      grandMean: 1400,
      // 1412.3 with the noise a sum of floats leaves behind.
      means: [
        mean('Amberlow', 1412.3000000000002, 11.2, 'b'),
        mean('Quillhaven', 1523.4, 10.8, 'a'),
        mean('Dunmere', 1288.06, 12.6, 'c'),
        mean('Brackenfold', 1376.6, 11.9, 'bc'),
      ],
    },
    {
      ...trait,
      key: 'plant_height',
      label: 'Plant height',
      unit: 'mm',
      quantityKind: 'length',
      direction: 'lower',
      decimals: { plotValue: 0, mean: 1 },
      grandMean: 380,
      // Unbalanced: Dunmere lost a plot; its adjusted mean (not its raw one) is what ranks.
      means: [
        mean('Amberlow', 362.4, 4.1, 'a'),
        mean('Quillhaven', 401.2, 4.3, 'b'),
        { ...mean('Dunmere', 355.0, 5.2, 'ab', 2), adjustedMean: 371.9, adjustedSe: 5.0 },
        mean('Brackenfold', 388.8, 4.2, 'ab'),
      ],
    },
    {
      ...trait,
      key: 'pod_count',
      label: 'Marketable pod count',
      unit: 'count',
      quantityKind: 'count',
      direction: 'none',
      decimals: { plotValue: 0, mean: 1 },
      grandMean: 41,
      means: [
        mean('Amberlow', 40.333333333333336, 1.2, 'a'),
        mean('Quillhaven', 44.7, 1.1, 'a'),
        mean('Dunmere', 38.1, 1.3, 'a'),
        mean('Brackenfold', 41.2, 1.2, 'a'),
      ],
    },
  ],
  ranking: [
    { variety: 'Quillhaven', rank: 1, index: 0.8123, rankSum: 5, contributions: {} },
    { variety: 'Amberlow', rank: 2, index: 0.4, rankSum: 3, contributions: {} },
    { variety: 'Brackenfold', rank: 3, index: -0.1000000000000001, rankSum: 6, contributions: {} },
    { variety: 'Dunmere', rank: 4, index: -1.1123, rankSum: 6, contributions: {} },
  ],
  cautions: [],
  plotValues: [],
};

function show(units: UnitSystem) {
  const queryClient = new QueryClient({
    defaultOptions: { queries: { retry: false, staleTime: Infinity } },
  });
  queryClient.setQueryData(['session', 'me'], {
    id: '00000000-0000-4000-8000-000000000001',
    email: 'wren@example.org',
    name: 'Wren Talbot',
    unitSystem: units,
  });
  render(
    <QueryClientProvider client={queryClient}>
      <SheetView sheet={sheet} />
    </QueryClientProvider>,
  );
}

/** A table's header texts and its rows' cell texts, in the order shown. */
function tableOf(name: RegExp) {
  const table = screen.getByRole('table', { name });
  const [head, ...body] = within(table).getAllByRole('row');
  return {
    headers: within(head!)
      .getAllByRole('columnheader')
      .map((h) => h.textContent),
    rows: body.map((r) => [...r.querySelectorAll('th, td')].map((c) => c.textContent)),
    table,
  };
}

describe('the results sheet’s tables', () => {
  it('keeps the ranking in rank order, with each trait’s unit in its header (metric)', () => {
    show('metric');
    const ranking = tableOf(/ranked by the weighted index/);
    expect(ranking.headers).toEqual([
      'Rank',
      'Variety',
      'Index',
      'Pod yield (g)',
      'Plant height (cm)',
      'Marketable pod count',
    ]);
    expect(ranking.rows).toEqual([
      ['1', 'Quillhaven', '0.81', '1,523.4 a', '40.12 b', '44.7 a'],
      ['2', 'Amberlow', '0.40', '1,412.3 b', '36.24 a', '40.3 a'],
      ['3', 'Brackenfold', '-0.10', '1,376.6 bc', '38.88 ab', '41.2 a'],
      ['4', 'Dunmere', '-1.11', '1,288.1 c', '35.50 ab', '38.1 a'],
    ]);
    // The order is the content: no header offers to re-sort it.
    expect(within(ranking.table).queryAllByRole('button')).toEqual([]);
    expect(
      within(ranking.table)
        .getAllByRole('rowheader')
        .map((h) => h.textContent),
    ).toEqual(['Quillhaven', 'Amberlow', 'Brackenfold', 'Dunmere']);
  });

  it('ranks each trait best first by its direction, unbalanced ones on the adjusted mean', () => {
    show('metric');
    const yieldTable = tableOf(/^Pod yield: entry means/);
    expect(yieldTable.headers).toEqual(['Rank', 'Variety', 'Mean ± SE (g)', 'Group', 'Plots']);
    expect(yieldTable.rows).toEqual([
      ['1', 'Quillhaven', '1,523.4 ± 10.8', 'a', '3'],
      ['2', 'Amberlow', '1,412.3 ± 11.2', 'b', '3'],
      ['3', 'Brackenfold', '1,376.6 ± 11.9', 'bc', '3'],
      ['4', 'Dunmere', '1,288.1 ± 12.6', 'c', '3'],
    ]);

    // Lower is better: the smallest adjusted mean ranks first. Dunmere's raw mean (35.50 cm) is
    // the smallest, but its adjusted mean (37.19 cm) puts it second.
    const heights = tableOf(/^Plant height: entry means/);
    expect(heights.headers).toEqual(['Rank', 'Variety', 'Mean ± SE (cm)', 'Group', 'Plots']);
    expect(heights.rows).toEqual([
      ['1', 'Amberlow', '36.24 ± 0.41', 'a', '3'],
      ['2', 'Dunmere', '35.50 ± 0.52adjusted 37.19 ± 0.50', 'ab', '2'],
      ['3', 'Brackenfold', '38.88 ± 0.42', 'ab', '3'],
      ['4', 'Quillhaven', '40.12 ± 0.43', 'b', '3'],
    ]);
    expect(heights.table.querySelector('caption')?.textContent).toContain(
      'ranked best first (lower is better)',
    );

    // No preferred direction: no rank column; largest mean first, nobody called best.
    const counts = tableOf(/^Marketable pod count: entry means/);
    expect(counts.headers).toEqual(['Variety', 'Mean ± SE', 'Group', 'Plots']);
    expect(counts.rows.map((r) => r[0])).toEqual([
      'Quillhaven',
      'Brackenfold',
      'Amberlow',
      'Dunmere',
    ]);
    expect(counts.rows[2]![1]).toBe('40.3 ± 1.2');
  });

  it('shows a US customary reader ounces and inches, converted exactly', () => {
    show('us');
    const ranking = tableOf(/ranked by the weighted index/);
    expect(ranking.headers.slice(3)).toEqual([
      'Pod yield (oz)',
      'Plant height (in)',
      'Marketable pod count',
    ]);
    // 1523.4 g ÷ 28.349523125 = 53.736 oz; 401.2 mm ÷ 25.4 = 15.795 in.
    expect(ranking.rows[0]).toEqual(['1', 'Quillhaven', '0.81', '53.74 a', '15.80 b', '44.7 a']);
    const heights = tableOf(/^Plant height: entry means/);
    expect(heights.headers[2]).toBe('Mean ± SE (in)');
    // 362.4 mm = 14.268 in, SE 4.1 mm = 0.161 in.
    expect(heights.rows[0]).toEqual(['1', 'Amberlow', '14.27 ± 0.16', 'a', '3']);
  });
});
