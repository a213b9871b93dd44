/**
 * The demo season's group and variety register: the invented seed library owns every demo
 * trial, its coordinator is the demo lead, and each entry grows a register variety of its name.
 */
import crypto from 'node:crypto';
import { sql } from 'kysely';
import { wordsOf } from '../../server/lib/address';
import type { DB } from '../database';

export const demoGroup = { slug: 'larkhaven-seed-library', name: 'Larkhaven Seed Library' };

export async function seedDemoRegister(trx: DB, coordinatorId: string): Promise<void> {
  const group = await trx
    .insertInto('groups')
    .values({ ...demoGroup, created_by: coordinatorId, updated_by: coordinatorId })
    .returning('id')
    .executeTakeFirstOrThrow();
  await trx
    .insertInto('group_members')
    .values({ group_id: group.id, user_id: coordinatorId, role: 'coordinator' })
    .execute();
  await joinDemoRegister(trx, group.id, coordinatorId);
}

/**
 * Demo trials outside any group join the seed library: their people become its members and each
 * entry grows the register's variety of its name, made when the register has none.
 */
export async function joinDemoRegister(
  trx: DB,
  groupId: string,
  coordinatorId: string,
): Promise<void> {
  await trx
    .updateTable('trials')
    .set({ group_id: groupId })
    .where('group_id', 'is', null)
    .execute();
  await sql`
    insert into group_members (group_id, user_id, role)
    select distinct ${groupId}::uuid, user_id, 'member' from trial_members
    on conflict (group_id, user_id) do nothing`.execute(trx);
  const names = await sql<{ name: string; crop: string; entry_type: string; seed_source: string }>`
    select distinct on (e.name) e.name, t.crop, e.entry_type, e.seed_source
    from entries e join trials t on t.id = e.trial_id
    where e.variety_id is null
    order by e.name, t.season, e.created_at`.execute(trx);
  // Demo addresses are readable and fixed (no random tail), so links in the guide keep working.
  if (names.rows.length)
    await trx
      .insertInto('varieties')
      .values(
        names.rows.map((n) => ({
          id: crypto.randomUUID(),
          group_id: groupId,
          slug: wordsOf(n.name, 'variety'),
          name: n.name,
          crop: n.crop,
          variety_type: n.entry_type as 'heirloom',
          seed_source: n.seed_source,
          created_by: coordinatorId,
          updated_by: coordinatorId,
        })),
      )
      .onConflict((oc) => oc.columns(['group_id', 'name']).doNothing())
      .execute();
  await sql`
    update entries e set variety_id = v.id from varieties v
    where v.group_id = ${groupId} and v.name = e.name and e.variety_id is null`.execute(trx);
}
