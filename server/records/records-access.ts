import type { Actor, TrialAction } from '../../common/policy';
import type { DB } from '../../db/database';
import { AppError } from '../lib/app-error';
import { authorize, type LoadedTrial, loadTrialAccess } from '../trials/trial-access';
import { findTrialBySlug } from '../trials/trials-repository';

/**
 * A record's permission depends on its site (growers write only at theirs), which is only
 * known once the record or its plot is found inside the trial: load the trial and the
 * caller's role once, check the action without a site first (so a viewer hears 403, not
 * "no such plot"), then again with the site.
 */
export async function loadForRecords(
  db: DB,
  slug: string,
  actor: Actor | null,
  action: TrialAction,
): Promise<LoadedTrial> {
  const trial = await findTrialBySlug(db, slug);
  if (!trial) throw AppError.notFound('The trial');
  const loaded = await loadTrialAccess(db, trial, actor);
  authorize(actor, action, loaded);
  return loaded;
}

export function authorizeAtSite(
  actor: Actor | null,
  action: TrialAction,
  loaded: LoadedTrial,
  siteId: string,
): void {
  authorize(actor, action, loaded, siteId);
}

export const fieldError = (path: string, message: string) =>
  new AppError('validation_failed', message, { fields: [{ path, message }] });
