import { sql, type Insertable, type Updateable } from 'kysely';
import type { VarietyType } from '../../common/contracts/varieties';
import type { DB } from '../../db/database';
import type { Trial, VarietiesTable } from '../../db/schema';
import { newAddress } from '../lib/address';
import { membershipColumns } from '../trials/trial-membership';

export function groupsOf(db: DB, userId: string) {
  return db
    .selectFrom('group_members as m')
    .innerJoin('groups as g', 'g.id', 'm.group_id')
    .select(['g.id', 'g.slug', 'g.name', 'm.role'])
    .where('m.user_id', '=', userId)
    .orderBy('g.name')
    .execute();
}

export function allGroups(db: DB) {
  return db.selectFrom('groups').select(['id', 'slug', 'name']).orderBy('name').execute();
}

/**
 * The registers of these groups, each variety with the trials and seasons it was grown in, and
 * its cover photo with what the photo routes decide by: the photo's trial's status, whether the
 * photo is a sheet cover, and `viewerId`'s part in that trial.
 */
export function listVarieties(db: DB, groupIds: string[] | 'all', viewerId: string | null = null) {
  let q = db
    .selectFrom('varieties as v')
    .leftJoin('entries as e', 'e.variety_id', 'v.id')
    .leftJoin('trials as t', 't.id', 'e.trial_id')
    // The cover while its photo is kept (a photo moved to the bin shows no cover) and still
    // shows one of this variety's entries (an entry relinked to another variety takes it along).
    .leftJoin('photos as cp', (j) =>
      j
        .onRef('cp.id', '=', 'v.cover_photo_id')
        .on('cp.deleted_at', 'is', null)
        .on('cp.purged_at', 'is', null)
        .on((eb) =>
          eb.exists(
            eb
              .selectFrom('entries as ce')
              .leftJoin('plots as cpl', 'cpl.entry_id', 'ce.id')
              .select('ce.id')
              .whereRef('ce.variety_id', '=', 'v.id')
              .where((w) =>
                w.or([
                  w('ce.id', '=', w.ref('cp.entry_id')),
                  w('cpl.id', '=', w.ref('cp.plot_id')),
                ]),
              ),
          ),
        ),
    )
    .leftJoin('trials as ct', 'ct.id', 'cp.trial_id')
    .select([
      'v.id',
      'cp.id as cover_id',
      'cp.is_cover as cover_is_sheet_cover',
      'ct.slug as cover_trial_slug',
      'ct.status as cover_trial_status',
      ...membershipColumns('ct.id', viewerId),
      'v.slug',
      'v.name',
      'v.crop',
      'v.variety_type',
      'v.aliases',
      'v.group_id',
      sql<number>`count(distinct t.id)::int`.as('trial_count'),
      sql<number>`count(distinct t.season)::int`.as('season_count'),
    ])
    .groupBy(['v.id', 'cp.id', 'ct.id'])
    .orderBy('v.crop')
    .orderBy('v.name');
  if (groupIds !== 'all') {
    if (groupIds.length === 0) return Promise.resolve([]);
    q = q.where('v.group_id', 'in', groupIds);
  }
  return q.execute();
}

/** A group's register, the varieties alone (no trials or covers), in the list's order. */
export function registerVarieties(db: DB, groupId: string) {
  return db
    .selectFrom('varieties as v')
    .select(['v.id', 'v.slug', 'v.name', 'v.crop'])
    .where('v.group_id', '=', groupId)
    .orderBy('v.crop')
    .orderBy('v.name')
    .execute();
}

export function findVarietyBySlug(db: DB, slug: string) {
  return db
    .selectFrom('varieties as v')
    .innerJoin('groups as g', 'g.id', 'v.group_id')
    .selectAll('v')
    .select(['g.slug as group_slug', 'g.name as group_name'])
    .where('v.slug', '=', slug)
    .executeTakeFirst();
}

export function findVarietiesBySlugs(db: DB, slugs: string[]) {
  return db.selectFrom('varieties').selectAll().where('slug', 'in', slugs).execute();
}

export function insertVariety(db: DB, values: Insertable<VarietiesTable>) {
  return db.insertInto('varieties').values(values).returning('slug').executeTakeFirstOrThrow();
}

export function updateVariety(db: DB, id: string, values: Updateable<VarietiesTable>) {
  return db.updateTable('varieties').set(values).where('id', '=', id).execute();
}

/** Every trial entry of these varieties, with its trial, oldest season first. */
export async function entriesOfVarieties(db: DB, varietyIds: string[]) {
  const rows = await db
    .selectFrom('entries as e')
    .innerJoin('trials as t', 't.id', 'e.trial_id')
    .select([
      'e.id as entry_id',
      'e.variety_id',
      'e.name as entry_name',
      'e.code as entry_code',
      'e.notes as entry_notes',
    ])
    .selectAll('t')
    .where('e.variety_id', 'in', varietyIds)
    .orderBy('t.season')
    .orderBy('t.sowing_date')
    .orderBy('t.title')
    .execute();
  return rows.map(({ entry_id, variety_id, entry_name, entry_code, entry_notes, ...trial }) => ({
    entry: {
      id: entry_id,
      varietyId: variety_id!,
      name: entry_name,
      code: entry_code,
      notes: entry_notes,
    },
    trial: trial satisfies Trial,
  }));
}

