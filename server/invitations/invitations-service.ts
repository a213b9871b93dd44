import { hashPassword } from 'better-auth/crypto';
import crypto from 'node:crypto';
import {
  type CreateInvitationBody,
  type Invitation,
  invitationLifetimeDays,
  type InvitationPreview,
  type InvitationSignUpBody,
} from '../../common/contracts/invitations';
import type { Actor } from '../../common/policy';
import type { DB } from '../../db/database';
import type { MailQueue } from '../mail/mail-queue';
import { AppError } from '../lib/app-error';
import {
  accountByEmail,
  assertSitesInTrial,
  joinTrial,
  trialSites,
} from '../members/members-service';
import { trialForAction } from '../trials/trials-service';
import { invitationMail } from './invitation-mail';
import { hashInvitationToken, newInvitationToken } from './invitation-token';
import * as repo from './invitations-repository';

export interface InvitationDeps {
  db: DB;
  mail: MailQueue;
  baseUrl: string;
}

const lifetimeMs = invitationLifetimeDays * 24 * 60 * 60 * 1000;

type State = Invitation['state'];
function stateOf(row: {
  accepted_at: Date | null;
  revoked_at: Date | null;
  expires_at: Date;
}): State {
  if (row.accepted_at) return 'accepted';
  if (row.revoked_at) return 'revoked';
  if (row.expires_at.getTime() <= Date.now()) return 'expired';
  return 'pending';
}

function toInvitation(
  row: NonNullable<Awaited<ReturnType<typeof repo.findInvitation>>>,
): Invitation {
  return {
    id: row.id,
    email: row.email,
    role: row.role,
    siteIds: row.site_ids,
    invitedBy: row.invited_by_name,
    createdAt: row.created_at.toISOString(),
    expiresAt: row.expires_at.toISOString(),
    state: stateOf(row),
    lastSentAt: row.last_sent_at?.toISOString() ?? null,
    sendAttempts: row.send_attempts,
    mailStatus: row.mail_status,
  };
}

function signedIn(actor: Actor | null): Actor {
  if (!actor) throw new AppError('unauthenticated', 'Sign in to do this.');
  return actor;
}

export async function listInvitations(deps: InvitationDeps, slug: string, actor: Actor | null) {
  const { trial } = await trialForAction(deps.db, slug, actor, 'members.manage');
  const rows = await repo.listOpenInvitations(deps.db, trial.id);
  return { invitations: rows.map(toInvitation) };
}

/**
 * Queues the letter in the caller's transaction (so an invitation never exists without its
 * letter); the queue sends it, retries, and records whether it went.
 */
async function queueLetter(
  deps: InvitationDeps,
  trx: DB,
  inv: { id: string; trialId: string; email: string; role: Invitation['role']; expiresAt: Date },
  token: string,
  trialTitle: string,
  inviterId: string,
) {
  const inviter = await repo.userEmail(trx, inviterId);
  const siteRows = await trialSites(trx, inv.trialId);
  const chosen = await repo.invitationSiteIds(trx, inv.id);
  const mail = invitationMail({
    to: inv.email,
    baseUrl: deps.baseUrl,
    token,
    trialTitle,
    inviterName: inviter?.name ?? null,
    role: inv.role,
    siteNames: siteRows.filter((s) => chosen.includes(s.id)).map((s) => s.name),
    expiresAt: inv.expiresAt,
  });
  await repo.dropQueuedLetters(trx, inv.id);
  await repo.countLetter(trx, inv.id);
  await deps.mail.enqueue(trx, mail, {
    kind: 'invitation',
    trialId: inv.trialId,
    invitationId: inv.id,
  });
}

export async function createInvitation(
  deps: InvitationDeps,
  slug: string,
  actor: Actor | null,
  body: CreateInvitationBody,
): Promise<Invitation> {
  const { trial } = await trialForAction(deps.db, slug, actor, 'members.manage');
  const me = signedIn(actor);
  await assertSitesInTrial(deps.db, trial.id, body.siteIds);
  if (await repo.isMemberByEmail(deps.db, trial.id, body.email)) {
    throw new AppError('conflict', 'This person is already a member; change their role instead.', {
      fields: [{ path: 'body.email', message: 'Already a member of this trial.' }],
    });
  }
  const { token, hash } = newInvitationToken();
  const expiresAt = new Date(Date.now() + lifetimeMs);
  let id: string;
  try {
    id = await deps.db.transaction().execute(async (trx) => {
      const newId = await repo.insertInvitation(trx, {
        trialId: trial.id,
        email: body.email,
        role: body.role,
        tokenHash: hash,
        invitedBy: me.userId,
        expiresAt,
        siteIds: body.siteIds,
      });
      await queueLetter(
        deps,
        trx,
        { id: newId, trialId: trial.id, email: body.email, role: body.role, expiresAt },
        token,
        trial.title,
        me.userId,
      );
      return newId;
    });
  } catch (err) {
    if ((err as { constraint?: string }).constraint === 'invitations_open_per_address') {
      throw new AppError(
        'conflict',
        'An invitation to this address is already open; resend it instead.',
        { fields: [{ path: 'body.email', message: 'Already invited; resend the invitation.' }] },
      );
    }
    throw err;
  }
  return toInvitation((await repo.findInvitation(deps.db, trial.id, id))!);
}

