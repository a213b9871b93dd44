import { type Actor, type TrialAccess, type TrialAction, can } from '../../common/policy';
import type { DB } from '../../db/database';
import type { Trial } from '../../db/schema';
import { AppError } from '../lib/app-error';

export interface LoadedTrial {
  trial: Trial;
  access: TrialAccess;
}

export async function loadTrialAccess(
  db: DB,
  trial: Trial,
  actor: Actor | null,
): Promise<LoadedTrial> {
  if (!actor) return { trial, access: { status: trial.status, role: null, growerSiteIds: null } };
  const member = await db
    .selectFrom('trial_members')
    .select('role')
    .where('trial_id', '=', trial.id)
    .where('user_id', '=', actor.userId)
    .executeTakeFirst();
  let growerSiteIds: string[] | null = null;
  if (member?.role === 'grower') {
    const rows = await db
      .selectFrom('trial_member_sites')
      .select('site_id')
      .where('trial_id', '=', trial.id)
      .where('user_id', '=', actor.userId)
      .execute();
    growerSiteIds = rows.length ? rows.map((r) => r.site_id) : null;
  }
  return { trial, access: { status: trial.status, role: member?.role ?? null, growerSiteIds } };
}

/**
 * Throws unless the actor may act. Someone with no part in an unpublished trial is told it
 * does not exist (404), so trial addresses reveal nothing; a member lacking the role gets 403.
 */
export function authorize(
  actor: Actor | null,
  action: TrialAction,
  loaded: LoadedTrial,
  siteId?: string,
): void {
  if (can(actor, action, loaded.access, siteId)) return;
  const visible =
    loaded.access.role !== null || actor?.isAdmin || loaded.trial.status === 'published';
  if (!visible) throw AppError.notFound('The trial');
  if (!actor) throw new AppError('unauthenticated', 'Sign in to do this.');
  throw new AppError('forbidden', 'Your role in this trial does not allow this.');
}
