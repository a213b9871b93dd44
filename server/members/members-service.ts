import type { AddMemberBody, MemberList, UpdateMemberBody } from '../../common/contracts/members';
import { type Actor, canRemoveMember, type TrialRole } from '../../common/policy';
import type { DB } from '../../db/database';
import { AppError } from '../lib/app-error';

/** Past the trial check only members (and administrators) remain; narrows the type. */
function signedIn(actor: Actor | null): Actor {
  if (!actor) throw new AppError('unauthenticated', 'Sign in to do this.');
  return actor;
}
import { trialForAction } from '../trials/trials-service';
import * as repo from './members-repository';

export async function memberList(db: DB, slug: string, actor: Actor | null): Promise<MemberList> {
  const { trial } = await trialForAction(db, slug, actor, 'members.manage');
  const me = signedIn(actor);
  const [members, sites] = await Promise.all([
    repo.listMembers(db, trial.id),
    repo.listSites(db, trial.id),
  ]);
  return {
    trial: { slug: trial.slug, title: trial.title },
    sites,
    members: members.map((m) => ({
      userId: m.user_id,
      name: m.name,
      email: m.email,
      role: m.role,
      siteIds: m.site_ids,
      joinedAt: m.created_at.toISOString(),
      isYou: m.user_id === me.userId,
    })),
    leadCount: members.filter((m) => m.role === 'lead').length,
  };
}

/** A 400 naming the field when a site id is not one of the trial's sites. */
export async function assertSitesInTrial(db: DB, trialId: string, siteIds: string[]) {
  const outside = await repo.sitesOutsideTrial(db, trialId, siteIds);
  if (outside.length) {
    throw new AppError(
      'validation_failed',
      'Check body.siteIds: a site is not part of this trial.',
      {
        fields: [
          { path: 'body.siteIds', message: `Not a site of this trial: ${outside.join(', ')}` },
        ],
      },
    );
  }
}

type Locked = Awaited<ReturnType<typeof repo.lockMembers>>;

/** Refuses a change that would leave the trial without a lead (checked on locked rows). */
function assertLeadRemains(locked: Locked, userId: string, newRole: TrialRole | null) {
  const leadsAfter = locked.filter((m) =>
    m.user_id === userId ? newRole === 'lead' : m.role === 'lead',
  ).length;
  const wasLead = locked.some((m) => m.user_id === userId && m.role === 'lead');
  if (wasLead && leadsAfter === 0) {
    throw new AppError(
      'conflict',
      'A trial always keeps at least one lead. Make someone else lead first.',
      { reason: 'last_lead' },
    );
  }
}

/** The actor's authority, read again under the lock (a lead demoted a moment ago is not one). */
function assertStillLead(locked: Locked, actor: Actor) {
  if (actor.isAdmin) return;
  if (!locked.some((m) => m.user_id === actor.userId && m.role === 'lead'))
    throw new AppError('forbidden', 'Your role in this trial does not allow this.');
}

export async function updateMember(
  db: DB,
  slug: string,
  actor: Actor | null,
  userId: string,
  body: UpdateMemberBody,
) {
  const { trial } = await trialForAction(db, slug, actor, 'members.manage');
  const me = signedIn(actor);
  await assertSitesInTrial(db, trial.id, body.siteIds);
  await db.transaction().execute(async (trx) => {
    const locked = await repo.lockMembers(trx, trial.id);
    assertStillLead(locked, me);
    if (!locked.some((m) => m.user_id === userId)) throw AppError.notFound('The member');
    assertLeadRemains(locked, userId, body.role);
    await repo.setMembership(trx, {
      trialId: trial.id,
      userId,
      role: body.role,
      siteIds: body.siteIds,
      by: me.userId,
    });
  });
  return memberOf(db, slug, me, userId);
}

export async function removeMember(db: DB, slug: string, actor: Actor | null, userId: string) {
  const { trial, access } = await trialForAction(db, slug, actor, 'trial.read');
  const me = signedIn(actor);
  if (!canRemoveMember(me, access, userId))
    throw new AppError('forbidden', 'Only a lead removes other members; you may leave yourself.');
  await db.transaction().execute(async (trx) => {
    const locked = await repo.lockMembers(trx, trial.id);
    if (userId !== me.userId) assertStillLead(locked, me);
    if (!locked.some((m) => m.user_id === userId)) throw AppError.notFound('The member');
    assertLeadRemains(locked, userId, null);
    await repo.removeMembership(trx, trial.id, userId);
  });
}

/**
 * Administrators put an existing account into a trial with any role, e.g. to make someone
 * lead of a trial whose lead has left. A member already there gets the new role.
 */
export async function addMember(db: DB, slug: string, actor: Actor | null, body: AddMemberBody) {
  const { trial } = await trialForAction(db, slug, actor, 'members.add');
  const me = signedIn(actor);
  const user = await repo.findUserByEmail(db, body.email);
  if (!user) {
    throw new AppError('not_found', 'No account uses this address; invite the person instead.', {
      fields: [{ path: 'body.email', message: 'No account uses this address.' }],
    });
  }
  await assertSitesInTrial(db, trial.id, body.siteIds);
  const created = await db.transaction().execute(async (trx) => {
    const locked = await repo.lockMembers(trx, trial.id);
    const existing = locked.some((m) => m.user_id === user.id);
    assertLeadRemains(locked, user.id, body.role);
    await repo.setMembership(trx, {
      trialId: trial.id,
      userId: user.id,
      role: body.role,
      siteIds: body.siteIds,
      by: me.userId,
    });
    return !existing;
  });
  return { created, member: await memberOf(db, slug, me, user.id) };
}

async function memberOf(db: DB, slug: string, actor: Actor, userId: string) {
  const list = await memberList(db, slug, actor);
  const member = list.members.find((m) => m.userId === userId);
  if (!member) throw AppError.notFound('The member');
  return member;
}

/**
 * Adds someone to a trial inside the caller's transaction, under the members' row lock.
 * Someone already in the trial keeps their role (joining never demotes a lead); answers
 * whether they were already in it.
 */
export async function joinTrial(
  trx: DB,
  m: { trialId: string; userId: string; role: TrialRole; siteIds: string[] },
): Promise<boolean> {
  const locked = await repo.lockMembers(trx, m.trialId);
  if (locked.some((row) => row.user_id === m.userId)) return true;
  await repo.setMembership(trx, { ...m, by: null });
  return false;
}

/** The trial's sites, for an invitation's text. */
export const trialSites = (db: DB, trialId: string) => repo.listSites(db, trialId);

/** The account that uses this address (any case), if there is one. */
export const accountByEmail = (db: DB, email: string) => repo.findUserByEmail(db, email);
