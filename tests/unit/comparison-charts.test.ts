/**
 * The comparison charts' data tables, which are their category axes: harvest dates in calendar
 * order with the last date at the end, and every site present, the first included. The drawn
 * axis labels are checked in the browser journey (jsdom lays out no SVG text). Invented
 * entries, sites and dates; expected values worked by hand.
 */
import { describe, expect, it } from 'vitest';
import {
  entrySiteTable,
  harvestCurveTable,
} from '../../src/features/results/components/comparison-chart-data';

// One entry is picked late and one early: a union of each line's dates in order of first
// appearance would put 07-28 after 08-20.
const curve = {
  unit: 'g' as const,
  entries: [
    {
      entry: 'Ashgrove Ribbed',
      code: 'AR',
      points: [
        { date: '2026-08-05', cumulativeMassG: 100 },
        { date: '2026-08-20', cumulativeMassG: 250 },
      ],
    },
    {
      entry: 'Brindle 4.2',
      code: 'B4',
      points: [
        { date: '2026-07-28', cumulativeMassG: 40 },
        { date: '2026-08-12', cumulativeMassG: 90 },
      ],
    },
  ],
};

describe('cumulative harvest chart', () => {
  it('runs the dates in calendar order and carries each total between its harvests', () => {
    const table = harvestCurveTable(curve, 1);
    expect(table.rows.map((r) => r.date)).toEqual([
      '2026-07-28',
      '2026-08-05',
      '2026-08-12',
      '2026-08-20',
    ]);
    // Worked by hand: nothing picked before the first harvest, then the last running total.
    expect(table.rows.map((r) => r.e0)).toEqual([0, 100, 100, 250]);
    expect(table.rows.map((r) => r.e1)).toEqual([40, 40, 90, 90]);
  });
});

describe('entries at each site chart', () => {
  it('labels every site, the first one too', () => {
    const data = {
      unit: 'g',
      cells: [
        { entry: 'Ashgrove Ribbed', site: 'Quarry Lane', mean: 1200, n: 3 },
        { entry: 'Ashgrove Ribbed', site: 'Hollin Field', mean: 900, n: 3 },
        { entry: 'Ashgrove Ribbed', site: 'Tenter Row', mean: 1000, n: 3 },
        { entry: 'Brindle 4.2', site: 'Quarry Lane', mean: 800, n: 3 },
        { entry: 'Brindle 4.2', site: 'Hollin Field', mean: 1100, n: 3 },
        { entry: 'Brindle 4.2', site: 'Tenter Row', mean: 950, n: 3 },
      ],
    };
    const table = entrySiteTable(data, 1 / 1000);
    expect(table.rows.map((r) => r.site)).toEqual(['Quarry Lane', 'Hollin Field', 'Tenter Row']);
    expect(table.series.map((x) => x.name)).toEqual(['Ashgrove Ribbed', 'Brindle 4.2']);
    expect(table.rows[0]).toEqual({ site: 'Quarry Lane', e0: 1.2, e1: 0.8 });
  });
});
