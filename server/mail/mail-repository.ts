import { sql } from 'kysely';
import type { MailKind, MailStatus } from '../../common/contracts/mail';
import type { DB } from '../../db/database';
import type { OutgoingMail } from './mailer';

export async function insertMail(
  db: DB,
  row: { kind: MailKind; trialId?: string; invitationId?: string; mail: OutgoingMail },
): Promise<string> {
  const { to, subject, text, html, headers } = row.mail;
  const inserted = await db
    .insertInto('outgoing_mail')
    .values({
      kind: row.kind,
      trial_id: row.trialId ?? null,
      invitation_id: row.invitationId ?? null,
      recipient: to,
      subject: subject.slice(0, 500),
      body: JSON.stringify({ text, html, ...(headers ? { headers } : {}) }),
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return inserted.id;
}

/** A message still to be sent, with its body; undefined once sent, given up or deleted. */
export async function pendingMail(db: DB, id: string) {
  const row = await db
    .selectFrom('outgoing_mail')
    .select(['id', 'recipient', 'subject', 'body'])
    .where('id', '=', id)
    .where('status', '=', 'pending')
    .executeTakeFirst();
  return row?.body ? { ...row, body: row.body } : undefined;
}

/** The body goes once the relay has it: a dump then holds no working link from it. */
export async function recordSent(db: DB, id: string) {
  await db
    .updateTable('outgoing_mail')
    .set({
      status: 'sent',
      sent_at: new Date(),
      body: null,
      last_error: null,
      attempts: sql`attempts + 1`,
    })
    .where('id', '=', id)
    .where('status', '=', 'pending')
    .execute();
}

export async function recordFailure(db: DB, id: string, error: string, final: boolean) {
  await db
    .updateTable('outgoing_mail')
    .set({
      last_error: error,
      attempts: sql`attempts + 1`,
      ...(final ? { status: 'failed' as const, body: null } : {}),
    })
    .where('id', '=', id)
    .where('status', '=', 'pending')
    .execute();
}

export async function trialMail(
  db: DB,
  trialId: string,
  opts: { status?: MailStatus; limit: number },
) {
  let q = db
    .selectFrom('outgoing_mail')
    .select([
      'id',
      'kind',
      'recipient',
      'subject',
      'status',
      'attempts',
      'last_error',
      'created_at',
      'sent_at',
    ])
    .where('trial_id', '=', trialId);
  if (opts.status) q = q.where('status', '=', opts.status);
  return q.orderBy('created_at', 'desc').orderBy('id').limit(opts.limit).execute();
}

export async function trialMailCounts(db: DB, trialId: string) {
  const rows = await db
    .selectFrom('outgoing_mail')
    .select(['status', sql<number>`count(*)::int`.as('n')])
    .where('trial_id', '=', trialId)
    .groupBy('status')
    .execute();
  const counts = { pending: 0, sent: 0, failed: 0 };
  for (const r of rows) counts[r.status] = r.n;
  return counts;
}
