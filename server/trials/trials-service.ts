import {
  type Actor,
  can,
  canGroup,
  type GroupAction,
  permissionsFor,
  type TrialAction,
} from '../../common/policy';
import type { GroupRole } from '../../common/contracts/varieties';
import type { TrialDetail, TrialSummary } from '../../common/contracts/trials';
import type { DB } from '../../db/database';
import type { Trial, TraitsTable } from '../../db/schema';
import type { Selectable } from 'kysely';
import { AppError, fieldError } from '../lib/app-error';
import type { ObjectStorage } from '../storage/object-storage';
import { accessOf, authorize, type LoadedTrial, loadTrialAccess } from './trial-access';
import { membershipAccess, type TrialMembership } from './trial-membership';
import * as repo from './trials-repository';

export async function listVisibleTrials(db: DB, actor: Actor | null): Promise<TrialSummary[]> {
  return repo.listTrials(db, actor?.userId ?? null, actor?.isAdmin ?? false);
}

/**
 * Loads a trial by its address and checks the action; the one entry point for trial routes.
 * Given a plot (`{ plotId, field }`), the same query finds the plot's site: a plot outside the
 * trial is a 400 on `field`, and the action is checked at the plot's site.
 */
export async function trialForAction(
  db: DB,
  slug: string,
  actor: Actor | null,
  action: TrialAction,
  siteId?: string,
): Promise<LoadedTrial>;
export async function trialForAction(
  db: DB,
  slug: string,
  actor: Actor | null,
  action: TrialAction,
  at: { plotId: string; field: string },
): Promise<LoadedTrial & { plot: repo.PlotPlace; actorName: string | null }>;
export async function trialForAction(
  db: DB,
  slug: string,
  actor: Actor | null,
  action: TrialAction,
  at?: string | { plotId: string; field: string },
) {
  const plot = typeof at === 'object' ? at : undefined;
  const row = await repo.trialWithAccess(db, { slug }, actor?.userId ?? null, plot?.plotId);
  if (!row) throw AppError.notFound('The trial');
  const { plot: place, actorName, ...loaded } = accessOf(row, actor);
  if (!plot) {
    authorize(actor, action, loaded, at as string | undefined);
    return loaded;
  }
  authorize(actor, action, loaded);
  if (!place) throw fieldError(plot.field, 'This plot is not in the trial.');
  authorize(actor, action, loaded, place.siteId);
  return { ...loaded, plot: place, actorName };
}

/**
 * The entry point asked of a trial read in a list, without refusing: whether the actor may take
 * the action there, from the trial's status and the actor's membership columns
 * (`membershipColumns`), by the same policy as `trialForAction`. For lists that show something
 * of many trials, where loading each trial would cost a query apiece.
 */
export function trialAllows(
  actor: Actor | null,
  action: TrialAction,
  trial: TrialMembership,
): boolean {
  return can(actor, action, membershipAccess(trial, actor));
}

/**
 * The actor's standing in a group: their role (null outside it) and what the policy allows them
 * there. Every group check asks `allows`, so `canGroup` is read in this one place.
 */
export interface GroupStanding {
  role: GroupRole | null;
  allows(action: GroupAction): boolean;
}

/**
 * The standing from a role already read (e.g. all the caller's groups at once, for a list):
 * the same decision as the entry points below, without a query.
 */
export function groupStandingOf(actor: Actor | null, role: GroupRole | null): GroupStanding {
  return { role, allows: (action) => canGroup(actor, action, role) };
}

/**
 * The entry point asked without refusing, for a group known to exist (a variety's, an offer's,
 * a trial's, which may have none): the actor's standing there, for pages that show more or less
 * by it. Someone signed out, or no group, costs no query.
 */
export async function groupStanding(
  db: DB,
  groupId: string | null,
  actor: Actor | null,
): Promise<GroupStanding> {
  const role = actor && groupId ? await repo.groupRole(db, groupId, actor.userId) : null;
  return groupStandingOf(actor, role);
}

/** The group and the actor's standing in it, or null if there is no such group: both forms below read this. */
async function groupAccess(db: DB, groupId: string, actor: Actor | null) {
  const found = await repo.findGroupWithRole(db, groupId, actor?.userId ?? null);
  if (!found) return null;
  return { group: found.group, ...groupStandingOf(actor, found.role) };
}

/**
 * The same entry point for a group's actions (its register, trials it starts). Someone outside
 * the group, signed in or not, is told it does not exist (404); a member lacking the role gets 403.
 * The standing returned answers other actions in the group without another query.
 */
export async function groupForAction(
  db: DB,
  groupId: string,
  actor: Actor | null,
  action: GroupAction,
): Promise<{ group: { id: string; slug: string; name: string } } & GroupStanding> {
  const access = await groupAccess(db, groupId, actor);
  if (!access) throw AppError.notFound('The group');
  if (access.allows(action)) return access;
  if (!access.role) throw AppError.notFound('The group');
  throw new AppError('forbidden', 'Your role in this group does not allow this.');
}

