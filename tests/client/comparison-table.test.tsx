/**
 * The comparison table's sort puts the best entry first on the first press, in each trait's own
 * direction: a lower-is-better trait ascending (aria-sort "ascending"), a higher-is-better one
 * descending; the second press reverses it; an entry with no value stays last either way. On an
 * unbalanced layout the adjusted means sort, as the ranks come from them, and each rank agrees
 * with the row's place. The table shows the engine's answers; the expected orders and adjusted
 * means are R's, read from the reference fixtures:
 * - lower is better: R `datasets::InsectSprays` (Beall 1942), insects counted per plot after a
 *   spray, fewer is better (fixtures/analysis/insectsprays.json, `aov`);
 * - higher is better: the fictional multisite set with 2 plots missing, least-squares means by
 *   R emmeans 1.8.4.1 (fixtures/analysis/adjusted-multisite-missing.json).
 * Unit factor: 1 oz = 28.349523125 g exactly (NIST Handbook 44, Appendix C).
 */
import { readFileSync } from 'node:fs';
import { fireEvent, render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { trialAnalysisSchema } from '../../common/contracts/analysis';
import type { UnitSystem } from '../../common/contracts/me';
import { analyzeCsv } from '../../server/analysis/engine/analyze';
import {
  type ComparedTrait,
  ComparisonTable,
} from '../../src/features/results/components/comparison-table';

const fixture = (name: string) => readFileSync(`fixtures/analysis/${name}`, 'utf8');

// The six entries of the invented trial; InsectSprays' sprays A–F stand for them in this order.
const entries = [
  'Velvet Lantern',
  'Copper Thimble',
  'Quillfeather',
  'Mossbank Long',
  'Harrow Gold',
  'Tallow Finger',
];
const sprayName = (spray: string) => entries['ABCDEF'.indexOf(spray)]!;
const insectCsv = fixture('insectsprays.csv').replace(
  /^([A-F]),/gm,
  (_, spray: string) => `${sprayName(spray)},`,
);

const traits: ComparedTrait[] = [
  { key: 'pest_count', label: 'Pest count', direction: 'lower', displayUnit: null },
  { key: 'pod_mass', label: 'Pod mass', direction: 'higher', displayUnit: null },
];

/** The analysis API's answer: the engine's result with the trait's own fields, through JSON. */
function answer(
  csv: string,
  trait: ComparedTrait,
  unit: string,
  decimals: { plotValue: number; mean: number },
) {
  const result = analyzeCsv(csv, { direction: trait.direction });
  return trialAnalysisSchema.parse(
    JSON.parse(
      JSON.stringify({
        ...result,
        traitKey: trait.key,
        traitLabel: trait.label,
        quantityKind: unit === 'count' ? 'count' : 'mass',
        direction: trait.direction,
        basis: 'plot',
        unit,
        decimals,
        valueNote: 'the plot’s value',
        plotValues: [],
        entryCodes: {},
      }),
    ),
  );
}

const analyses = new Map([
  ['pest_count', answer(insectCsv, traits[0]!, 'count', { plotValue: 0, mean: 1 })],
  [
    'pod_mass',
    answer(fixture('multisite-missing.csv'), traits[1]!, 'g', { plotValue: 2, mean: 3 }),
  ],
]);

// R's values.
const insectMeans = (
  JSON.parse(fixture('insectsprays.json')) as { means: { variety: string; mean: number }[] }
).means.map((m) => ({ variety: sprayName(m.variety), mean: m.mean }));
const adjustedMeans = (
  JSON.parse(fixture('adjusted-multisite-missing.json')) as {
    adjustedMeans: { variety: string; mean: number }[];
  }
).adjustedMeans;
const byMean = (means: { variety: string; mean: number }[], sign: 1 | -1) =>
  [...means].sort((a, b) => sign * (a.mean - b.mean)).map((m) => m.variety);

function show(units: UnitSystem = 'metric') {
  render(
    <ComparisonTable
      entries={entries.map((name) => ({ name }))}
      traits={traits}
      analyses={analyses}
      units={units}
    />,
  );
  return screen.getByRole('table', { name: /^Entries compared/ });
}

const order = (table: HTMLElement) =>
  within(table)
    .getAllByRole('rowheader')
    .map((th) => th.textContent);
const header = (name: RegExp) => screen.getByRole('columnheader', { name });

describe('the comparison table', () => {
  it('a lower-is-better trait sorts lowest first on the first press, with aria-sort ascending', () => {
    const table = show();
    expect(order(table)).toEqual(entries);
    expect(header(/^Pest count/).getAttribute('aria-sort')).toBeNull();

    const best = byMean(insectMeans, 1);
    // Quillfeather (spray C, 2.083 insects) is best, Tallow Finger (spray F, 16.67) worst.
    expect(best[0]).toBe('Quillfeather');
    fireEvent.click(screen.getByRole('button', { name: /^Pest count/ }));
    expect(order(table)).toEqual(best);
    expect(header(/^Pest count/).getAttribute('aria-sort')).toBe('ascending');
    expect(header(/^Pest count/).textContent).toContain('lower is better');
    expect(header(/^Pest count/).textContent).toContain('(best first)');
    // Each rank agrees with the row's place.
    const cells = () =>
      within(table)
        .getAllByRole('row')
        .slice(1)
        .map((r) => within(r).getAllByRole('cell')[0]!.textContent);
    cells().forEach((text, i) => expect(text).toMatch(new RegExp(`#${i + 1}$`)));
    // R's mean for spray C, 2.083333…, at the trait's one decimal for a mean of counts.
    expect(cells()[0]).toMatch(/^2\.1 ± /);

    fireEvent.click(screen.getByRole('button', { name: /^Pest count/ }));
    expect(order(table)).toEqual([...best].reverse());
    expect(header(/^Pest count/).getAttribute('aria-sort')).toBe('descending');
    expect(header(/^Pest count/).textContent).toContain('(worst first)');
  });

  it('a higher-is-better trait sorts highest first, by the adjusted means; a missing entry stays last', () => {
    const table = show();
    const best = byMean(adjustedMeans, -1);
    expect(best).toEqual([
      'Harrow Gold',
      'Mossbank Long',
      'Quillfeather',
      'Copper Thimble',
      'Velvet Lantern',
    ]);
    fireEvent.click(screen.getByRole('button', { name: /^Pod mass/ }));
    // Tallow Finger was not grown in this set: no value, last in either order.
    expect(order(table)).toEqual([...best, 'Tallow Finger']);
    expect(header(/^Pod mass/).getAttribute('aria-sort')).toBe('descending');
    expect(header(/^Pod mass/).textContent).toContain('higher is better');
    expect(header(/^Pod mass/).textContent).toContain('(best first)');
    expect(header(/^Pest count/).getAttribute('aria-sort')).toBeNull();
    const cells = () =>
      within(table)
        .getAllByRole('row')
        .slice(1)
        .map((r) => within(r).getAllByRole('cell')[1]!.textContent);
    best.forEach((_, i) => expect(cells()[i]).toContain(`#${i + 1}`));
    // Harrow Gold's adjusted mean, R emmeans 23.83667 g, at the mean's three decimals.
    expect(cells()[0]).toContain('adjusted 23.837');
    expect(cells()[5]).toBe('—');

    fireEvent.click(screen.getByRole('button', { name: /^Pod mass/ }));
    expect(order(table)).toEqual([...best].reverse().concat('Tallow Finger'));
    expect(header(/^Pod mass/).getAttribute('aria-sort')).toBe('ascending');
    expect(header(/^Pod mass/).textContent).toContain('(worst first)');
  });

  it('names each unit in its header in the reader’s system, and a count has none', () => {
    show('us');
    expect(header(/^Pod mass \(oz\)/)).toBeTruthy();
    expect(header(/^Pest count/).textContent).not.toContain('(');
    fireEvent.click(screen.getByRole('button', { name: /^Pod mass/ }));
    const first = within(screen.getByRole('table'))
      .getAllByRole('row')[1]!
      .querySelectorAll('td')[1]!;
    // 23.83667 g ÷ 28.349523125 g/oz = 0.84081 oz; 0.001 g steps become 0.0001 oz.
    expect(first.textContent).toContain('adjusted 0.8408');
  });
});
