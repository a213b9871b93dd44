import type {
  Season,
  WeatherDay,
  WeatherImportResult,
  weatherImportBody,
} from '../../common/contracts/weather';
import type { Actor } from '../../common/policy';
import type { DB } from '../../db/database';
import type { Trial } from '../../db/schema';
import { DEFAULT_HOT_DAY_C, DEGREE_DAY_METHOD } from '../analysis/engine/degree-days';
import { AppError } from '../lib/app-error';
import { trialForAction } from '../trials/trials-service';
import { siteSeason, thresholdsForCrop } from './season-context';
import { parseWeatherCsv } from './weather-csv';
import * as repo from './weather-repository';
import type { z } from 'zod';

const toDay = (r: Awaited<ReturnType<typeof repo.listWeather>>[number]): WeatherDay => ({
  siteId: r.site_id,
  date: r.observed_on,
  tminC: r.tmin_c,
  tmaxC: r.tmax_c,
  rainMm: r.rain_mm,
  source: r.source,
});

export async function listWeather(
  db: DB,
  slug: string,
  actor: Actor | null,
  filter: { siteId?: string; from?: string; to?: string },
): Promise<{ days: WeatherDay[] }> {
  const { trial } = await trialForAction(db, slug, actor, 'trial.read');
  return { days: (await repo.listWeather(db, trial.id, filter)).map(toDay) };
}

/** Loads the trial for writing weather at one site; a site of another trial is not found. */
async function forSiteWrite(db: DB, slug: string, actor: Actor | null, siteId: string) {
  // Check the trial first (so strangers learn nothing), then the site, then the grower's sites.
  const loaded = await trialForAction(db, slug, actor, 'trial.read');
  const site = await repo.siteOfTrial(db, loaded.trial.id, siteId);
  if (!site) throw AppError.notFound('The site');
  await trialForAction(db, slug, actor, 'records.write', siteId);
  return { trial: loaded.trial, site };
}

export async function putDay(
  db: DB,
  slug: string,
  actor: Actor | null,
  siteId: string,
  date: string,
  body: { tminC: number | null; tmaxC: number | null; rainMm: number | null },
): Promise<WeatherDay> {
  const { trial } = await forSiteWrite(db, slug, actor, siteId);
  await repo.upsertWeather(db, [
    { trialId: trial.id, siteId, date, ...body, source: 'manual', userId: actor?.userId ?? null },
  ]);
  return { siteId, date, ...body, source: 'manual' };
}

export async function removeDay(
  db: DB,
  slug: string,
  actor: Actor | null,
  siteId: string,
  date: string,
): Promise<void> {
  const { trial } = await forSiteWrite(db, slug, actor, siteId);
  const res = await repo.deleteDay(db, trial.id, siteId, date);
  if (Number(res.numDeletedRows) === 0) throw AppError.notFound(`Weather for ${date}`);
}

export async function importCsv(
  db: DB,
  slug: string,
  actor: Actor | null,
  body: z.output<typeof weatherImportBody>,
): Promise<WeatherImportResult> {
  const { trial } = await forSiteWrite(db, slug, actor, body.siteId);
  const parsed = parseWeatherCsv(body.csv, {
    temperature: body.temperatureUnit,
    rain: body.rainUnit,
  });
  const existing = new Set(
    (
      await repo.existingDates(
        db,
        body.siteId,
        parsed.rows.map((r) => r.date),
      )
    ).map((r) => r.observed_on),
  );
  const result: WeatherImportResult = {
    dryRun: body.dryRun,
    columns: parsed.columns,
    rows: parsed.rows.map((r) => ({ ...r, replaces: existing.has(r.date) })),
    errors: parsed.errors,
    written: 0,
  };
  if (body.dryRun) return result;
  if (parsed.errors.length > 0) {
    const lines = [...new Set(parsed.errors.map((e) => e.row))];
    throw new AppError(
      'validation_failed',
      `${lines.length} line(s) of the file have problems (first: line ${parsed.errors[0]!.row}, ${parsed.errors[0]!.message}); nothing was written.`,
      { rows: parsed.errors },
    );
  }
  // All or nothing: one transaction for the whole file.
  await db.transaction().execute((trx) =>
    repo.upsertWeather(
      trx,
      parsed.rows.map((r) => ({
        trialId: trial.id,
        siteId: body.siteId,
        date: r.date,
        tminC: r.tminC,
        tmaxC: r.tmaxC,
        rainMm: r.rainMm,
        source: 'import' as const,
        userId: actor?.userId ?? null,
      })),
    ),
  );
  return { ...result, written: parsed.rows.length };
}