/**
 * The entry point asked without refusing: whether the actor may take the action in the group,
 * for choices that fall back rather than fail (a copied trial leaves a group its copier may not
 * start trials in). A group that does not exist allows nothing.
 */
export async function groupAllows(
  db: DB,
  groupId: string,
  actor: Actor | null,
  action: GroupAction,
): Promise<boolean> {
  return (await groupAccess(db, groupId, actor))?.allows(action) ?? false;
}

export async function trialDetail(
  db: DB,
  slug: string,
  actor: Actor | null,
): Promise<TrialDetail & { permissions: ReturnType<typeof permissionsFor> }> {
  const { trial, access } = await trialForAction(db, slug, actor, 'trial.read');
  const { sites, entries, traits, tallies } = await repo.trialParts(db, trial.id);
  return {
    ...trialHeading(trial),
    copiedFrom: await copiedFrom(db, trial, actor),
    factor: trialFactor(trial),
    myRole: access.role,
    mySiteIds: access.growerSiteIds,
    ...tallies,
    sites: sites.map((s) => ({
      id: s.id,
      name: s.name,
      region: s.region,
      soilTexture: s.soil_texture,
      irrigationMethod: s.irrigation_method,
      notes: s.notes,
    })),
    entries: entries.map((e) => ({
      id: e.id,
      name: e.name,
      code: e.code,
      seedSource: e.seed_source,
      entryType: e.entry_type,
      daysToMaturityClaimed: e.days_to_maturity_claimed,
      notes: e.notes,
      varietySlug: e.variety_slug,
    })),
    traits: traits.map(traitView),
    permissions: permissionsFor(actor, access),
  };
}

/**
 * The trial this one was copied from, when the caller may see it: its design for its members,
 * its results sheet for everyone once published; otherwise nothing, not even its title.
 */
async function copiedFrom(db: DB, trial: Trial, actor: Actor | null) {
  if (!trial.copied_from_trial_id) return null;
  const source = await repo.findTrialById(db, trial.copied_from_trial_id);
  if (!source) return null;
  const { access } = await loadTrialAccess(db, source, actor);
  const view = can(actor, 'trial.read', access)
    ? ('trial' as const)
    : can(actor, 'results.read', access)
      ? ('sheet' as const)
      : null;
  return view && { slug: source.slug, title: source.title, season: source.season, view };
}

/**
 * Deletes a trial with everything in it (the database cascades to records, photos' rows,
 * members and published versions), then removes its photo files from storage.
 */
export async function deleteTrial(
  deps: { db: DB; storage: ObjectStorage; logger: { warn: (o: object, m: string) => void } },
  slug: string,
  actor: Actor | null,
  confirmSlug: string,
): Promise<void> {
  const { trial } = await trialForAction(deps.db, slug, actor, 'trial.delete');
  if (confirmSlug !== trial.slug) {
    throw new AppError('validation_failed', `Type the trial address "${trial.slug}" to confirm.`, {
      fields: [{ path: 'body.confirmSlug', message: `Type "${trial.slug}" to confirm.` }],
    });
  }
  await deps.db.deleteFrom('trials').where('id', '=', trial.id).execute();
  const keys = await deps.storage.list(`photos/${trial.id}/`);
  const results = await Promise.allSettled(keys.map((key) => deps.storage.delete(key)));
  const failed = results.filter((r) => r.status === 'rejected').length;
  if (failed)
    deps.logger.warn(
      { trialId: trial.id, failed },
      'photo files of a deleted trial were left in storage',
    );
}

/** The fields every view of a trial starts with, in the API's names. */
export function trialHeading(trial: Trial) {
  return {
    id: trial.id,
    slug: trial.slug,
    title: trial.title,
    crop: trial.crop,
    season: trial.season,
    design: trial.design,
    status: trial.status,
    description: trial.description,
    sowingDate: trial.sowing_date,
    transplantDate: trial.transplant_date,
  };
}

/** The trial's second factor (a treatment compared across its varieties), or null. */
export function trialFactor(trial: Trial) {
  return trial.factor_name != null && trial.factor_levels && trial.factor_arrangement
    ? {
        name: trial.factor_name,
        levels: trial.factor_levels,
        arrangement: trial.factor_arrangement,
      }
    : null;
}

/** A trait as the API shows it (the trial page, the design page and the field log read it). */
export function traitView(t: Selectable<TraitsTable>) {
  return {
    id: t.id,
    key: t.key,
    label: t.label,
    quantityKind: t.quantity_kind,
    basis: t.basis,
    direction: t.direction,
    scaleMin: t.scale_min,
    scaleMax: t.scale_max,
    displayUnit: t.display_unit,
    plausibleMin: t.plausible_min,
    plausibleMax: t.plausible_max,
  };
}
