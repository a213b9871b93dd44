/**
 * A two-factor trait's cell means table (comparison view and results sheet): each entry × level
 * cell and each entry's mean over all levels as mean ± SE, the treatment named as the lead named
 * it, and sorting by a level orders the entries by their cell means. The numbers are R's:
 * fixtures/analysis/two-factor-split-plot.json (aov with Error(block/treatment) + emmeans 1.8.4.1).
 */
import { readFileSync } from 'node:fs';
import { fireEvent, render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { twoFactorSchema } from '../../common/contracts/analysis';
import { displayNumber } from '../../common/precision';
import { CellMeansTable } from '../../src/features/results/components/cell-means-table';

const r = JSON.parse(readFileSync('fixtures/analysis/two-factor-split-plot.json', 'utf8')) as {
  cellMeans: { variety: string; treatment: string; mean: number; se: number; df: number }[];
  treatmentMeans: { treatment: string; mean: number; se: number; df: number }[];
  varietyMeans: { variety: string; mean: number; se: number; df: number }[];
};
const twoFactor = twoFactorSchema.parse({
  factor: 'Fertilizer',
  levels: ['none', 'pre-plant'],
  layout: 'split-plot',
  cellMeans: r.cellMeans,
  treatmentMeans: r.treatmentMeans,
  varietyMeans: r.varietyMeans,
  treatmentWithinVariety: [],
  varietyWithinTreatment: [],
});
const varieties = r.varietyMeans.map((m) => m.variety);
const pm = (m: { mean: number; se: number }) =>
  `${displayNumber(m.mean, 2)} ± ${displayNumber(m.se, 2)}`;

describe('the cell means table', () => {
  it('shows each variety at each fertilizer level and over all levels, sorted by a level on request', () => {
    render(
      <CellMeansTable
        twoFactor={twoFactor}
        varieties={varieties}
        traitLabel="Days to first pods"
        unit={{ label: 'd', factor: 1 }}
        decimals={2}
      />,
    );
    const table = screen.getByRole('table', {
      name: /Cell means: Days to first pods \(d\), variety × fertilizer/,
    });
    const headers = within(table)
      .getAllByRole('columnheader')
      .map((h) => h.textContent?.replace(/[↕↑↓]/g, ''));
    expect(headers).toEqual(['Variety', 'none', 'pre-plant', 'Over all levels']);
    for (const variety of varieties) {
      const row = within(table).getByRole('row', { name: new RegExp(`^${variety}`) });
      const cells = within(row)
        .getAllByRole('cell')
        .map((c) => c.textContent);
      expect(cells).toEqual([
        pm(r.cellMeans.find((c) => c.variety === variety && c.treatment === 'none')!),
        pm(r.cellMeans.find((c) => c.variety === variety && c.treatment === 'pre-plant')!),
        pm(r.varietyMeans.find((m) => m.variety === variety)!),
      ]);
    }
    expect(screen.getByText(/^Fertilizer means:/).textContent).toBe(
      `Fertilizer means: ${r.treatmentMeans.map((m) => `${m.treatment} ${pm(m)}`).join('; ')} d`,
    );
    // Sorting by "none" orders the entries by their cell means without fertilizer.
    fireEvent.click(within(table).getByRole('button', { name: /^none/ }));
    const order = within(table)
      .getAllByRole('rowheader')
      .map((h) => h.textContent);
    const byNone = r.cellMeans
      .filter((c) => c.treatment === 'none')
      .sort((a, b) => a.mean - b.mean)
      .map((c) => c.variety);
    expect([byNone, [...byNone].reverse()]).toContainEqual(order);
  });
});
