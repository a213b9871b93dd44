// Degree days, hot days, water totals and cross-trait ranking. Fictional weather and entries;
// expected values worked by hand in the comments.
import { describe, expect, it } from 'vitest';
import {
  CROP_THRESHOLDS,
  DEFAULT_HOT_DAY_C,
  DEGREE_DAY_METHOD,
  accumulateDegreeDays,
  countHotDays,
  dailyDegreeDays,
  waterTotals,
} from '../../../server/analysis/engine/degree-days.js';
import { rankAcrossTraits } from '../../../server/analysis/engine/ranking.js';

describe('growing degree days (daily average, horizontal cutoff)', () => {
  it('caps Tmax at the upper threshold and raises Tmin to the base', () => {
    expect(DEGREE_DAY_METHOD).toMatch(/horizontal cutoff/);
    expect(dailyDegreeDays(25, 15, 10, 30)).toBe(10); // (25+15)/2 - 10
    expect(dailyDegreeDays(35, 20, 10, 30)).toBe(15); // (30+20)/2 - 10
    expect(dailyDegreeDays(20, 4, 10, 30)).toBe(5); // (20+10)/2 - 10
    expect(dailyDegreeDays(9, 2, 10, 30)).toBe(0); // all below base
    expect(dailyDegreeDays(38, 33, 10, 30)).toBe(20); // both capped: 30 - 10
    expect(() => dailyDegreeDays(10, 12, 10, 30)).toThrow(/above Tmax/);
  });
  it('crop bases are 10 °C for okra, bean, tomato, pepper and say where they come from', () => {
    for (const crop of ['okra', 'bean', 'tomato', 'pepper']) {
      expect(CROP_THRESHOLDS[crop]!.baseC).toBe(10);
      expect(CROP_THRESHOLDS[crop]!.source).toMatch(/common practice|from memory/);
    }
  });
  it('accumulates in date order', () => {
    const s = accumulateDegreeDays(
      [
        { date: '2024-06-02', tMaxC: 35, tMinC: 20 },
        { date: '2024-06-01', tMaxC: 25, tMinC: 15 },
      ],
      CROP_THRESHOLDS.tomato!,
    );
    expect(s.daily.map((d) => [d.date, d.cumulative])).toEqual([
      ['2024-06-01', 10],
      ['2024-06-02', 25],
    ]);
    expect(s.total).toBe(25);
  });
  it('hot days at the default 32 °C', () => {
    expect(DEFAULT_HOT_DAY_C).toBe(32);
    const days = [31.9, 32, 35.5, 20].map((t, i) => ({
      date: `2024-07-0${i + 1}`,
      tMaxC: t,
      tMinC: 15,
    }));
    expect(countHotDays(days)).toBe(2);
    expect(countHotDays(days, 35)).toBe(1);
  });
});

describe('water totals per week and season, against harvests', () => {
  // 2024-07-01 is a Monday.
  const days = [
    { date: '2024-07-01', tMaxC: 28, tMinC: 16, rainMm: 5, irrigationMm: 0 },
    { date: '2024-07-03', tMaxC: 30, tMinC: 18, rainMm: 0, irrigationMm: 12 },
    { date: '2024-07-07', tMaxC: 26, tMinC: 14, rainMm: 2.5 },
    { date: '2024-07-08', tMaxC: 33, tMinC: 20, irrigationMm: 10 },
    { date: '2024-07-10', tMaxC: 27, tMinC: 15, rainMm: 8 },
  ];
  it('weeks start on Monday', () => {
    const w = waterTotals(days, ['2024-07-03', '2024-07-09'], CROP_THRESHOLDS.bean);
    expect(w.weeks).toEqual([
      { weekStart: '2024-07-01', rainMm: 7.5, irrigationMm: 12, totalMm: 19.5 },
      { weekStart: '2024-07-08', rainMm: 8, irrigationMm: 10, totalMm: 18 },
    ]);
    expect(w.season).toEqual({ rainMm: 15.5, irrigationMm: 22, totalMm: 37.5 });
    // Up to 3 Jul: 5 + 12 = 17 mm; up to 9 Jul: 17 + 2.5 + 10 = 29.5 mm.
    // Degree days to 3 Jul: 12 + 14 = 26; to 9 Jul: 26 + 10 + 15 (Tmax 33 capped at 30) = 51.
    expect(w.harvests).toEqual([
      { date: '2024-07-03', cumulativeMm: 17, sinceLastHarvestMm: 17, degreeDays: 26 },
      { date: '2024-07-09', cumulativeMm: 29.5, sinceLastHarvestMm: 12.5, degreeDays: 51 },
    ]);
  });
});

describe('ranking across traits', () => {
  const traits = [
    {
      trait: 'yield',
      direction: 'higher' as const,
      weight: 2,
      means: { 'Velvet Lantern': 12, 'Mossbank Long': 10, 'Copper Thimble': 8 },
    },
    {
      trait: 'days to harvest',
      direction: 'lower' as const,
      weight: 1,
      means: { 'Velvet Lantern': 70, 'Mossbank Long': 60, 'Copper Thimble': 65 },
    },
    {
      trait: 'height',
      direction: 'none' as const,
      weight: 5,
      means: { 'Velvet Lantern': 1, 'Mossbank Long': 2, 'Copper Thimble': 3 },
    },
  ];
  it('weighted index of z-scores with contributions, and rank sums', () => {
    const r = rankAcrossTraits(traits);
    // yield: mean 10, sd 2 -> z = 1, 0, -1. days: mean 65, sd 5 -> z = 1, -1, 0 (lower is better).
    // index = (2·z_yield − 1·z_days) / 3: VL (2 − 1)/3 = 1/3, ML (0 + 1)/3 = 1/3, CT (−2 − 0)/3 = −2/3.
    const by = Object.fromEntries(r.entries.map((e) => [e.entry, e]));
    expect(by['Velvet Lantern']!.index).toBeCloseTo(1 / 3, 14);
    expect(by['Mossbank Long']!.index).toBeCloseTo(1 / 3, 14);
    expect(by['Copper Thimble']!.index).toBeCloseTo(-2 / 3, 14);
    expect(by['Copper Thimble']!.indexRank).toBe(3);
    const vl = by['Velvet Lantern']!.contributions;
    expect(vl.map((c) => c.trait)).toEqual(['yield', 'days to harvest', 'height']);
    expect(vl[0]!.contribution).toBeCloseTo(2 / 3, 14);
    expect(vl[1]!.contribution).toBeCloseTo(-1 / 3, 14);
    expect(vl[2]!.contribution).toBe(0);
    expect(vl[2]!.rank).toBeNull();
    // rank sums: VL 1 + 3 = 4, ML 2 + 1 = 3, CT 3 + 2 = 5.
    expect([
      by['Velvet Lantern']!.rankSum,
      by['Mossbank Long']!.rankSum,
      by['Copper Thimble']!.rankSum,
    ]).toEqual([4, 3, 5]);
    expect(by['Mossbank Long']!.rankSumRank).toBe(1);
  });
  it('rejects a missing mean', () => {
    expect(() =>
      rankAcrossTraits(
        [{ ...traits[0]!, means: { 'Velvet Lantern': 1 } }],
        ['Velvet Lantern', 'Quillfeather'],
      ),
    ).toThrow(/Quillfeather/);
  });
});
