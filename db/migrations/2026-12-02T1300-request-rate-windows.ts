import { type Kysely, sql } from 'kysely';

// Frozen. Fixed-window request counts per caller (an account, or an address when signed out)
// for the routes that cost the server real work, such as analyses. Kept in PostgreSQL so
// every app process counts against the same limit and a restart does not reset it.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table request_rate_windows (
      bucket text not null check (char_length(bucket) between 1 and 40),
      caller text not null check (char_length(caller) between 1 and 200),
      window_started_at timestamptz not null,
      hits integer not null check (hits >= 1),
      primary key (bucket, caller)
    );
    create index request_rate_windows_by_time on request_rate_windows (window_started_at);
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop table request_rate_windows`.execute(db);
}
