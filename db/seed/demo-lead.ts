import type { Actor } from '../../common/policy';
import type { DB } from '../database';
import { type DemoAccountKey, demoAccounts } from './demo-season';

/** The demo library's trial lead, acting through the app's own services. */
export async function demoLeadActor(db: DB): Promise<Actor> {
  const account = demoAccounts.find((a) => a.key === 'lead')!;
  const lead = await db
    .selectFrom('users')
    .select('id')
    .where('email', '=', account.email)
    .executeTakeFirstOrThrow();
  return { userId: lead.id, isAdmin: false };
}

/** The demo accounts' user ids by account key (lead, grower, ...). */
export async function demoUserIds(db: DB): Promise<Map<DemoAccountKey, string>> {
  const users = await db
    .selectFrom('users')
    .select(['id', 'email'])
    .where(
      'email',
      'in',
      demoAccounts.map((a) => a.email),
    )
    .execute();
  return new Map(demoAccounts.map((a) => [a.key, users.find((u) => u.email === a.email)!.id]));
}
