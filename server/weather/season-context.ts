/**
 * Season context for one site: degree days by the engine's stated method, hot days, and water
 * received (rain plus irrigation) per week and for the season, lined up against harvest dates.
 * Pure: records in, summary out.
 */
import type { SeasonSite } from '../../common/contracts/weather';
import { daysBetween, weekStartOf } from '../../common/calendar-date';
import {
  accumulateDegreeDays,
  CROP_THRESHOLDS,
  type CropThresholds,
  type DailyWeather,
  waterTotals,
} from '../analysis/engine/degree-days';

export interface WeatherInput {
  date: string;
  tminC: number | null;
  tmaxC: number | null;
  rainMm: number | null;
}
export interface WaterEventInput {
  kind: 'irrigation' | 'rainfall';
  date: string;
  plotId: string | null;
  waterDepthMm: number | null;
  rainMm: number | null;
}
export interface HarvestDayInput {
  date: string;
  plots: number;
  marketableG: number;
}

/** The crop's thresholds: the table row whose name is the crop or a word of it. */
export function thresholdsForCrop(crop: string): CropThresholds & { matched: string | null } {
  const name = crop.trim().toLowerCase();
  const keys = Object.keys(CROP_THRESHOLDS).sort((a, b) => b.length - a.length);
  const key =
    keys.find((k) => k === name) ??
    keys.find((k) => new RegExp(`(^|\\s)${k}s?(\\s|$)`).test(name)) ??
    null;
  if (key) return { ...CROP_THRESHOLDS[key]!, matched: key };
  return {
    baseC: 10,
    upperC: 30,
    source: `common practice (no source): the warm-season 10 °C / 30 °C pair, used because "${crop}" is not in the crop table`,
    matched: null,
  };
}

export function siteSeason(input: {
  siteId: string;
  siteName: string;
  start: string | null;
  weather: readonly WeatherInput[];
  events: readonly WaterEventInput[];
  harvests: readonly HarvestDayInput[];
  thresholds: { baseC: number; upperC: number };
  hotDayC: number;
}): SeasonSite {
  const from = input.start ?? input.weather.map((w) => w.date).sort()[0] ?? null;
  const inSpan = (d: string) => from === null || d >= from;
  const weather = input.weather.filter((w) => inSpan(w.date));
  const events = input.events.filter((e) => inSpan(e.date));
  const siteEvents = events.filter((e) => e.plotId === null);
  const plotIrrigationEvents = events.filter(
    (e) => e.plotId !== null && e.kind === 'irrigation',
  ).length;

  const weatherRain = weather.some((w) => w.rainMm !== null);
  const eventRain = siteEvents.some((e) => e.kind === 'rainfall' && e.rainMm !== null);
  // One source of rain, never both, so a shower logged twice is not counted twice.
  const rainSource: SeasonSite['rainSource'] = weatherRain
    ? 'weather'
    : eventRain
      ? 'field events'
      : 'none';

  const byDate = new Map<string, DailyWeather>();
  const day = (date: string) => {
    let d = byDate.get(date);
    if (!d) {
      d = { date, tMaxC: 0, tMinC: 0, rainMm: 0, irrigationMm: 0 };
      byDate.set(date, d);
    }
    return d;
  };
  for (const w of weather) {
    const d = day(w.date);
    if (rainSource === 'weather') d.rainMm = (d.rainMm ?? 0) + (w.rainMm ?? 0);
  }
  for (const e of siteEvents) {
    const d = day(e.date);
    if (e.kind === 'irrigation') d.irrigationMm = (d.irrigationMm ?? 0) + (e.waterDepthMm ?? 0);
    else if (rainSource === 'field events') d.rainMm = (d.rainMm ?? 0) + (e.rainMm ?? 0);
  }
  const harvestDates = input.harvests.map((h) => h.date);
  const water = waterTotals([...byDate.values()], harvestDates);

  const tempDays = weather.filter((w) => w.tminC !== null && w.tmaxC !== null);
  const gdd = accumulateDegreeDays(
    tempDays.map((w) => ({ date: w.date, tMinC: w.tminC!, tMaxC: w.tmaxC! })),
    input.thresholds,
  );
  const gddUpTo = (date: string) => {
    let g = 0;
    for (const d of gdd.daily) {
      if (d.date > date) break;
      g = d.cumulative;
    }
    return g;
  };

  const weekExtra = new Map<string, { gdd: number; hot: number; tmax: number[]; tmin: number[] }>();
  const extra = (date: string) => {
    const key = weekStartOf(date);
    let w = weekExtra.get(key);
    if (!w) {
      w = { gdd: 0, hot: 0, tmax: [], tmin: [] };
      weekExtra.set(key, w);
    }
    return w;
  };
  for (const d of gdd.daily) extra(d.date).gdd += d.gdd;
  for (const w of weather) {
    const e = extra(w.date);
    if (w.tmaxC !== null) {
      e.tmax.push(w.tmaxC);
      if (w.tmaxC >= input.hotDayC) e.hot++;
    }
    if (w.tminC !== null) e.tmin.push(w.tminC);
  }
  const mean = (xs: number[]) => (xs.length ? xs.reduce((a, b) => a + b, 0) / xs.length : null);
  const weeks = water.weeks
    .map((w) => {
      const e = weekExtra.get(w.weekStart);
      return {
        ...w,
        degreeDays: e?.gdd ?? 0,
        hotDays: e?.hot ?? 0,
        meanTmaxC: e ? mean(e.tmax) : null,
        meanTminC: e ? mean(e.tmin) : null,
      };
    })
    .sort((a, b) => a.weekStart.localeCompare(b.weekStart));

  const harvestByDate = new Map(input.harvests.map((h) => [h.date, h]));
  const allDates = [...byDate.keys(), ...harvestDates].sort();
  const hotDays = weather.filter((w) => w.tmaxC !== null && w.tmaxC >= input.hotDayC).length;
  let spanDays = 0;
  if (weather.length > 0) {
    const first = weather.map((w) => w.date).sort()[0]!;
    const last = weather.map((w) => w.date).sort()[weather.length - 1]!;
    spanDays = daysBetween(from ?? first, last) + 1;
  }
  return {
    siteId: input.siteId,
    siteName: input.siteName,
    from,
    to: allDates[allDates.length - 1] ?? null,
    weatherDays: weather.length,
    daysWithoutTemperatures: Math.max(0, spanDays - tempDays.length),
    degreeDays: gdd.total,
    hotDays,
    rainSource,
    plotIrrigationEvents,
    water: water.season,
    weeks,
    harvests: water.harvests.map((h) => ({
      date: h.date,
      daysFromStart: from ? daysBetween(from, h.date) : null,
      plotsHarvested: harvestByDate.get(h.date)?.plots ?? 0,
      marketableMassG: harvestByDate.get(h.date)?.marketableG ?? 0,
      cumulativeMm: h.cumulativeMm,
      sinceLastHarvestMm: h.sinceLastHarvestMm,
      degreeDays: gddUpTo(h.date),
    })),
  };
}
