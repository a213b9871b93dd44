import { sql } from 'kysely';
import type { DB } from '../../db/database';
import { membershipColumns } from './trial-membership';

const counts = {
  siteCount: sql<number>`(select count(*)::int from sites s where s.trial_id = t.id)`,
  entryCount: sql<number>`(select count(*)::int from entries e where e.trial_id = t.id)`,
  plotCount: sql<number>`(select count(*)::int from plots p where p.trial_id = t.id)`,
};

export function listTrials(db: DB, userId: string | null, isAdmin: boolean) {
  return db
    .selectFrom('trials as t')
    .leftJoin('trial_members as m', (join) =>
      join.onRef('m.trial_id', '=', 't.id').on('m.user_id', '=', userId ?? ''),
    )
    .select([
      't.id',
      't.slug',
      't.title',
      't.crop',
      't.season',
      't.design',
      't.status',
      'm.role as myRole',
      counts.siteCount.as('siteCount'),
      counts.entryCount.as('entryCount'),
      counts.plotCount.as('plotCount'),
    ])
    .$if(!isAdmin, (q) =>
      q.where((eb) => eb.or([eb('m.role', 'is not', null), eb('t.status', '=', 'published')])),
    )
    .orderBy('t.created_at', 'desc')
    .execute();
}

export function findTrialById(db: DB, id: string) {
  return db.selectFrom('trials').selectAll().where('id', '=', id).executeTakeFirst();
}

/** Where a plot lies and what grows in it, as record answers name it. */
export interface PlotPlace {
  plotId: string;
  siteId: string;
  siteName: string;
  plotNumber: number;
  block: number;
  entryId: string;
  entryCode: string;
  entryName: string;
  /** a two-factor trial's plot: its level of the treatment */
  treatment: string | null;
}

/**
 * A trial by its address with the actor's part in it — role and, for a grower, the sites they
 * keep — and optionally where one of its plots lies, in one query.
 */
export function trialWithAccess(
  db: DB,
  where: { slug: string } | { id: string },
  userId: string | null,
  plotId?: string,
) {
  return db
    .selectFrom('trials as t')
    .selectAll('t')
    .select(membershipColumns('t.id', userId))
    .select((eb) => [
      plotId === undefined
        ? sql<PlotPlace | null>`null::json`.as('plot')
        : eb
            .selectFrom('plots as p')
            .innerJoin('sites as s', 's.id', 'p.site_id')
            .innerJoin('entries as e', 'e.id', 'p.entry_id')
            .select(
              sql<PlotPlace>`json_build_object('plotId', p.id, 'siteId', p.site_id, 'siteName', s.name,
                'plotNumber', p.plot_number, 'block', p.block, 'entryId', p.entry_id,
                'entryCode', e.code, 'entryName', e.name, 'treatment', p.treatment)`.as('place'),
            )
            .whereRef('p.trial_id', '=', 't.id')
            .where('p.id', '=', plotId)
            .as('plot'),
      // Who acts, named as records name their writers; read only with a plot (a record's write).
      plotId === undefined || userId === null
        ? sql<string | null>`null::text`.as('actor_name')
        : eb.selectFrom('users as u').select('u.name').where('u.id', '=', userId).as('actor_name'),
    ])
    .$if('slug' in where, (q) => q.where('t.slug', '=', (where as { slug: string }).slug))
    .$if('id' in where, (q) => q.where('t.id', '=', (where as { id: string }).id))
    .executeTakeFirst();
}

export function findTrialBySlug(db: DB, slug: string) {
  return db.selectFrom('trials').selectAll().where('slug', '=', slug).executeTakeFirst();
}

export async function trialParts(db: DB, trialId: string) {
  const [sites, entries, traits, tallies] = await Promise.all([
    db.selectFrom('sites').selectAll().where('trial_id', '=', trialId).orderBy('name').execute(),
    db
      .selectFrom('entries as e')
      .leftJoin('varieties as v', 'v.id', 'e.variety_id')
      .selectAll('e')
      .select('v.slug as variety_slug')
      .where('e.trial_id', '=', trialId)
      .orderBy('e.code')
      .execute(),
    db
      .selectFrom('traits')
      .selectAll()
      .where('trial_id', '=', trialId)
      .orderBy('sort_order')
      .orderBy('label')
      .execute(),
    db
      .selectNoFrom([
        sql<number>`(select count(*)::int from sites where trial_id = ${trialId})`.as('siteCount'),
        sql<number>`(select count(*)::int from entries where trial_id = ${trialId})`.as(
          'entryCount',
        ),
        sql<number>`(select count(*)::int from plots where trial_id = ${trialId})`.as('plotCount'),
        sql<number>`(select count(*)::int from harvests where trial_id = ${trialId} and deleted_at is null)`.as(
          'harvestCount',
        ),
        sql<number>`(select count(*)::int from observations where trial_id = ${trialId} and deleted_at is null)`.as(
          'observationCount',
        ),
      ])
      .executeTakeFirstOrThrow(),
  ]);
  return { sites, entries, traits, tallies };
}

/** The group and the user's role in it (null outside it, or for no user), in one query. */
export async function findGroupWithRole(db: DB, groupId: string, userId: string | null) {
  const row = await db
    .selectFrom('groups as g')
    .leftJoin('group_members as gm', (join) =>
      join
        .onRef('gm.group_id', '=', 'g.id')
        // Signed out: `= NULL` matches no member row, so the role comes back null.
        .on('gm.user_id', '=', sql<string>`${userId}`),
    )
    .select(['g.id', 'g.slug', 'g.name', 'gm.role'])
    .where('g.id', '=', groupId)
    .executeTakeFirst();
  if (!row) return undefined;
  const { role, ...group } = row;
  return { group, role: role ?? null };
}

export async function groupRole(db: DB, groupId: string, userId: string) {
  const row = await db
    .selectFrom('group_members')
    .select('role')
    .where('group_id', '=', groupId)
    .where('user_id', '=', userId)
    .executeTakeFirst();
  return row?.role ?? null;
}
