import { type Kysely, sql } from 'kysely';

// Frozen. Every message the app sends, kept in the database so none is lost when the relay or
// the app is down: a queue worker sends it (with retries) and records the outcome here, so a
// lead sees what their trial's mail did. The body (which may hold a working link) is kept only
// until the message is sent or given up. An invitation's mail state is read from here, so its
// own copies of it go.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table outgoing_mail (
      id uuid primary key default gen_random_uuid(),
      kind text not null check (kind in (
        'invitation', 'password_reset', 'email_verification', 'sign_up_attempt',
        'follow_confirmation', 'publish_notice')),
      trial_id uuid references trials (id) on delete cascade,
      invitation_id uuid references invitations (id) on delete cascade,
      recipient text not null check (char_length(recipient) between 3 and 254),
      subject text not null check (char_length(subject) between 1 and 500),
      body jsonb,
      status text not null default 'pending' check (status in ('pending', 'sent', 'failed')),
      attempts integer not null default 0 check (attempts >= 0),
      last_error text check (char_length(last_error) <= 500),
      created_at timestamptz not null default now(),
      sent_at timestamptz,
      check ((status = 'pending') = (body is not null)),
      check ((status = 'sent') = (sent_at is not null))
    );
    create index outgoing_mail_by_trial on outgoing_mail (trial_id, created_at desc)
      where trial_id is not null;
    create index outgoing_mail_by_invitation on outgoing_mail (invitation_id, created_at desc)
      where invitation_id is not null;
    alter table invitations drop column mail_status, drop column last_sent_at,
      drop column last_send_error;
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`
    alter table invitations
      add column last_sent_at timestamptz,
      add column mail_status text not null default 'pending'
        check (mail_status in ('pending', 'sent', 'failed')),
      add column last_send_error text check (char_length(last_send_error) <= 500);
    drop table outgoing_mail;
  `.execute(db);
}
