import { type Kysely, sql } from 'kysely';

// Frozen. The trial, its design and its season's records. All quantities are stored in SI
// units (grams, millimetres, square metres, minutes); the edges convert for people.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    -- A measured quantity: never NaN or infinite (PostgreSQL sorts NaN above every number,
    -- so a plain ">= 0" check would let it through).
    create domain finite_float as double precision check (value > '-Infinity' and value < 'Infinity');

    create function rowtally_touch_updated_at() returns trigger language plpgsql as $$
    begin
      new.updated_at := now();
      return new;
    end $$;

    create table trials (
      id uuid primary key default gen_random_uuid(),
      slug text not null unique check (slug ~ '^[a-z0-9]+(-[a-z0-9]+)*$' and char_length(slug) <= 80),
      title text not null check (char_length(title) between 1 and 200),
      crop text not null check (char_length(crop) between 1 and 80),
      season text not null check (char_length(season) between 1 and 40),
      design text not null check (design in ('crd', 'rcbd', 'multisite')),
      status text not null default 'draft' check (status in ('draft', 'active', 'closed', 'published')),
      description text not null default '' check (char_length(description) <= 5000),
      sowing_date date,
      transplant_date date,
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null
    );

    create table sites (
      id uuid primary key default gen_random_uuid(),
      trial_id uuid not null references trials (id) on delete cascade,
      name text not null check (char_length(name) between 1 and 120),
      region text not null default '' check (char_length(region) <= 120),
      -- USDA soil textural classes
      soil_texture text check (soil_texture in ('sand', 'loamy sand', 'sandy loam', 'loam', 'silt loam',
        'silt', 'sandy clay loam', 'clay loam', 'silty clay loam', 'sandy clay', 'silty clay', 'clay')),
      irrigation_method text check (irrigation_method in ('drip', 'overhead', 'furrow', 'hand', 'none')),
      notes text not null default '' check (char_length(notes) <= 5000),
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      unique (trial_id, name),
      unique (id, trial_id)
    );

    create table entries (
      id uuid primary key default gen_random_uuid(),
      trial_id uuid not null references trials (id) on delete cascade,
      name text not null check (char_length(name) between 1 and 120),
      code text not null check (code ~ '^[A-Za-z0-9]{1,6}$'),
      seed_source text not null default '' check (char_length(seed_source) <= 200),
      seed_lot text not null default '' check (char_length(seed_lot) <= 80),
      entry_type text not null check (entry_type in ('heirloom', 'open_pollinated', 'hybrid')),
      days_to_maturity_claimed integer check (days_to_maturity_claimed between 1 and 400),
      notes text not null default '' check (char_length(notes) <= 5000),
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      unique (trial_id, name),
      unique (trial_id, code),
      unique (id, trial_id)
    );

    create table plots (
      id uuid primary key default gen_random_uuid(),
      trial_id uuid not null references trials (id) on delete cascade,
      site_id uuid not null,
      entry_id uuid not null,
      block integer not null check (block between 1 and 99),
      position integer not null check (position >= 1),
      plot_number integer not null check (plot_number >= 1),
      plants_set integer check (plants_set >= 0),
      plants_surviving integer check (plants_surviving >= 0),
      in_row_spacing_mm finite_float check (in_row_spacing_mm > 0),
      row_length_mm finite_float check (row_length_mm > 0),
      row_spacing_mm finite_float check (row_spacing_mm > 0),
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      -- a plot's site and entry must belong to the plot's own trial
      foreign key (site_id, trial_id) references sites (id, trial_id) on delete cascade,
      foreign key (entry_id, trial_id) references entries (id, trial_id) on delete cascade,
      check (plants_surviving is null or plants_set is null or plants_surviving <= plants_set),
      unique (site_id, plot_number),
      unique (site_id, block, position),
      unique (id, trial_id)
    );

    create table traits (
      id uuid primary key default gen_random_uuid(),
      trial_id uuid not null references trials (id) on delete cascade,
      key text not null check (key ~ '^[a-z][a-z0-9_]{0,39}$'),
      label text not null check (char_length(label) between 1 and 120),
      quantity_kind text not null check (quantity_kind in ('mass', 'length', 'count', 'score', 'date', 'percent')),
      basis text not null check (basis in ('plant', 'plot', 'harvest')),
      direction text not null check (direction in ('higher', 'lower', 'none')),
      scale_min finite_float,
      scale_max finite_float,
      sort_order integer not null default 0,
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      check ((quantity_kind = 'score') = (scale_min is not null and scale_max is not null)),
      check (scale_min is null or scale_min < scale_max),
      unique (trial_id, key),
      unique (id, trial_id)
    );

    create table harvests (
      id uuid primary key default gen_random_uuid(),
      trial_id uuid not null references trials (id) on delete cascade,
      plot_id uuid not null,
      harvested_on date not null,
      fruit_count integer not null check (fruit_count >= 0),
      mass_g finite_float not null check (mass_g >= 0),
      grade text not null check (grade in ('marketable', 'cull')),
      note text not null default '' check (char_length(note) <= 2000),
      version integer not null default 1,
      deleted_at timestamptz,
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      foreign key (plot_id, trial_id) references plots (id, trial_id) on delete cascade
    );
    create index harvests_plot_idx on harvests (plot_id, harvested_on);
    create index harvests_trial_idx on harvests (trial_id);

    create table observations (
      id uuid primary key default gen_random_uuid(),
      trial_id uuid not null references trials (id) on delete cascade,
      plot_id uuid not null,
      trait_id uuid not null,
      observed_on date not null,
      value finite_float,
      value_date date,
      plant_number integer check (plant_number between 1 and 999),
      note text not null default '' check (char_length(note) <= 2000),
      version integer not null default 1,
      deleted_at timestamptz,
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      foreign key (plot_id, trial_id) references plots (id, trial_id) on delete cascade,
      foreign key (trait_id, trial_id) references traits (id, trial_id) on delete cascade,
      check ((value is null) <> (value_date is null))
    );
    create index observations_plot_trait_idx on observations (plot_id, trait_id);
    create index observations_trial_idx on observations (trial_id);

    create table field_events (
      id uuid primary key default gen_random_uuid(),
      trial_id uuid not null references trials (id) on delete cascade,
      site_id uuid not null,
      plot_id uuid,
      kind text not null check (kind in ('irrigation', 'rainfall', 'fertilizer', 'thinning', 'pruning', 'transplanting', 'note')),
      occurred_on date not null,
      irrigation_method text check (irrigation_method in ('drip', 'overhead', 'hand', 'furrow')),
      run_time_min finite_float check (run_time_min > 0),
      water_depth_mm finite_float check (water_depth_mm >= 0),
      rain_mm finite_float check (rain_mm >= 0),
      amendment_kind text check (char_length(amendment_kind) <= 120),
      rate_g_per_m2 finite_float check (rate_g_per_m2 >= 0),
      none_applied boolean not null default false,
      target_spacing_mm finite_float check (target_spacing_mm > 0),
      note text not null default '' check (char_length(note) <= 2000),
      version integer not null default 1,
      deleted_at timestamptz,
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      foreign key (site_id, trial_id) references sites (id, trial_id) on delete cascade,
      foreign key (plot_id, trial_id) references plots (id, trial_id) on delete cascade,
      check (kind <> 'irrigation' or (irrigation_method is not null and run_time_min is not null)),
      check (kind <> 'rainfall' or rain_mm is not null),
      check (kind <> 'fertilizer' or none_applied or amendment_kind is not null)
    );
    create index field_events_site_idx on field_events (site_id, occurred_on);

    create table photos (
      id uuid primary key default gen_random_uuid(),
      trial_id uuid not null references trials (id) on delete cascade,
      entry_id uuid,
      plot_id uuid,
      taken_on date,
      caption text not null check (char_length(caption) between 1 and 300),
      subject text check (subject in ('plant', 'fruit', 'leaf', 'damage', 'measurement')),
      storage_key text not null unique,
      width integer check (width > 0),
      height integer check (height > 0),
      bytes integer check (bytes >= 0),
      deleted_at timestamptz,
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      foreign key (entry_id, trial_id) references entries (id, trial_id) on delete cascade,
      foreign key (plot_id, trial_id) references plots (id, trial_id) on delete cascade
    );

    create table trial_members (
      trial_id uuid not null references trials (id) on delete cascade,
      user_id text not null references users (id) on delete cascade,
      role text not null check (role in ('lead', 'grower', 'contributor', 'viewer')),
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      primary key (trial_id, user_id)
    );

    -- A grower may be limited to some of the trial's sites; no rows means every site.
    create table trial_member_sites (
      trial_id uuid not null,
      user_id text not null,
      site_id uuid not null,
      created_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      primary key (trial_id, user_id, site_id),
      foreign key (trial_id, user_id) references trial_members (trial_id, user_id) on delete cascade,
      foreign key (site_id, trial_id) references sites (id, trial_id) on delete cascade
    );
  `.execute(db);

  for (const table of [
    'trials',
    'sites',
    'entries',
    'plots',
    'traits',
    'harvests',
    'observations',
    'field_events',
    'photos',
    'trial_members',
  ]) {
    await sql`create trigger touch_updated_at before update on ${sql.table(table)}
      for each row execute function rowtally_touch_updated_at()`.execute(db);
  }
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`
    drop table trial_member_sites, trial_members, photos, field_events, observations, harvests,
      traits, plots, entries, sites, trials;
    drop function rowtally_touch_updated_at();
    drop domain finite_float;
  `.execute(db);
}