/** A new link (the old one stops working) valid for another full lifetime, and a new letter. */
export async function resendInvitation(
  deps: InvitationDeps,
  slug: string,
  actor: Actor | null,
  invitationId: string,
): Promise<Invitation> {
  const { trial } = await trialForAction(deps.db, slug, actor, 'members.manage');
  const me = signedIn(actor);
  const { token, hash } = newInvitationToken();
  const expiresAt = new Date(Date.now() + lifetimeMs);
  const row = await deps.db.transaction().execute(async (trx) => {
    const found = await repo.lockById(trx, trial.id, invitationId);
    if (!found) throw AppError.notFound('The invitation');
    if (found.accepted_at || found.revoked_at) {
      throw new AppError(
        'conflict',
        `This invitation was ${found.accepted_at ? 'accepted' : 'revoked'}; it cannot be sent again.`,
        { reason: found.accepted_at ? 'accepted' : 'revoked' },
      );
    }
    await repo.replaceToken(trx, found.id, hash, expiresAt);
    await queueLetter(
      deps,
      trx,
      { id: found.id, trialId: trial.id, email: found.email, role: found.role, expiresAt },
      token,
      trial.title,
      me.userId,
    );
    return found;
  });
  return toInvitation((await repo.findInvitation(deps.db, trial.id, row.id))!);
}

export async function revokeInvitation(
  deps: InvitationDeps,
  slug: string,
  actor: Actor | null,
  invitationId: string,
) {
  const { trial } = await trialForAction(deps.db, slug, actor, 'members.manage');
  const me = signedIn(actor);
  await deps.db.transaction().execute(async (trx) => {
    const found = await repo.lockById(trx, trial.id, invitationId);
    if (!found) throw AppError.notFound('The invitation');
    if (found.accepted_at)
      throw new AppError(
        'conflict',
        'This invitation was already accepted; remove the member instead.',
        {
          reason: 'accepted',
        },
      );
    if (!found.revoked_at) await repo.markRevoked(trx, found.id, me.userId);
    await repo.dropQueuedLetters(trx, found.id);
  });
}

export async function previewInvitation(db: DB, token: string): Promise<InvitationPreview> {
  const row = await repo.findByTokenHash(db, hashInvitationToken(token));
  if (!row) throw notValid();
  const account = await accountByEmail(db, row.email);
  return {
    trial: { slug: row.slug, title: row.title, crop: row.crop },
    email: row.email,
    role: row.role,
    siteNames: row.site_names,
    invitedBy: row.invited_by_name,
    expiresAt: row.expires_at.toISOString(),
    state: stateOf(row),
    accountExists: Boolean(account),
  };
}

function notValid() {
  return new AppError(
    'not_found',
    'This invitation link is not valid. It may have been replaced by a newer one; ask the trial lead to send it again.',
  );
}

/** The invitation behind a link, locked, and refused unless it can still be used. */
async function usableInvitation(trx: DB, token: string) {
  const inv = await repo.lockByTokenHash(trx, hashInvitationToken(token));
  if (!inv) throw notValid();
  const state = stateOf(inv);
  if (state !== 'pending') {
    const message = {
      accepted: 'This invitation has already been used. Sign in to reach the trial.',
      revoked: 'The trial lead withdrew this invitation.',
      expired: `This invitation expired (links work for ${invitationLifetimeDays} days). Ask the trial lead to send it again.`,
    }[state];
    throw new AppError('conflict', message, { reason: state });
  }
  return inv;
}

async function join(
  trx: DB,
  inv: { id: string; trial_id: string; role: Invitation['role'] },
  userId: string,
) {
  // Someone already in the trial keeps their role: an invitation never demotes a lead.
  const already = await joinTrial(trx, {
    trialId: inv.trial_id,
    userId,
    role: inv.role,
    siteIds: await repo.invitationSiteIds(trx, inv.id),
  });
  await repo.markAccepted(trx, inv.id, userId);
  return already;
}

async function slugOf(db: DB, trialId: string) {
  const t = await db
    .selectFrom('trials')
    .select('slug')
    .where('id', '=', trialId)
    .executeTakeFirstOrThrow();
  return t.slug;
}

/** A signed-in person accepts an invitation sent to their own address. */
export async function acceptInvitation(db: DB, token: string, actor: Actor | null) {
  const me = signedIn(actor);
  const user = await repo.userEmail(db, me.userId);
  if (!user) throw new AppError('unauthenticated', 'Sign in to do this.');
  const result = await db.transaction().execute(async (trx) => {
    const inv = await usableInvitation(trx, token);
    if (inv.email !== user.email.toLowerCase()) {
      throw new AppError(
        'forbidden',
        `This invitation was sent to ${inv.email}. Sign out, then open the link again and sign in with that address.`,
        { reason: 'other_address' },
      );
    }
    const alreadyMember = await join(trx, inv, me.userId);
    return { trialId: inv.trial_id, role: inv.role, alreadyMember };
  });
  return {
    trialSlug: await slugOf(db, result.trialId),
    role: result.role,
    alreadyMember: result.alreadyMember,
  };
}

/**
 * Creates the account for the invited address and joins the trial, in one transaction. The
 * link came to that address, so the address counts as confirmed.
 */
export async function signUpWithInvitation(db: DB, body: InvitationSignUpBody) {
  const passwordHash = await hashPassword(body.password);
  const userId = crypto.randomUUID();
  const result = await db.transaction().execute(async (trx) => {
    const inv = await usableInvitation(trx, body.token);
    if (await accountByEmail(trx, inv.email)) {
      throw new AppError(
        'conflict',
        'An account already uses this address. Sign in with it to accept the invitation.',
        { reason: 'account_exists' },
      );
    }
    await repo.insertVerifiedUser(trx, {
      id: userId,
      name: body.name,
      email: inv.email,
      passwordHash,
      accountId: crypto.randomUUID(),
    });
    await join(trx, inv, userId);
    return { trialId: inv.trial_id, role: inv.role, email: inv.email };
  });
  return {
    email: result.email,
    response: {
      trialSlug: await slugOf(db, result.trialId),
      role: result.role,
      alreadyMember: false,
    },
  };
}
