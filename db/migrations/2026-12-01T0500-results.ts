import { type Kysely, sql } from 'kysely';

// Frozen. The lead's results sheet (a draft), its published versions (frozen snapshots that
// never change), and the readers who follow a trial's results by e-mail.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table results_sheets (
      trial_id uuid primary key references trials (id) on delete cascade,
      summary text not null default '' check (char_length(summary) <= 10000),
      methods text check (char_length(methods) <= 10000),
      traits jsonb not null default '[]'::jsonb check (jsonb_typeof(traits) = 'array'),
      entry_notes jsonb not null default '{}'::jsonb check (jsonb_typeof(entry_notes) = 'object'),
      cover_photos jsonb not null default '{}'::jsonb check (jsonb_typeof(cover_photos) = 'object'),
      alpha finite_float not null default 0.05 check (alpha > 0 and alpha < 0.5),
      letters text not null default 'hsd' check (letters in ('hsd', 'lsd')),
      license text not null default 'CC-BY-4.0' check (license in ('CC-BY-4.0', 'CC-BY-SA-4.0', 'CC0-1.0', 'all-rights-reserved')),
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null
    );

    create table result_versions (
      id uuid primary key default gen_random_uuid(),
      trial_id uuid not null references trials (id) on delete cascade,
      version integer not null check (version >= 1),
      change_note text not null default '' check (char_length(change_note) <= 2000),
      snapshot jsonb not null,
      published_at timestamptz not null default now(),
      published_by text references users (id) on delete set null,
      unique (trial_id, version),
      -- a correction must say what changed
      check (version = 1 or char_length(change_note) > 0)
    );

    -- Published versions are permanent: no update, no delete (except with the whole trial).
    create function rowtally_result_versions_frozen() returns trigger language plpgsql as $$
    begin
      raise exception 'published result versions cannot be changed' using errcode = '23514';
    end $$;
    create trigger result_versions_frozen before update on result_versions
      for each row execute function rowtally_result_versions_frozen();

    create table result_followers (
      id uuid primary key default gen_random_uuid(),
      trial_id uuid not null references trials (id) on delete cascade,
      email text not null check (char_length(email) between 3 and 254 and email = lower(email)),
      confirm_token_hash text not null unique,
      -- kept as is: it can only stop mail to this address, and every mail must carry it
      unsubscribe_token text not null unique,
      confirmed_at timestamptz,
      unsubscribed_at timestamptz,
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      unique (trial_id, email)
    );
  `.execute(db);
  await sql`create trigger touch_updated_at before update on results_sheets
    for each row execute function rowtally_touch_updated_at()`.execute(db);
  await sql`create trigger touch_updated_at before update on result_followers
    for each row execute function rowtally_touch_updated_at()`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`
    drop table result_followers, result_versions, results_sheets;
    drop function rowtally_result_versions_frozen();
  `.execute(db);
}
