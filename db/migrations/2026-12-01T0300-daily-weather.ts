import { type Kysely, sql } from 'kysely';

// Frozen. Daily weather per site (typed in or imported from a home station), for degree days,
// hot days and water received. Temperatures in °C, rain in mm.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table daily_weather (
      id uuid primary key default gen_random_uuid(),
      trial_id uuid not null references trials (id) on delete cascade,
      site_id uuid not null,
      observed_on date not null,
      -- the extremes ever measured on Earth lie inside ±95 °C; anything outside is a typo
      tmin_c finite_float check (tmin_c between -95 and 95),
      tmax_c finite_float check (tmax_c between -95 and 95),
      rain_mm finite_float check (rain_mm >= 0 and rain_mm <= 2000),
      source text not null default 'manual' check (source in ('manual', 'import', 'demo')),
      note text not null default '' check (char_length(note) <= 500),
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      foreign key (site_id, trial_id) references sites (id, trial_id) on delete cascade,
      unique (site_id, observed_on),
      check (tmin_c is null or tmax_c is null or tmin_c <= tmax_c),
      check (tmin_c is not null or tmax_c is not null or rain_mm is not null)
    );
    create index daily_weather_trial_idx on daily_weather (trial_id, site_id, observed_on);
    create trigger touch_updated_at before update on daily_weather
      for each row execute function rowtally_touch_updated_at();
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop table daily_weather`.execute(db);
}
