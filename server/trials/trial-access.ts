import { type Actor, type TrialAccess, type TrialAction, can } from '../../common/policy';
import type { DB } from '../../db/database';
import type { Trial } from '../../db/schema';
import { AppError } from '../lib/app-error';
import { membershipAccess } from './trial-membership';
import { type PlotPlace, trialWithAccess } from './trials-repository';

export interface LoadedTrial {
  trial: Trial;
  access: TrialAccess;
}

type TrialWithAccess = NonNullable<Awaited<ReturnType<typeof trialWithAccess>>>;

/** The trial row and the actor's part in it, as `trialWithAccess` read them together. */
export function accessOf(
  row: TrialWithAccess,
  actor: Actor | null,
): LoadedTrial & { plot: PlotPlace | null; actorName: string | null } {
  const { member_role, member_site_ids, plot, actor_name, ...trial } = row;
  return {
    trial,
    access: membershipAccess({ status: trial.status, member_role, member_site_ids }, actor),
    plot,
    actorName: actor_name,
  };
}

export async function loadTrialAccess(
  db: DB,
  trial: Trial,
  actor: Actor | null,
): Promise<LoadedTrial> {
  const row = await trialWithAccess(db, { id: trial.id }, actor?.userId ?? null);
  if (!row) return { trial, access: { status: trial.status, role: null, growerSiteIds: null } };
  const { plot: _plot, actorName: _name, ...loaded } = accessOf(row, actor);
  return loaded;
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
