/**
 * The layout page's plot plan: plots in field order until a reader sorts, the second factor
 * named as the lead named it, the spacing's unit in the header in the reader's system and bare
 * numbers in the cells. 1 in = 25.4 mm exactly (NIST Handbook 44, Appendix C).
 */
import { fireEvent, render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { Design } from '../../common/contracts/design';
import type { UnitSystem } from '../../common/contracts/me';
import { DataTable } from '../../src/components/ui/data-table';
import { planColumns } from '../../src/features/design/components/plan-columns';

const plot = (id: string, plotNumber: number, block: string, entryId: string, extra: object) => ({
  id,
  plotNumber,
  block,
  entryId,
  replicate: null,
  treatment: null,
  inRowSpacingMm: 300,
  plannedPlants: 10,
  ...extra,
});
// Invented entries; only the fields the plan reads.
const design = {
  layout: { blocks: null },
  factor: { name: 'Fertilizer' },
  entries: [
    { id: 'e1', code: 'AT', name: 'Ashmoor Tall' },
    { id: 'e2', code: 'BD', name: 'Brindle Dwarf' },
  ],
  plots: [
    plot('p1', 101, '1', 'e2', { treatment: 'compost', inRowSpacingMm: 900, plannedPlants: 3 }),
    plot('p2', 102, '1', 'e1', { treatment: 'none' }),
    plot('p3', 201, '2', 'e1', { treatment: 'compost', plannedPlants: null }),
  ],
} as unknown as Design;

function show(system: UnitSystem) {
  render(
    <DataTable
      caption="Plots of the site in field order"
      data={design.plots}
      columns={planColumns(design, system)}
      rowId={(p) => p.id}
      rowHeader="plot"
    />,
  );
  const table = screen.getByRole('table');
  return {
    headers: () =>
      within(table)
        .getAllByRole('columnheader')
        .map((h) => h.textContent?.replace(/[▲▼↕]/g, '')),
    rows: () =>
      within(table)
        .getAllByRole('row')
        .slice(1)
        .map((r) => [...r.querySelectorAll('th, td')].map((c) => c.textContent)),
  };
}

describe('the plot plan', () => {
  it('lists plots in field order with the factor’s own name and spacing in cm', () => {
    const { headers, rows } = show('metric');
    expect(headers()).toEqual([
      'Plot',
      'Block',
      'Fertilizer',
      'Entry',
      'In-row spacing (cm)',
      'Plants planned',
    ]);
    expect(rows()).toEqual([
      ['101', '1', 'compost', 'BD Brindle Dwarf', '90', '3'],
      ['102', '1', 'none', 'AT Ashmoor Tall', '30', '10'],
      ['201', '2', 'compost', 'AT Ashmoor Tall', '30', '—'],
    ]);
  });

  it('sorts by plants planned, a plot with none last, and shows inches to a US reader', () => {
    const { headers, rows } = show('us');
    expect(headers()[4]).toBe('In-row spacing (in)');
    // 900 mm ÷ 25.4 = 35.43 in; 300 mm = 11.81 in.
    expect(rows().map((r) => r[4])).toEqual(['35.43', '11.81', '11.81']);
    fireEvent.click(screen.getByRole('button', { name: /Plants planned/ }));
    expect(rows().map((r) => r[0])).toEqual(['102', '101', '201']);
  });
});
