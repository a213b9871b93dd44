/**
 * Season context: growing degree days, hot days and water received, lined up against harvests.
 */
import { dateOfDayNumber, dayNumber } from '../../../common/calendar-date';

/**
 * Degree-day method used throughout: daily average with horizontal cutoff. Tmax is capped at
 * the upper threshold and Tmin raised to the base, then GDD = max(0, (Tmax' + Tmin')/2 − base).
 */
export const DEGREE_DAY_METHOD =
  'daily average, horizontal cutoff: Tmax capped at upper threshold, Tmin raised to base, GDD = max(0, (Tmax′ + Tmin′)/2 − base)';

export interface CropThresholds {
  baseC: number;
  upperC: number;
  /** Where the figure comes from, stated honestly. */
  source: string;
}

/**
 * Base and upper thresholds by crop. These are working figures, not measured for any variety.
 * 10 °C (50 °F) base with a 30 °C (86 °F) cutoff is the widely used warm-season pair.
 */
export const CROP_THRESHOLDS: Readonly<Record<string, CropThresholds>> = {
  okra: {
    baseC: 10,
    upperC: 30,
    source: 'common practice (no source): 10 °C (50 °F) base, 30 °C (86 °F) cutoff',
  },
  bean: {
    baseC: 10,
    upperC: 30,
    source: 'common practice (no source): 10 °C (50 °F) base, 30 °C (86 °F) cutoff',
  },
  tomato: {
    baseC: 10,
    upperC: 30,
    source: 'common practice (no source): 10 °C (50 °F) base, 30 °C (86 °F) cutoff',
  },
  pepper: {
    baseC: 10,
    upperC: 30,
    source: 'common practice (no source): 10 °C (50 °F) base, 30 °C (86 °F) cutoff',
  },
  'sweet corn': {
    baseC: 10,
    upperC: 30,
    source: 'common practice (no source): the 50/86 °F pair used for corn',
  },
  pea: {
    baseC: 4.4,
    upperC: 30,
    source: 'from memory: 40 °F (4.4 °C) base for peas; cutoff common practice (no source)',
  },
  cucumber: {
    baseC: 15.5,
    upperC: 32,
    source: 'from memory: 60 °F (15.5 °C) base for cucumbers; cutoff from memory',
  },
};

/** Tmax at or above this counts as a hot day; common practice (no source). */
export const DEFAULT_HOT_DAY_C = 32;

export interface DailyWeather {
  /** YYYY-MM-DD */
  date: string;
  tMaxC: number;
  tMinC: number;
  rainMm?: number;
  /** Irrigation applied, as depth over the area in mm. */
  irrigationMm?: number;
}

/** Degree days for one day (see DEGREE_DAY_METHOD). */
export function dailyDegreeDays(
  tMaxC: number,
  tMinC: number,
  baseC: number,
  upperC: number,
): number {
  if (!(upperC > baseC)) throw new RangeError('upper threshold must be above the base');
  if (tMinC > tMaxC) throw new RangeError(`Tmin ${tMinC} is above Tmax ${tMaxC}`);
  const hi = Math.min(Math.max(tMaxC, baseC), upperC);
  const lo = Math.min(Math.max(tMinC, baseC), upperC);
  return Math.max(0, (hi + lo) / 2 - baseC);
}

export interface DegreeDaySeries {
  method: string;
  baseC: number;
  upperC: number;
  total: number;
  daily: { date: string; gdd: number; cumulative: number }[];
}

/** Accumulated degree days over the days given (sorted by date; duplicate dates rejected). */
export function accumulateDegreeDays(
  days: readonly DailyWeather[],
  thresholds: { baseC: number; upperC: number },
): DegreeDaySeries {
  const sorted = sortDays(days);
  let cumulative = 0;
  const daily = sorted.map((d) => {
    const gdd = dailyDegreeDays(d.tMaxC, d.tMinC, thresholds.baseC, thresholds.upperC);
    cumulative += gdd;
    return { date: d.date, gdd, cumulative };
  });
  return {
    method: DEGREE_DAY_METHOD,
    baseC: thresholds.baseC,
    upperC: thresholds.upperC,
    total: cumulative,
    daily,
  };
}

