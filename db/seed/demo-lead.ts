import type { Actor } from '../../common/policy';
import type { DB } from '../database';
import { demoAccounts } from './demo-season';

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
