import { type Kysely, sql } from 'kysely';

// Frozen. A group's coordinators are told by mail when a member asks for a packet of seed.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    alter table outgoing_mail drop constraint outgoing_mail_kind_check;
    alter table outgoing_mail add constraint outgoing_mail_kind_check check (kind in (
      'invitation', 'password_reset', 'email_verification', 'sign_up_attempt',
      'follow_confirmation', 'publish_notice', 'seed_request_answer', 'seed_request_received'));
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`
    delete from outgoing_mail where kind = 'seed_request_received';
    alter table outgoing_mail drop constraint outgoing_mail_kind_check;
    alter table outgoing_mail add constraint outgoing_mail_kind_check check (kind in (
      'invitation', 'password_reset', 'email_verification', 'sign_up_attempt',
      'follow_confirmation', 'publish_notice', 'seed_request_answer'));
  `.execute(db);
}
