/** Reads the records an analysis needs. Soft-deleted records (deleted_at set) never count. */
import type { DB } from '../../db/database';

export function trialPlots(db: DB, trialId: string) {
  return db
    .selectFrom('plots as p')
    .innerJoin('sites as s', 's.id', 'p.site_id')
    .innerJoin('entries as e', 'e.id', 'p.entry_id')
    .select([
      'p.id',
      'p.plot_number',
      'p.block',
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

export function liveHarvests(db: DB, trialId: string) {
  return db
    .selectFrom('harvests')
    .select(['plot_id', 'harvested_on', 'fruit_count', 'mass_g', 'grade'])
    .where('trial_id', '=', trialId)
    .where('deleted_at', 'is', null)
    .execute();
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
