import { type Kysely, sql } from 'kysely';

// Frozen. The seed a group keeps: each variety's lots (where the seed came from, the harvest
// year, how much is left and where it is stored) and their germination tests, which lot each
// trial entry was sown from, and the group's germination threshold below which a lot is
// flagged. Offers of seed to members and their requests follow, with the mail that answers
// a request.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    alter table groups
      add column germination_threshold_percent integer not null default 80
        check (germination_threshold_percent between 0 and 100),
      add column seed_requests_open boolean not null default false;

    create table seed_lots (
      id uuid primary key default gen_random_uuid(),
      variety_id uuid not null references varieties (id) on delete cascade,
      label text not null check (char_length(label) between 1 and 40),
      source text not null default '' check (char_length(source) <= 200),
      harvest_year integer check (harvest_year between 1900 and 2100),
      amount finite_float check (amount >= 0),
      amount_unit text not null check (amount_unit in ('g', 'seeds')),
      storage_place text not null default '' check (char_length(storage_place) <= 200),
      notes text not null default '' check (char_length(notes) <= 1000),
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      unique (variety_id, label),
      unique (variety_id, id)
    );
    create trigger seed_lots_touch before update on seed_lots
      for each row execute function rowtally_touch_updated_at();

    create table germination_tests (
      id uuid primary key default gen_random_uuid(),
      lot_id uuid not null references seed_lots (id) on delete cascade,
      tested_on date not null,
      seeds_tested integer not null check (seeds_tested between 1 and 100000),
      seeds_germinated integer not null check (seeds_germinated >= 0),
      days integer not null check (days between 1 and 120),
      notes text not null default '' check (char_length(notes) <= 500),
      created_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      check (seeds_germinated <= seeds_tested)
    );
    create index germination_tests_lot_idx on germination_tests (lot_id, tested_on desc);

    -- The lot an entry was sown from is one of its own variety's lots.
    alter table entries add column lot_id uuid;
    alter table entries add constraint entries_lot_of_variety
      foreign key (variety_id, lot_id) references seed_lots (variety_id, id) on delete set null (lot_id);
    create index entries_lot_idx on entries (lot_id) where lot_id is not null;
    -- An entry that changes variety no longer grows the old variety's lot.
    create function rowtally_entry_lot_follows_variety() returns trigger language plpgsql as $$
    begin
      if new.variety_id is distinct from old.variety_id then new.lot_id := null; end if;
      return new;
    end $$;
    create trigger entries_lot_follows_variety before update of variety_id on entries
      for each row execute function rowtally_entry_lot_follows_variety();

    create table seed_offers (
      id uuid primary key default gen_random_uuid(),
      variety_id uuid not null,
      lot_id uuid not null,
      packets_offered integer not null check (packets_offered between 1 and 10000),
      packets_left integer not null check (packets_left >= 0),
      note text not null default '' check (char_length(note) <= 1000),
      status text not null default 'open' check (status in ('open', 'closed')),
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      foreign key (variety_id, lot_id) references seed_lots (variety_id, id) on delete cascade,
      check (packets_left <= packets_offered)
    );
    -- One open offer per variety, so a sheet's link and a member's request have one target.
    create unique index seed_offers_one_open on seed_offers (variety_id) where status = 'open';
    create trigger seed_offers_touch before update on seed_offers
      for each row execute function rowtally_touch_updated_at();

    create table seed_requests (
      id uuid primary key default gen_random_uuid(),
      offer_id uuid not null references seed_offers (id) on delete cascade,
      requester_id text not null references users (id) on delete cascade,
      ship_to text not null check (char_length(ship_to) between 1 and 500),
      message text not null default '' check (char_length(message) <= 1000),
      status text not null default 'requested' check (status in ('requested', 'sent', 'declined')),
      answer text not null default '' check (char_length(answer) <= 1000),
      answered_at timestamptz,
      answered_by text references users (id) on delete set null,
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      unique (offer_id, requester_id),
      check ((status = 'requested') = (answered_at is null))
    );
    create index seed_requests_offer_idx on seed_requests (offer_id, created_at);
    create trigger seed_requests_touch before update on seed_requests
      for each row execute function rowtally_touch_updated_at();

    alter table outgoing_mail drop constraint outgoing_mail_kind_check;
    alter table outgoing_mail add constraint outgoing_mail_kind_check check (kind in (
      'invitation', 'password_reset', 'email_verification', 'sign_up_attempt',
      'follow_confirmation', 'publish_notice', 'seed_request_answer'));
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`
    delete from outgoing_mail where kind = 'seed_request_answer';
    alter table outgoing_mail drop constraint outgoing_mail_kind_check;
    alter table outgoing_mail add constraint outgoing_mail_kind_check check (kind in (
      'invitation', 'password_reset', 'email_verification', 'sign_up_attempt',
      'follow_confirmation', 'publish_notice'));
    drop table seed_requests;
    drop table seed_offers;
    drop trigger entries_lot_follows_variety on entries;
    drop function rowtally_entry_lot_follows_variety();
    alter table entries drop constraint entries_lot_of_variety;
    alter table entries drop column lot_id;
    drop table germination_tests;
    drop table seed_lots;
    alter table groups drop column seed_requests_open, drop column germination_threshold_percent;
  `.execute(db);
}