/** Days with Tmax ≥ threshold. */
export function countHotDays(
  days: readonly DailyWeather[],
  thresholdC = DEFAULT_HOT_DAY_C,
): number {
  return days.filter((d) => d.tMaxC >= thresholdC).length;
}

function sortDays(days: readonly DailyWeather[]): DailyWeather[] {
  const sorted = [...days].sort((a, b) => dayNumber(a.date) - dayNumber(b.date));
  for (let i = 1; i < sorted.length; i++) {
    if (sorted[i]!.date === sorted[i - 1]!.date)
      throw new RangeError(`weather for ${sorted[i]!.date} appears twice`);
  }
  return sorted;
}

export interface WaterWeek {
  /** Monday of the week. */
  weekStart: string;
  rainMm: number;
  irrigationMm: number;
  totalMm: number;
}

export interface WaterTotals {
  weeks: WaterWeek[];
  season: { rainMm: number; irrigationMm: number; totalMm: number };
  /** Water up to each harvest date (inclusive) and since the previous harvest. */
  harvests: {
    date: string;
    cumulativeMm: number;
    sinceLastHarvestMm: number;
    degreeDays?: number;
  }[];
}

/** Rain plus irrigation per calendar week (Monday start) and per season, against harvest dates. */
export function waterTotals(
  days: readonly DailyWeather[],
  harvestDates: readonly string[] = [],
  thresholds?: { baseC: number; upperC: number },
): WaterTotals {
  const sorted = sortDays(days);
  const weeks = new Map<number, WaterWeek>();
  const season = { rainMm: 0, irrigationMm: 0, totalMm: 0 };
  const cumulativeByDay: { day: number; mm: number; gdd: number }[] = [];
  let gdd = 0;
  for (const d of sorted) {
    const rain = d.rainMm ?? 0;
    const irr = d.irrigationMm ?? 0;
    if (rain < 0 || irr < 0) throw new RangeError(`${d.date}: negative water amount`);
    const day = dayNumber(d.date);
    // 1970-01-01 was a Thursday: day + 3 counts from a Monday.
    const monday = day - ((((day + 3) % 7) + 7) % 7);
    let w = weeks.get(monday);
    if (!w) {
      w = { weekStart: dateOfDayNumber(monday), rainMm: 0, irrigationMm: 0, totalMm: 0 };
      weeks.set(monday, w);
    }
    w.rainMm += rain;
    w.irrigationMm += irr;
    w.totalMm += rain + irr;
    season.rainMm += rain;
    season.irrigationMm += irr;
    season.totalMm += rain + irr;
    if (thresholds) gdd += dailyDegreeDays(d.tMaxC, d.tMinC, thresholds.baseC, thresholds.upperC);
    cumulativeByDay.push({ day, mm: season.totalMm, gdd });
  }
  const upTo = (day: number) => {
    let mm = 0;
    let g = 0;
    for (const c of cumulativeByDay) {
      if (c.day > day) break;
      mm = c.mm;
      g = c.gdd;
    }
    return { mm, g };
  };
  const harvestDays = [...new Set(harvestDates)].sort((a, b) => dayNumber(a) - dayNumber(b));
  let previous = 0;
  const harvests = harvestDays.map((date) => {
    const { mm, g } = upTo(dayNumber(date));
    const row: WaterTotals['harvests'][number] = {
      date,
      cumulativeMm: mm,
      sinceLastHarvestMm: mm - previous,
    };
    if (thresholds) row.degreeDays = g;
    previous = mm;
    return row;
  });
  return { weeks: [...weeks.values()], season, harvests };
}
