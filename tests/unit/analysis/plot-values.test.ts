// Plot values from raw records. Data are fictional; arithmetic checked by hand in comments.
import { describe, expect, it } from 'vitest';
import {
  KILOGRAMS_PER_POUND,
  SQUARE_METRES_PER_ACRE,
  plotObservationMeans,
  summariseHarvests,
  type HarvestRecord,
  type PlotInfo,
} from '../../../server/analysis/engine/plot-values.js';

const plots: PlotInfo[] = [
  {
    plotId: 'P1',
    entryId: 'Velvet Lantern',
    siteId: 'Northfield',
    block: '1',
    plantsSet: 10,
    plantsSurviving: 8,
    rowLengthM: 5,
    rowSpacingM: 0.9,
    sowingDate: '2024-04-01',
    transplantDate: '2024-05-10',
  },
  {
    plotId: 'P2',
    entryId: 'Mossbank Long',
    siteId: 'Northfield',
    block: '1',
    plantsSet: 10,
    rowLengthM: 4,
    rowSpacingM: 0.75,
    sowingDate: '2024-05-02',
  },
];
const harvests: HarvestRecord[] = [
  { plotId: 'P1', date: '2024-07-12', count: 12, massG: 1500, marketable: true },
  { plotId: 'P1', date: '2024-07-12', count: 3, massG: 210, marketable: false },
  { plotId: 'P1', date: '2024-07-19', count: 20, massG: 2700, marketable: true },
  { plotId: 'P1', date: '2024-08-02', count: 5, massG: 390, marketable: false },
];

describe('season harvest summaries', () => {
  const [p1, p2] = summariseHarvests(plots, harvests);
  it('totals, harvest count and dates', () => {
    expect(p1!.marketable).toEqual({ count: 32, massG: 4200 });
    expect(p1!.total).toEqual({ count: 40, massG: 4800 });
    expect(p1!.harvests).toBe(3); // 12 Jul, 19 Jul, 2 Aug
    expect(p1!.firstHarvest).toBe('2024-07-12');
    expect(p1!.lastHarvest).toBe('2024-08-02');
    // 1 Apr -> 12 Jul 2024: 30 + 31 + 30 + 11 = 102 days; 10 May -> 12 Jul: 21 + 30 + 12 = 63.
    expect(p1!.daysFromSowingToFirstHarvest).toBe(102);
    expect(p1!.daysFromTransplantToFirstHarvest).toBe(63);
    expect(p1!.meanFruitMassG.marketable).toBe(4200 / 32);
    expect(p1!.meanFruitMassG.total).toBe(120);
  });
  it('normalisation per plant (surviving), per metre and per area', () => {
    expect(p1!.plants).toEqual({ count: 8, basis: 'surviving' });
    expect(p1!.areaM2).toBeCloseTo(4.5, 14);
    expect(p1!.marketablePer.perPlant).toEqual({ count: 4, massG: 525 });
    expect(p1!.marketablePer.perMetreOfRow).toEqual({ count: 6.4, massG: 840 });
    // 4200 g / 4.5 m² = 933.33 g/m² -> 9333.3 kg/ha; an acre is exactly 4046.8564224 m² (NIST).
    expect(p1!.marketablePer.kgPerHectare).toBeCloseTo(9333.333333333, 6);
    expect(p1!.marketablePer.kgPerAcre).toBeCloseTo(
      ((4200 / 4.5) * SQUARE_METRES_PER_ACRE) / 1000,
      9,
    );
    expect(p1!.marketablePer.lbPerAcre).toBeCloseTo(
      ((4200 / 4.5) * 4046.8564224) / 1000 / KILOGRAMS_PER_POUND,
      6,
    );
    expect(SQUARE_METRES_PER_ACRE).toBe(4046.8564224);
  });
  it('a plot with no harvest has zeros and nulls', () => {
    expect(p2!.harvests).toBe(0);
    expect(p2!.total).toEqual({ count: 0, massG: 0 });
    expect(p2!.firstHarvest).toBeNull();
    expect(p2!.meanFruitMassG.total).toBeNull();
    expect(p2!.plants.basis).toBe('set');
    expect(p2!.totalPer.kgPerHectare).toBe(0);
  });
  it('rejects unknown plots and bad dates', () => {
    expect(() => summariseHarvests(plots, [{ ...harvests[0]!, plotId: 'P9' }])).toThrow(
      /unknown plot "P9"/,
    );
    expect(() => summariseHarvests(plots, [{ ...harvests[0]!, date: '2024-02-30' }])).toThrow(
      /not a YYYY-MM-DD calendar date/,
    );
  });
});

describe('sample plants averaged to one value per plot', () => {
  it('means and sample counts', () => {
    const m = plotObservationMeans([
      { plotId: 'P1', value: 61, plantNumber: 1 },
      { plotId: 'P1', value: 64, plantNumber: 2 },
      { plotId: 'P2', value: 50 },
      { plotId: 'P1', value: 58, plantNumber: 3 },
    ]);
    expect(m).toEqual([
      { plotId: 'P1', mean: 61, samples: 3 },
      { plotId: 'P2', mean: 50, samples: 1 },
    ]);
  });
});
