/** Daily weather rows, and the field records the season summary lines them up with. */
import { sql } from 'kysely';
import type { DB } from '../../db/database';

export interface WeatherRowInput {
  trialId: string;
  siteId: string;
  date: string;
  tminC: number | null;
  tmaxC: number | null;
  rainMm: number | null;
  source: 'manual' | 'import' | 'demo';
  userId: string | null;
}

export function siteOfTrial(db: DB, trialId: string, siteId: string) {
  return db
    .selectFrom('sites')
    .select(['id', 'name'])
    .where('trial_id', '=', trialId)
    .where('id', '=', siteId)
    .executeTakeFirst();
}

export function trialSites(db: DB, trialId: string) {
  return db
    .selectFrom('sites')
    .select(['id', 'name'])
    .where('trial_id', '=', trialId)
    .orderBy('name')
    .execute();
}

export function listWeather(
  db: DB,
  trialId: string,
  filter: { siteId?: string; from?: string; to?: string },
) {
  return db
    .selectFrom('daily_weather')
    .select(['site_id', 'observed_on', 'tmin_c', 'tmax_c', 'rain_mm', 'source'])
    .where('trial_id', '=', trialId)
    .$if(filter.siteId !== undefined, (q) => q.where('site_id', '=', filter.siteId!))
    .$if(filter.from !== undefined, (q) => q.where('observed_on', '>=', filter.from!))
    .$if(filter.to !== undefined, (q) => q.where('observed_on', '<=', filter.to!))
    .orderBy('site_id')
    .orderBy('observed_on')
    .execute();
}

export function existingDates(db: DB, siteId: string, dates: string[]) {
  if (dates.length === 0) return Promise.resolve([]);
  return db
    .selectFrom('daily_weather')
    .select('observed_on')
    .where('site_id', '=', siteId)
    .where('observed_on', 'in', dates)
    .execute();
}

/** Insert or replace days (one site and date each). */
export async function upsertWeather(db: DB, rows: WeatherRowInput[]) {
  for (let i = 0; i < rows.length; i += 500) {
    const chunk = rows.slice(i, i + 500);
    await db
      .insertInto('daily_weather')
      .values(
        chunk.map((r) => ({
          trial_id: r.trialId,
          site_id: r.siteId,
          observed_on: r.date,
          tmin_c: r.tminC,
          tmax_c: r.tmaxC,
          rain_mm: r.rainMm,
          source: r.source,
          created_by: r.userId,
          updated_by: r.userId,
        })),
      )
      .onConflict((oc) =>
        oc.columns(['site_id', 'observed_on']).doUpdateSet({
          tmin_c: sql`excluded.tmin_c`,
          tmax_c: sql`excluded.tmax_c`,
          rain_mm: sql`excluded.rain_mm`,
          source: sql`excluded.source`,
          updated_by: sql`excluded.updated_by`,
        }),
      )
      .execute();
  }
}

export function deleteDay(db: DB, trialId: string, siteId: string, date: string) {
  return db
    .deleteFrom('daily_weather')
    .where('trial_id', '=', trialId)
    .where('site_id', '=', siteId)
    .where('observed_on', '=', date)
    .executeTakeFirst();
}

export function siteFieldWater(db: DB, trialId: string) {
  return db
    .selectFrom('field_events')
    .select(['site_id', 'plot_id', 'kind', 'occurred_on', 'water_depth_mm', 'rain_mm'])
    .where('trial_id', '=', trialId)
    .where('deleted_at', 'is', null)
    .where('kind', 'in', ['irrigation', 'rainfall'])
    .execute();
}

/** Per site and harvest date: plots harvested and marketable mass (live records only). */
export function harvestDays(db: DB, trialId: string) {
  return db
    .selectFrom('harvests as h')
    .innerJoin('plots as p', 'p.id', 'h.plot_id')
    .select([
      'p.site_id',
      'h.harvested_on',
      sql<number>`count(distinct h.plot_id)::int`.as('plots'),
      sql<number>`coalesce(sum(h.mass_g) filter (where h.grade = 'marketable'), 0)::float8`.as(
        'marketable_g',
      ),
    ])
    .where('h.trial_id', '=', trialId)
    .where('h.deleted_at', 'is', null)
    .groupBy(['p.site_id', 'h.harvested_on'])
    .orderBy('h.harvested_on')
    .execute();
}