const HOT_DAY_SOURCE = 'common practice (no source): a high of 32 °C (about 90 °F) or more';

export async function season(
  db: DB,
  slug: string,
  actor: Actor | null,
  query: SeasonOptions,
): Promise<Season> {
  const { trial } = await trialForAction(db, slug, actor, 'trial.read');
  return seasonOfTrial(db, trial, query);
}

type SeasonOptions = { baseC?: number; upperC?: number; hotDayC?: number };

/** The season summary of a trial the caller has already been allowed to read. */
export async function seasonOfTrial(db: DB, trial: Trial, query: SeasonOptions): Promise<Season> {
  const crop = thresholdsForCrop(trial.crop);
  const overridden = query.baseC !== undefined || query.upperC !== undefined;
  const thresholds = {
    baseC: query.baseC ?? crop.baseC,
    upperC: query.upperC ?? crop.upperC,
    source: overridden ? 'set for this view by the reader' : crop.source,
  };
  if (!(thresholds.upperC > thresholds.baseC))
    throw new AppError('validation_failed', 'The upper threshold must be above the base.', {
      fields: [{ path: 'query.upperC', message: 'The upper threshold must be above the base.' }],
    });
  const hotDayC = query.hotDayC ?? DEFAULT_HOT_DAY_C;
  const [sites, weather, events, harvests] = await Promise.all([
    repo.trialSites(db, trial.id),
    repo.listWeather(db, trial.id, {}),
    repo.siteFieldWater(db, trial.id),
    repo.harvestDays(db, trial.id),
  ]);
  const start = trial.transplant_date ?? trial.sowing_date;
  const firstWeather = weather.map((w) => w.observed_on).sort()[0];
  const cautions = [
    'Hot days: harvest in the cool of the morning, drink water often, rest in shade, and follow your local heat-safety guidance.',
    'Irrigation from a drinking-water supply needs the backflow prevention your local plumbing code requires; ask a licensed plumber.',
  ];
  if (/okra/i.test(trial.crop))
    cautions.push(
      'Okra leaves and pods carry fine spines that irritate skin: wear gloves and long sleeves to pick.',
    );
  return {
    crop: trial.crop,
    method: DEGREE_DAY_METHOD,
    thresholds,
    hotDayC,
    hotDaySource: query.hotDayC === undefined ? HOT_DAY_SOURCE : 'set for this view by the reader',
    startsFrom: start ?? firstWeather ?? '',
    sites: sites.map((s) =>
      siteSeason({
        siteId: s.id,
        siteName: s.name,
        start,
        weather: weather
          .filter((w) => w.site_id === s.id)
          .map((w) => ({
            date: w.observed_on,
            tminC: w.tmin_c,
            tmaxC: w.tmax_c,
            rainMm: w.rain_mm,
          })),
        events: events
          .filter((e) => e.site_id === s.id)
          .map((e) => ({
            kind: e.kind as 'irrigation' | 'rainfall',
            date: e.occurred_on,
            plotId: e.plot_id,
            waterDepthMm: e.water_depth_mm,
            rainMm: e.rain_mm,
          })),
        harvests: harvests
          .filter((h) => h.site_id === s.id)
          .map((h) => ({ date: h.harvested_on, plots: h.plots, marketableG: h.marketable_g })),
        thresholds,
        hotDayC,
      }),
    ),
    cautions,
  };
}
