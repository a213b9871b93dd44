import { sql } from 'kysely';
import type { TrialRole } from '../../common/policy';
import type { DB } from '../../db/database';

export function listMembers(db: DB, trialId: string) {
  return db
    .selectFrom('trial_members as m')
    .innerJoin('users as u', 'u.id', 'm.user_id')
    .select([
      'm.user_id',
      'm.role',
      'm.created_at',
      'u.name',
      'u.email',
      sql<string[]>`coalesce((select array_agg(s.site_id::text order by s.site_id)
        from trial_member_sites s where s.trial_id = m.trial_id and s.user_id = m.user_id), '{}')`.as(
        'site_ids',
      ),
    ])
    .where('m.trial_id', '=', trialId)
    .orderBy(
      sql`case m.role when 'lead' then 0 when 'grower' then 1 when 'contributor' then 2 else 3 end`,
    )
    .orderBy('u.name')
    .execute();
}

export function listSites(db: DB, trialId: string) {
  return db
    .selectFrom('sites')
    .select(['id', 'name'])
    .where('trial_id', '=', trialId)
    .orderBy('name')
    .execute();
}

/**
 * Locks every member row of the trial until the transaction ends, so two changes that would
 * each leave one lead cannot both pass the count.
 */
export function lockMembers(trx: DB, trialId: string) {
  return trx
    .selectFrom('trial_members')
    .select(['user_id', 'role'])
    .where('trial_id', '=', trialId)
    .orderBy('user_id')
    .forUpdate()
    .execute();
}

export async function setMembership(
  trx: DB,
  m: { trialId: string; userId: string; role: TrialRole; siteIds: string[]; by: string | null },
) {
  await trx
    .insertInto('trial_members')
    .values({
      trial_id: m.trialId,
      user_id: m.userId,
      role: m.role,
      created_by: m.by,
      updated_by: m.by,
    })
    .onConflict((oc) =>
      oc.columns(['trial_id', 'user_id']).doUpdateSet({ role: m.role, updated_by: m.by }),
    )
    .execute();
  await trx
    .deleteFrom('trial_member_sites')
    .where('trial_id', '=', m.trialId)
    .where('user_id', '=', m.userId)
    .execute();
  if (m.role === 'grower' && m.siteIds.length) {
    await trx
      .insertInto('trial_member_sites')
      .values(
        m.siteIds.map((site_id) => ({
          trial_id: m.trialId,
          user_id: m.userId,
          site_id,
          created_by: m.by,
        })),
      )
      .execute();
  }
}

export function removeMembership(trx: DB, trialId: string, userId: string) {
  return trx
    .deleteFrom('trial_members')
    .where('trial_id', '=', trialId)
    .where('user_id', '=', userId)
    .executeTakeFirst();
}

export function findUserByEmail(db: DB, email: string) {
  return db
    .selectFrom('users')
    .select(['id', 'name', 'email', 'email_verified'])
    .where(sql`lower(email)`, '=', email.toLowerCase())
    .executeTakeFirst();
}

export async function sitesOutsideTrial(db: DB, trialId: string, siteIds: string[]) {
  if (!siteIds.length) return [];
  const found = await db
    .selectFrom('sites')
    .select('id')
    .where('trial_id', '=', trialId)
    .where('id', 'in', siteIds)
    .execute();
  const known = new Set(found.map((r) => r.id));
  return siteIds.filter((id) => !known.has(id));
}
