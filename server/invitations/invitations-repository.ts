import { sql } from 'kysely';
import type { TrialRole } from '../../common/policy';
import type { DB } from '../../db/database';

const siteIds = sql<string[]>`coalesce((select array_agg(s.site_id::text order by s.site_id)
  from invitation_sites s where s.invitation_id = i.id), '{}')`;

function selectInvitations(db: DB) {
  return db
    .selectFrom('invitations as i')
    .leftJoin('users as by', 'by.id', 'i.invited_by')
    .select([
      'i.id',
      'i.trial_id',
      'i.email',
      'i.role',
      'i.expires_at',
      'i.accepted_at',
      'i.revoked_at',
      'i.send_attempts',
      'i.created_at',
      // The letter's fate is the queue's (server/mail): the newest letter's state.
      sql<'pending' | 'sent' | 'failed'>`coalesce((select m.status from outgoing_mail m
        where m.invitation_id = i.id order by m.created_at desc limit 1), 'pending')`.as(
        'mail_status',
      ),
      sql<Date | null>`(select max(m.sent_at) from outgoing_mail m
        where m.invitation_id = i.id)`.as('last_sent_at'),
      'by.name as invited_by_name',
      siteIds.as('site_ids'),
    ]);
}
export type InvitationRow = Awaited<ReturnType<typeof findInvitation>> & {};

/** Invitations not yet accepted or revoked (expired ones included, so they can be resent). */
export function listOpenInvitations(db: DB, trialId: string) {
  return selectInvitations(db)
    .where('i.trial_id', '=', trialId)
    .where('i.accepted_at', 'is', null)
    .where('i.revoked_at', 'is', null)
    .orderBy('i.created_at', 'desc')
    .execute();
}

export function findInvitation(db: DB, trialId: string, id: string) {
  return selectInvitations(db)
    .where('i.trial_id', '=', trialId)
    .where('i.id', '=', id)
    .executeTakeFirst();
}

/** The row for a link, locked so two uses of one link cannot both succeed. */
export function lockByTokenHash(trx: DB, tokenHash: string) {
  return trx
    .selectFrom('invitations')
    .selectAll()
    .where('token_hash', '=', tokenHash)
    .forUpdate()
    .executeTakeFirst();
}

export function lockById(trx: DB, trialId: string, id: string) {
  return trx
    .selectFrom('invitations')
    .selectAll()
    .where('trial_id', '=', trialId)
    .where('id', '=', id)
    .forUpdate()
    .executeTakeFirst();
}

export function findByTokenHash(db: DB, tokenHash: string) {
  return db
    .selectFrom('invitations as i')
    .innerJoin('trials as t', 't.id', 'i.trial_id')
    .leftJoin('users as by', 'by.id', 'i.invited_by')
    .select([
      'i.id',
      'i.email',
      'i.role',
      'i.expires_at',
      'i.accepted_at',
      'i.revoked_at',
      't.slug',
      't.title',
      't.crop',
      'by.name as invited_by_name',
      sql<string[]>`coalesce((select array_agg(s.name order by s.name) from invitation_sites x
        join sites s on s.id = x.site_id where x.invitation_id = i.id), '{}')`.as('site_names'),
    ])
    .where('i.token_hash', '=', tokenHash)
    .executeTakeFirst();
}

export async function insertInvitation(
  trx: DB,
  inv: {
    trialId: string;
    email: string;
    role: TrialRole;
    tokenHash: string;
    invitedBy: string;
    expiresAt: Date;
    siteIds: string[];
  },
) {
  const { id } = await trx
    .insertInto('invitations')
    .values({
      trial_id: inv.trialId,
      email: inv.email,
      role: inv.role,
      token_hash: inv.tokenHash,
      invited_by: inv.invitedBy,
      expires_at: inv.expiresAt,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  if (inv.siteIds.length) {
    await trx
      .insertInto('invitation_sites')
      .values(inv.siteIds.map((site_id) => ({ invitation_id: id, trial_id: inv.trialId, site_id })))
      .execute();
  }
  return id;
}

export function invitationSiteIds(db: DB, invitationId: string) {
  return db
    .selectFrom('invitation_sites')
    .select('site_id')
    .where('invitation_id', '=', invitationId)
    .execute()
    .then((rows) => rows.map((r) => r.site_id));
}

export function replaceToken(trx: DB, id: string, tokenHash: string, expiresAt: Date) {
  return trx
    .updateTable('invitations')
    .set({ token_hash: tokenHash, expires_at: expiresAt })
    .where('id', '=', id)
    .execute();
}

export function countLetter(trx: DB, id: string) {
  return trx
    .updateTable('invitations')
    .set((eb) => ({ send_attempts: eb('send_attempts', '+', 1) }))
    .where('id', '=', id)
    .execute();
}

/** Letters still queued for an invitation carry a link that no longer works (or should not). */
export function dropQueuedLetters(trx: DB, id: string) {
  return trx
    .deleteFrom('outgoing_mail')
    .where('invitation_id', '=', id)
    .where('status', '=', 'pending')
    .execute();
}

export function markAccepted(trx: DB, id: string, userId: string) {
  return trx
    .updateTable('invitations')
    .set({ accepted_at: new Date(), accepted_by: userId })
    .where('id', '=', id)
    .execute();
}

export function markRevoked(trx: DB, id: string, userId: string) {
  return trx
    .updateTable('invitations')
    .set({ revoked_at: new Date(), revoked_by: userId })
    .where('id', '=', id)
    .execute();
}

export function userEmail(db: DB, userId: string) {
  return db
    .selectFrom('users')
    .select(['email', 'name'])
    .where('id', '=', userId)
    .executeTakeFirst();
}

export function isMemberByEmail(db: DB, trialId: string, email: string) {
  return db
    .selectFrom('trial_members as m')
    .innerJoin('users as u', 'u.id', 'm.user_id')
    .select('m.user_id')
    .where('m.trial_id', '=', trialId)
    .where(sql`lower(u.email)`, '=', email)
    .executeTakeFirst();
}

export async function insertVerifiedUser(
  trx: DB,
  u: { id: string; name: string; email: string; passwordHash: string; accountId: string },
) {
  const now = new Date();
  await trx
    .insertInto('users')
    .values({
      id: u.id,
      name: u.name,
      email: u.email,
      email_verified: true,
      created_at: now,
      updated_at: now,
    })
    .execute();
  await trx
    .insertInto('accounts')
    .values({
      id: u.accountId,
      account_id: u.id,
      provider_id: 'credential',
      user_id: u.id,
      password: u.passwordHash,
      created_at: now,
      updated_at: now,
    })
    .execute();
}
