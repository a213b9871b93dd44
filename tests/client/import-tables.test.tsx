/**
 * The import's tables: the rows read show each harvest's mass in one unit for the column, in
 * the reader's system, named in the heading, and each observation in its trait's unit; the
 * problems name row, column and message. Unit factors are exact (NIST Handbook 44, Appendix C:
 * 1 lb = 453.59237 g, 1 in = 25.4 mm).
 */
import { render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { ImportPreview } from '../../common/contracts/records';
import {
  ImportProblems,
  ImportRowsRead,
} from '../../src/features/records/components/import-tables';

const rows: ImportPreview['rows'] = [
  {
    row: 2,
    status: 'new',
    plotLabel: 'Tansy Row plot 101',
    record: {
      kind: 'harvest',
      date: '2026-07-01',
      fruitCount: 12,
      massG: 1800,
      grade: 'marketable',
    },
  },
  {
    row: 2,
    status: 'new',
    plotLabel: 'Tansy Row plot 101',
    record: { kind: 'harvest', date: '2026-07-01', fruitCount: 1, massG: 200, grade: 'cull' },
  },
  {
    row: 3,
    status: 'already_recorded',
    plotLabel: 'Tansy Row plot 102',
    record: {
      kind: 'observation',
      date: '2026-07-01',
      traitKey: 'plant_height',
      traitLabel: 'Plant height',
      plantNumber: 1,
      value: 254,
      valueDate: null,
    },
  },
];
const traits = [{ key: 'plant_height', quantityKind: 'length', displayUnit: null }];

const cells = (table: HTMLElement) =>
  within(table)
    .getAllByRole('row')
    .slice(1)
    .map((r) => [...r.children].map((c) => c.textContent));

describe('the import tables', () => {
  it('shows the rows read in US customary units, one mass unit for the column', () => {
    render(<ImportRowsRead rows={rows} traits={traits} units="us" />);
    const table = screen.getByRole('table', { name: 'Rows read' });
    expect(screen.getByRole('columnheader', { name: /^Mass \(lb\)/ })).toBeTruthy();
    // Whole grams in lb: 3 more decimals (1800 g = 3.968 lb, 200 g = 0.441 lb); 254 mm = 10 in.
    expect(cells(table)).toEqual([
      ['2', 'Tansy Row plot 101', '2026-07-01', 'Harvest, marketable', '12', '3.968', '—', 'new'],
      ['2', 'Tansy Row plot 101', '2026-07-01', 'Harvest, cull', '1', '0.441', '—', 'new'],
      [
        '3',
        'Tansy Row plot 102',
        '2026-07-01',
        'Plant height, plant 1',
        '—',
        '—',
        '10.0',
        'already recorded',
      ],
    ]);
    expect(screen.getByRole('columnheader', { name: /^Value \(in\)/ })).toBeTruthy();
  });

  it('names the row, column and message of each problem', () => {
    render(
      <ImportProblems
        errors={[
          { row: 3, column: 'mass_g', message: 'The mass cannot be negative.' },
          { row: 4, column: 'harvested_on', message: 'The date is in the future.' },
        ]}
      />,
    );
    const table = screen.getByRole('table', { name: /^Problems/ });
    expect(cells(table)).toEqual([
      ['3', 'mass_g', 'The mass cannot be negative.'],
      ['4', 'harvested_on', 'The date is in the future.'],
    ]);
  });
});