export function trialSites(db: DB, trialId: string) {
  return db
    .selectFrom('sites')
    .select(['name', 'region'])
    .where('trial_id', '=', trialId)
    .orderBy('name')
    .execute();
}

/** A trial's entries by id and name (the name its analysis keeps the means under). */
export function trialEntryNames(db: DB, trialId: string) {
  return db.selectFrom('entries').select(['id', 'name']).where('trial_id', '=', trialId).execute();
}

/** A trial's traits in the lead's order. */
export function trialTraits(db: DB, trialId: string) {
  return db
    .selectFrom('traits')
    .select(['key', 'label'])
    .where('trial_id', '=', trialId)
    .orderBy('sort_order')
    .orderBy('label')
    .execute();
}

/** The letter method and significance level the lead set on the results sheet, if any. */
export function sheetSettings(db: DB, trialId: string) {
  return db
    .selectFrom('results_sheets')
    .select(['alpha', 'letters'])
    .where('trial_id', '=', trialId)
    .executeTakeFirst();
}

/** Photos of an entry (of the entry or of its plots): the variety's cover first, then newest. */
export function entryPhotos(
  db: DB,
  trialId: string,
  entryId: string,
  limit: number,
  coverId: string | null,
) {
  return db
    .selectFrom('photos as p')
    .leftJoin('plots as pl', 'pl.id', 'p.plot_id')
    .select(['p.id', 'p.caption'])
    .where('p.trial_id', '=', trialId)
    .where('p.deleted_at', 'is', null)
    .where('p.purged_at', 'is', null)
    .where((eb) => eb.or([eb('p.entry_id', '=', entryId), eb('pl.entry_id', '=', entryId)]))
    .orderBy(sql`p.id = ${coverId}`, sql`desc nulls last`)
    .orderBy('p.is_cover', 'desc')
    .orderBy('p.created_at', 'desc')
    .limit(limit)
    .execute();
}

/** The group a person starts trials in: the first they coordinate, else a group of their own. */
export async function ensureOwnGroup(db: DB, userId: string): Promise<string> {
  const own = await db
    .selectFrom('group_members as m')
    .innerJoin('groups as g', 'g.id', 'm.group_id')
    .select('g.id')
    .where('m.user_id', '=', userId)
    .where('m.role', '=', 'coordinator')
    .orderBy('g.created_at')
    .executeTakeFirst();
  if (own) return own.id;
  const user = await db
    .selectFrom('users')
    .select('name')
    .where('id', '=', userId)
    .executeTakeFirstOrThrow();
  const name = `${user.name}'s trials`.slice(0, 120);
  const group = await db
    .insertInto('groups')
    .values({ slug: newAddress(name, 'group'), name, created_by: userId, updated_by: userId })
    .returning('id')
    .executeTakeFirstOrThrow();
  await db
    .insertInto('group_members')
    .values({ group_id: group.id, user_id: userId, role: 'coordinator', created_by: userId })
    .execute();
  return group.id;
}

/** Makes each person in a trial a member of its group (coordinators keep their role). */
export function addGroupMember(db: DB, groupId: string, userId: string, by: string | null) {
  return db
    .insertInto('group_members')
    .values({ group_id: groupId, user_id: userId, role: 'member', created_by: by })
    .onConflict((oc) => oc.columns(['group_id', 'user_id']).doNothing())
    .execute();
}

/** The register variety of this exact name in the group, made when the register has none. */
export async function varietyNamed(
  db: DB,
  v: {
    groupId: string;
    name: string;
    crop: string;
    type: VarietyType;
    seedSource: string;
    by: string | null;
  },
): Promise<string> {
  await db
    .insertInto('varieties')
    .values({
      group_id: v.groupId,
      slug: newAddress(v.name, 'variety'),
      name: v.name,
      crop: v.crop,
      variety_type: v.type,
      seed_source: v.seedSource,
      created_by: v.by,
      updated_by: v.by,
    })
    .onConflict((oc) => oc.columns(['group_id', 'name']).doNothing())
    .execute();
  const row = await db
    .selectFrom('varieties')
    .select('id')
    .where('group_id', '=', v.groupId)
    .where('name', '=', v.name)
    .executeTakeFirstOrThrow();
  return row.id;
}

export function findVarietyInGroup(db: DB, groupId: string, varietyId: string) {
  return db
    .selectFrom('varieties')
    .select(['id', 'name'])
    .where('id', '=', varietyId)
    .where('group_id', '=', groupId)
    .executeTakeFirst();
}

/** A kept photo of one of the variety's entries (or their plots) in a trial of its group. */
export function photoOfVariety(db: DB, variety: { id: string; groupId: string }, photoId: string) {
  return db
    .selectFrom('photos as p')
    .innerJoin('trials as t', 't.id', 'p.trial_id')
    .leftJoin('plots as pl', 'pl.id', 'p.plot_id')
    .innerJoin('entries as e', (j) =>
      j.on((eb) =>
        eb.or([eb('e.id', '=', eb.ref('p.entry_id')), eb('e.id', '=', eb.ref('pl.entry_id'))]),
      ),
    )
    .select('p.id')
    .where('p.id', '=', photoId)
    .where('p.deleted_at', 'is', null)
    .where('p.purged_at', 'is', null)
    .where('e.variety_id', '=', variety.id)
    .where('e.trial_id', '=', (eb) => eb.ref('p.trial_id'))
    .where('t.group_id', '=', variety.groupId)
    .executeTakeFirst();
}
