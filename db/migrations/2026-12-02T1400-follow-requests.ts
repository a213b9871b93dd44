import { type Kysely, sql } from 'kysely';

// Frozen. Every request to follow a published trial by e-mail, kept for a day: the limits per
// caller address and per recipient, and the "one pending confirmation per hour" rule, count
// these rows (in PostgreSQL, so they hold across restarts and app processes).
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table follow_requests (
      id bigint generated always as identity primary key,
      trial_id uuid not null references trials (id) on delete cascade,
      email text not null check (char_length(email) between 3 and 254 and email = lower(email)),
      client_ip text not null check (char_length(client_ip) between 1 and 100),
      -- whether this request sent a confirmation mail
      mailed boolean not null,
      requested_at timestamptz not null default now()
    );
    create index follow_requests_by_ip on follow_requests (client_ip, requested_at);
    create index follow_requests_by_email on follow_requests (email, requested_at) where mailed;
    create index follow_requests_by_time on follow_requests (requested_at);
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop table follow_requests`.execute(db);
}
