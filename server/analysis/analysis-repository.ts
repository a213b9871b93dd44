/** Reads the records an analysis needs. Soft-deleted records (deleted_at set) never count. */
import { sql } from 'kysely';
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
 * A trial's live harvests added up per plot. The database keeps these totals on every change to
 * a harvest (the plot_harvest_totals triggers), so an analysis reads one row per plot however
 * many pickings were logged. Masses are kept as exact decimals and read as float8.
 */
export async function harvestTotals(db: DB, trialId: string): Promise<HarvestTotals> {
  const rows = await db
    .selectFrom('plot_harvest_totals')
    .select([
      'plot_id',
      'fruit_count',
      sql<number>`mass_g::float8`.as('mass_g'),
      'marketable_fruit_count',
      sql<number>`marketable_mass_g::float8`.as('marketable_mass_g'),
      'harvest_days',
      'first_harvested_on',
      'last_harvested_on',
      'mass_decimals',
    ])
    .where('trial_id', '=', trialId)
    .execute();
  return {
    plots: rows.map((r) => ({
      plotId: r.plot_id,
      marketable: { count: r.marketable_fruit_count, massG: r.marketable_mass_g },
      total: { count: r.fruit_count, massG: r.mass_g },
      days: r.harvest_days,
      first: r.first_harvested_on,
      last: r.last_harvested_on,
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
