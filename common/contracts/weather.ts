/**
 * Daily weather per site and the season context built from it. Stored in °C and mm; the
 * client converts °F and inches at the edges.
 */
import { z } from 'zod';
import { calendarDate } from '../calendar-date';
import { MM_PER_INCH, type UnitSystem } from '../units';
import { typedNumber } from './typed-input';

const isoDate = calendarDate();

/** Plausible surface air temperatures (°C); outside this is a typing or unit slip. */
export const TEMPERATURE_RANGE_C = { min: -60, max: 60 } as const;
/** Rain in one day above this (mm) is refused as a slip (the record is under 2000 mm). */
export const MAX_DAILY_RAIN_MM = 1000;

const temperature = z
  .number({ error: 'Enter a temperature.' })
  .min(TEMPERATURE_RANGE_C.min, `Use a temperature of at least ${TEMPERATURE_RANGE_C.min} °C.`)
  .max(TEMPERATURE_RANGE_C.max, `Use a temperature of at most ${TEMPERATURE_RANGE_C.max} °C.`);

export const weatherDaySchema = z.object({
  siteId: z.uuid(),
  date: z.string(),
  tminC: z.number().nullable(),
  tmaxC: z.number().nullable(),
  rainMm: z.number().nullable(),
  source: z.enum(['manual', 'import', 'demo']),
});
export type WeatherDay = z.infer<typeof weatherDaySchema>;

export const weatherListQuery = z.object({
  siteId: z.uuid('Choose a site.').optional(),
  from: isoDate.optional(),
  to: isoDate.optional(),
});
export const weatherListSchema = z.object({ days: z.array(weatherDaySchema) });

export const weatherDayParams = z.object({
  slug: z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'Not a trial address.'),
  siteId: z.uuid('Not a site.'),
  date: isoDate,
});

/** One day typed in by hand (°C and mm). */
const weatherDayFields = {
  tminC: temperature.nullable(),
  tmaxC: temperature.nullable(),
  rainMm: z
    .number({ error: 'Enter the rain in mm.' })
    .min(0, 'Rain cannot be below 0.')
    .max(MAX_DAILY_RAIN_MM, `Use at most ${MAX_DAILY_RAIN_MM} mm in a day.`)
    .nullable(),
};
type WeatherValues = { tminC: number | null; tmaxC: number | null; rainMm: number | null };
function weatherDayRules(d: WeatherValues, ctx: z.RefinementCtx) {
  if (d.tminC !== null && d.tmaxC !== null && d.tminC > d.tmaxC)
    ctx.addIssue({
      code: 'custom',
      path: ['tminC'],
      message: 'The low is above the high: swap them?',
    });
  if (d.tminC === null && d.tmaxC === null && d.rainMm === null)
    ctx.addIssue({ code: 'custom', path: ['tmaxC'], message: 'Enter at least one value.' });
}
export const weatherDayBody = z
  .object({
    tminC: weatherDayFields.tminC.default(null),
    tmaxC: weatherDayFields.tmaxC.default(null),
    rainMm: weatherDayFields.rainMm.default(null),
  })
  .superRefine(weatherDayRules);
/**
 * The one-day form: the site, the date, and values typed in the reader's units (°F and inches
 * for US customary; °C = (°F − 32) × 5/9), blank for "not read".
 */
export const weatherDayForm = (system: UnitSystem) => {
  const us = system === 'us';
  const celsius = (v: number) => (us ? ((v - 32) * 5) / 9 : v);
  const mm = (v: number) => (us ? v * MM_PER_INCH : v);
  return z
    .object({
      siteId: z.uuid('Choose a site.'),
      date: isoDate,
      tminC: typedNumber(weatherDayFields.tminC, { blank: null, toStored: celsius }),
      tmaxC: typedNumber(weatherDayFields.tmaxC, { blank: null, toStored: celsius }),
      rainMm: typedNumber(weatherDayFields.rainMm, { blank: null, toStored: mm }),
    })
    .superRefine(weatherDayRules);
};
export type WeatherDayBody = z.input<typeof weatherDayBody>;

