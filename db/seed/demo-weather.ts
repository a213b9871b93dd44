/**
 * Invented daily weather for the demo season's sites: a smooth seasonal swing with day-to-day
 * noise from a fixed seed, and rain on exactly the days the demo's rainfall records have it
 * (so the two sources agree). Pure and deterministic; no real station or place.
 */
import { createRandom } from '../../common/random';
import { addDays } from '../../common/calendar-date';
import { DEMO_SEED, type DemoTrial, type GeneratedEvent } from './demo-season';

export interface GeneratedWeatherDay {
  siteKey: string;
  date: string;
  tminC: number;
  tmaxC: number;
  rainMm: number;
}

const round1 = (x: number) => Math.round(x * 10) / 10;

function dayOfYear(date: string): number {
  const t = Date.parse(`${date}T00:00:00Z`);
  return Math.floor((t - Date.parse(`${date.slice(0, 4)}-01-01T00:00:00Z`)) / 86_400_000) + 1;
}

export function generateDemoWeather(
  trial: DemoTrial,
  events: readonly GeneratedEvent[],
  seed = DEMO_SEED,
): GeneratedWeatherDay[] {
  const random = createRandom(seed + 4099 + trial.slug.length);
  const rain = new Map<string, number>();
  for (const e of events) {
    if (e.kind !== 'rainfall' || e.rainMm === undefined) continue;
    const key = `${e.siteKey}:${e.date}`;
    rain.set(key, round1((rain.get(key) ?? 0) + e.rainMm));
  }
  const out: GeneratedWeatherDay[] = [];
  for (const site of trial.sites) {
    // Warmer on the free-draining site, cooler on the river flats (an invented pattern).
    const offset = (site.effect - 1) * 4;
    for (let date = trial.sowingDate; date <= trial.seasonEnd; date = addDays(date, 1)) {
      // Seasonal mean peaking in mid-July.
      const mean = 20 + 6 * Math.sin((2 * Math.PI * (dayOfYear(date) - 105)) / 365) + offset;
      const wet = rain.get(`${site.key}:${date}`);
      const cloud = wet === undefined ? 0 : -2.5;
      const tmax = round1(mean + 5.5 + cloud + random.normal(0, 2.4));
      const tmin = round1(Math.min(tmax - 2, mean - 6 + random.normal(0, 1.8)));
      out.push({ siteKey: site.key, date, tminC: tmin, tmaxC: tmax, rainMm: wet ?? 0 });
    }
  }
  return out;
}
