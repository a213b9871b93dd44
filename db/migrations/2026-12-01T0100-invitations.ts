import { type Kysely, sql } from 'kysely';

// Frozen. Invitations to join a trial by e-mail. Only the sha256 of the link's token is kept,
// so a copy of the database cannot be used to join a trial. The send state lives on the row:
// a failed mail leaves the invitation in place for the lead to resend.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table invitations (
      id uuid primary key default gen_random_uuid(),
      trial_id uuid not null references trials (id) on delete cascade,
      email text not null check (char_length(email) between 3 and 254 and email = lower(email)
        and position('@' in email) > 1),
      role text not null check (role in ('lead', 'grower', 'contributor', 'viewer')),
      token_hash text not null unique check (token_hash ~ '^[0-9a-f]{64}$'),
      invited_by text references users (id) on delete set null,
      expires_at timestamptz not null,
      accepted_at timestamptz,
      accepted_by text references users (id) on delete set null,
      revoked_at timestamptz,
      revoked_by text references users (id) on delete set null,
      last_sent_at timestamptz,
      send_attempts integer not null default 0 check (send_attempts >= 0),
      mail_status text not null default 'pending' check (mail_status in ('pending', 'sent', 'failed')),
      last_send_error text check (char_length(last_send_error) <= 500),
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      check (accepted_at is null or revoked_at is null),
      check (accepted_by is null or accepted_at is not null),
      check (expires_at > created_at),
      unique (id, trial_id)
    );
    -- One open invitation per address and trial; a new one means resending the open one.
    create unique index invitations_open_per_address on invitations (trial_id, email)
      where accepted_at is null and revoked_at is null;

    -- The sites an invited grower will be limited to (none: every site).
    create table invitation_sites (
      invitation_id uuid not null,
      trial_id uuid not null,
      site_id uuid not null,
      primary key (invitation_id, site_id),
      foreign key (invitation_id, trial_id) references invitations (id, trial_id) on delete cascade,
      foreign key (site_id, trial_id) references sites (id, trial_id) on delete cascade
    );

    create trigger touch_updated_at before update on invitations
      for each row execute function rowtally_touch_updated_at();
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop table invitation_sites, invitations`.execute(db);
}