/** Largest weather CSV accepted (a home station's years of daily rows fit easily). */
export const WEATHER_CSV_MAX_CHARS = 500_000;

export const weatherImportBody = z.object({
  siteId: z.uuid('Choose a site.'),
  csv: z
    .string()
    .min(1, 'Paste or upload the station file.')
    .max(WEATHER_CSV_MAX_CHARS, 'The file is larger than 500 kB: split it by year.'),
  temperatureUnit: z.enum(['C', 'F']).default('C'),
  rainUnit: z.enum(['mm', 'in']).default('mm'),
  /** true: check and show what would be written; nothing is stored. */
  dryRun: z.boolean().default(true),
});
export type WeatherImportBody = z.input<typeof weatherImportBody>;
/** The import form: the same fields; whether it only checks is the button pressed. */
export const weatherImportForm = weatherImportBody.omit({ dryRun: true });

export const weatherImportRowError = z.object({
  /** Line in the file (the header is line 1). */
  row: z.number().int(),
  column: z.string().nullable(),
  message: z.string(),
});
export type WeatherImportRowError = z.infer<typeof weatherImportRowError>;

export const weatherImportResultSchema = z.object({
  dryRun: z.boolean(),
  columns: z.object({
    date: z.string(),
    tmin: z.string().nullable(),
    tmax: z.string().nullable(),
    rain: z.string().nullable(),
  }),
  rows: z.array(
    z.object({
      row: z.number().int(),
      date: z.string(),
      tminC: z.number().nullable(),
      tmaxC: z.number().nullable(),
      rainMm: z.number().nullable(),
      /** A day already stored for the site: the import replaces it. */
      replaces: z.boolean(),
    }),
  ),
  errors: z.array(weatherImportRowError),
  written: z.number().int(),
});
export type WeatherImportResult = z.infer<typeof weatherImportResultSchema>;

export const seasonQuery = z.object({
  /** Optional override of the crop's thresholds (°C). */
  baseC: z.coerce.number().min(-10).max(40).optional(),
  upperC: z.coerce.number().min(0).max(50).optional(),
  hotDayC: z.coerce.number().min(20).max(50).optional(),
});

export const seasonSiteSchema = z.object({
  siteId: z.uuid(),
  siteName: z.string(),
  from: z.string().nullable(),
  to: z.string().nullable(),
  weatherDays: z.number().int(),
  /** Days in the span with no low or high temperature (no degree days counted). */
  daysWithoutTemperatures: z.number().int(),
  degreeDays: z.number(),
  hotDays: z.number().int(),
  rainSource: z.enum(['weather', 'field events', 'none']),
  /** Irrigation events recorded for single plots (not in the site totals). */
  plotIrrigationEvents: z.number().int(),
  water: z.object({ rainMm: z.number(), irrigationMm: z.number(), totalMm: z.number() }),
  weeks: z.array(
    z.object({
      weekStart: z.string(),
      rainMm: z.number(),
      irrigationMm: z.number(),
      totalMm: z.number(),
      degreeDays: z.number(),
      hotDays: z.number().int(),
      meanTmaxC: z.number().nullable(),
      meanTminC: z.number().nullable(),
    }),
  ),
  harvests: z.array(
    z.object({
      date: z.string(),
      daysFromStart: z.number().int().nullable(),
      plotsHarvested: z.number().int(),
      marketableMassG: z.number(),
      cumulativeMm: z.number(),
      sinceLastHarvestMm: z.number(),
      degreeDays: z.number(),
    }),
  ),
});
export type SeasonSite = z.infer<typeof seasonSiteSchema>;

export const seasonSchema = z.object({
  crop: z.string(),
  method: z.string(),
  thresholds: z.object({ baseC: z.number(), upperC: z.number(), source: z.string() }),
  hotDayC: z.number(),
  hotDaySource: z.string(),
  /** Degree days count from this date (transplanting, else sowing, else the first weather day). */
  startsFrom: z.string(),
  sites: z.array(seasonSiteSchema),
  cautions: z.array(z.string()),
});
export type Season = z.infer<typeof seasonSchema>;
