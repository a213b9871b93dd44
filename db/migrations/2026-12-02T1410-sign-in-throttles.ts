import { type Kysely, sql } from 'kysely';

// Frozen. Failed sign-ins per account e-mail (whatever address they come from), for a delay
// that grows with each failure. Keyed on the address typed, known account or not, so the
// answer never tells whether an account exists.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table sign_in_throttles (
      email text primary key check (char_length(email) between 1 and 320 and email = lower(email)),
      failures integer not null check (failures >= 0),
      last_failure_at timestamptz not null,
      -- no attempt for this e-mail is checked before this moment
      blocked_until timestamptz
    );
    create index sign_in_throttles_by_time on sign_in_throttles (last_failure_at);
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop table sign_in_throttles`.execute(db);
}
