/**
 * The one sortable table: a header button sorts (numbers as numbers, then reversed) and says so
 * with aria-sort; a column can be hidden by its checkbox; the row header stays.
 */
import { createColumnHelper } from '@tanstack/react-table';
import { fireEvent, render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { DataTable } from '../../src/components/ui/data-table';

interface Plot {
  id: string;
  plot: string;
  entry: string;
  harvests: number;
}
const col = createColumnHelper<Plot>();
const columns = [
  col.accessor('plot', { header: 'Plot' }),
  col.accessor('entry', { header: 'Entry' }),
  col.accessor('harvests', { header: 'Harvests' }),
];
const data: Plot[] = [
  { id: 'a', plot: '101', entry: 'E2', harvests: 3 },
  { id: 'b', plot: '102', entry: 'E1', harvests: 12 },
  { id: 'c', plot: '103', entry: 'E3', harvests: 0 },
];

const bodyRows = () => within(screen.getByRole('table')).getAllByRole('row').slice(1);
const firstCells = () => bodyRows().map((r) => within(r).getByRole('rowheader').textContent);

describe('DataTable', () => {
  it('sorts by a header, numbers as numbers, and reverses on a second press', () => {
    render(
      <DataTable
        caption="Plots"
        data={data}
        columns={columns}
        rowId={(r) => r.id}
        rowHeader="plot"
      />,
    );
    expect(firstCells()).toEqual(['101', '102', '103']);
    const harvests = screen.getByRole('button', { name: /Harvests/ });
    const th = () => screen.getByRole('columnheader', { name: /Harvests/ });
    // The first press on a number column sorts high to low (the library's default for numbers:
    // the most first), the second low to high.
    fireEvent.click(harvests);
    expect(firstCells()).toEqual(['102', '101', '103']);
    expect(th().getAttribute('aria-sort')).toBe('descending');
    fireEvent.click(harvests);
    expect(firstCells()).toEqual(['103', '101', '102']);
    expect(th().getAttribute('aria-sort')).toBe('ascending');
    fireEvent.click(screen.getByRole('button', { name: /Entry/ }));
    expect(firstCells()).toEqual(['102', '101', '103']);
    expect(screen.getByRole('columnheader', { name: /Entry/ }).getAttribute('aria-sort')).toBe(
      'ascending',
    );
  });

  it('hides a column by its checkbox; the row header cannot be hidden', () => {
    render(
      <DataTable
        caption="Plots"
        data={data}
        columns={columns}
        rowId={(r) => r.id}
        rowHeader="plot"
        chooseColumns
      />,
    );
    expect(screen.getAllByRole('columnheader')).toHaveLength(3);
    fireEvent.click(screen.getByRole('checkbox', { name: 'Entry' }));
    expect(
      screen.getAllByRole('columnheader').map((h) => h.textContent?.replace(/[▲▼↕]/g, '')),
    ).toEqual(['Plot', 'Harvests']);
    expect((screen.getByRole('checkbox', { name: 'Plot' }) as HTMLInputElement).disabled).toBe(
      true,
    );
  });
});
