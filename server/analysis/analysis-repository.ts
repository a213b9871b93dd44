/** Reads the records an analysis needs. Soft-deleted records (deleted_at set) never count. */
import { sql } from 'kysely';
import { MAX_DECIMALS } from '../../common/precision';
import type { DB } from '../../db/database';
import type { HarvestTotals } from './trial-plot-values';

export function trialPlots(db: DB, trialId: string) {
  return db
    .selectFrom('plots as p')
    .innerJoin('sites as s', 's.id', 'p.site_id')
    .innerJoin('entries as e', 'e.id', 'p.entry_id')
    .select([
      'p.id',
      'p.plot_number',
      'p.block',
      'p.replicate',
      'p.treatment',
      'p.site_id',
      's.name as site_name',
      'p.entry_id',
      'e.name as entry_name',
      'e.code as entry_code',
      'p.plants_set',
      'p.plants_surviving',
      'p.row_length_mm',
      'p.row_spacing_mm',
    ])
    .where('p.trial_id', '=', trialId)
    .orderBy('s.name')
    .orderBy('p.block')
    .orderBy('p.plot_number')
    .execute();
}

export function trialTraits(db: DB, trialId: string) {
  return db
    .selectFrom('traits')
    .select(['id', 'key', 'label', 'quantity_kind', 'basis', 'direction'])
    .where('trial_id', '=', trialId)
    .orderBy('sort_order')
    .orderBy('label')
    .execute();
}

export function trialEntries(db: DB, trialId: string) {
  return db
    .selectFrom('entries')
    .select(['id', 'name', 'code'])
    .where('trial_id', '=', trialId)
    .orderBy('code')
    .execute();
}

/**
 * Decimals a recorded mass needs, worked out by the database with the test decimalsOf uses
 * (the fewest decimals that give the value back within 1e-9 relative), so no row leaves it.
 */
const massDecimals = sql<number>`max(case ${sql.join(
  Array.from(
    { length: MAX_DECIMALS },
    (_, d) =>
      sql`when abs(round(mass_g * ${sql.lit(10 ** d)}) / ${sql.lit(10 ** d)} - mass_g) <= 1e-9 * greatest(1, abs(mass_g)) then ${sql.lit(d)}`,
  ),
  sql` `,
)} else ${sql.lit(MAX_DECIMALS)} end)`;

/**
 * A trial's live harvests added up per plot by the database (GROUP BY), so an analysis reads
 * one row per plot however many pickings were logged.
 */
export async function harvestTotals(db: DB, trialId: string): Promise<HarvestTotals> {
  const marketable = sql`grade = 'marketable'`;
  const rows = await db
    .selectFrom('harvests')
    .select([
      'plot_id',
      sql<number>`sum(fruit_count)`.as('total_count'),
      sql<number>`sum(mass_g)`.as('total_mass'),
      sql<number>`coalesce(sum(fruit_count) filter (where ${marketable}), 0)`.as('market_count'),
      sql<number>`coalesce(sum(mass_g) filter (where ${marketable}), 0)`.as('market_mass'),
      sql<number>`count(distinct harvested_on)::int`.as('days'),
      sql<string>`min(harvested_on)`.as('first'),
      sql<string>`max(harvested_on)`.as('last'),
      massDecimals.as('mass_decimals'),
    ])
    .where('trial_id', '=', trialId)
    .where('deleted_at', 'is', null)
    .groupBy('plot_id')
    .execute();
  return {
    plots: rows.map((r) => ({
      plotId: r.plot_id,
      marketable: { count: r.market_count, massG: r.market_mass },
      total: { count: r.total_count, massG: r.total_mass },
      days: r.days,
      first: r.first,
      last: r.last,
    })),
    massDecimals: rows.reduce((d, r) => Math.max(d, r.mass_decimals), 0),
  };
}

export function liveObservations(db: DB, trialId: string, traitId: string) {
  return db
    .selectFrom('observations')
    .select(['plot_id', 'value', 'value_date', 'plant_number'])
    .where('trial_id', '=', trialId)
    .where('trait_id', '=', traitId)
    .where('deleted_at', 'is', null)
    .orderBy('plot_id')
    .orderBy('observed_on')
    .execute();
}
