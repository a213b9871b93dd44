import { type Kysely, sql } from 'kysely';

// The lead's design: the layout's seed and plot size, per-entry spacing, the fertilizer
// policy, and what was actually planted in each plot.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    alter table trials
      add column layout_seed bigint check (layout_seed between 0 and 2147483647),
      add column replicates integer check (replicates between 1 and 99),
      add column rows_per_plot integer not null default 1 check (rows_per_plot between 1 and 12),
      add column row_length_mm finite_float check (row_length_mm > 0 and row_length_mm <= 1000000),
      add column row_spacing_mm finite_float check (row_spacing_mm > 0 and row_spacing_mm <= 10000),
      add column in_row_spacing_mm finite_float check (in_row_spacing_mm > 0 and in_row_spacing_mm <= 10000),
      add column layout_generated_at timestamptz,
      -- 'none_applied': no fertilizer anywhere in the trial; 'per_entry': entries marked
      -- no_fertilizer get none; 'as_recorded': whatever the field log records.
      add column fertilizer_policy text not null default 'as_recorded'
        check (fertilizer_policy in ('none_applied', 'per_entry', 'as_recorded')),
      add column fertilizer_notes text not null default '' check (char_length(fertilizer_notes) <= 2000),
      add constraint trials_layout_seed_with_time
        check ((layout_seed is null) = (layout_generated_at is null));

    alter table entries
      add column in_row_spacing_mm finite_float check (in_row_spacing_mm > 0 and in_row_spacing_mm <= 10000),
      add column no_fertilizer boolean not null default false;

    alter table plots
      add column gaps integer check (gaps >= 0),
      add column planted_note text not null default '' check (char_length(planted_note) <= 2000),
      add constraint plots_gaps_within_set check (gaps is null or plants_set is null or gaps <= plants_set);
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`
    alter table plots drop constraint plots_gaps_within_set, drop column planted_note, drop column gaps;
    alter table entries drop column no_fertilizer, drop column in_row_spacing_mm;
    alter table trials
      drop constraint trials_layout_seed_with_time,
      drop column fertilizer_notes, drop column fertilizer_policy, drop column layout_generated_at,
      drop column in_row_spacing_mm, drop column row_spacing_mm, drop column row_length_mm,
      drop column rows_per_plot, drop column replicates, drop column layout_seed;
  `.execute(db);
}
