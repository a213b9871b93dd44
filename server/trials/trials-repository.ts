import { sql } from 'kysely';
import type { DB } from '../../db/database';

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

export function findTrialBySlug(db: DB, slug: string) {
  return db.selectFrom('trials').selectAll().where('slug', '=', slug).executeTakeFirst();
}

export async function trialParts(db: DB, trialId: string) {
  const [sites, entries, traits, tallies] = await Promise.all([
    db.selectFrom('sites').selectAll().where('trial_id', '=', trialId).orderBy('name').execute(),
    db.selectFrom('entries').selectAll().where('trial_id', '=', trialId).orderBy('code').execute(),
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
