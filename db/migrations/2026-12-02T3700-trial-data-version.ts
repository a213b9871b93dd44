import { type Kysely, sql } from 'kysely';

// Frozen. A number every change to a trial's data moves on, so answers computed from that data
// (analyses, comparisons) can be kept and reused until the data changes. Triggers bump it, not
// the app: no write path, present or future, can forget to. Statement-level triggers with
// transition tables bump each trial once per statement, however many rows an import writes.
const tables = [
  'sites',
  'entries',
  'plots',
  'traits',
  'harvests',
  'observations',
  'field_events',
  'photos',
  'daily_weather',
  'results_sheets',
  'result_versions',
];

export async function up(db: Kysely<any>): Promise<void> {
  await sql`alter table trials add column data_version bigint not null default 0`.execute(db);
  // Any other change to the trial row itself (design, dates, status) moves it on too.
  await sql`
    create function trial_data_version_on_update() returns trigger language plpgsql as $$
    begin
      if new.data_version = old.data_version then
        new.data_version := old.data_version + 1;
      end if;
      return new;
    end $$`.execute(db);
  await sql`
    create trigger trials_data_version before update on trials
      for each row execute function trial_data_version_on_update()`.execute(db);
  await sql`
    create function bump_trial_data_version() returns trigger language plpgsql as $$
    begin
      if tg_op = 'INSERT' then
        update trials set data_version = data_version + 1
          where id in (select distinct trial_id from new_rows);
      elsif tg_op = 'DELETE' then
        update trials set data_version = data_version + 1
          where id in (select distinct trial_id from old_rows);
      else
        update trials set data_version = data_version + 1
          where id in (select trial_id from new_rows union select trial_id from old_rows);
      end if;
      return null;
    end $$`.execute(db);
  for (const table of tables) {
    await sql`
      create trigger ${sql.id(`${table}_data_version_insert`)} after insert on ${sql.table(table)}
        referencing new table as new_rows
        for each statement execute function bump_trial_data_version()`.execute(db);
    await sql`
      create trigger ${sql.id(`${table}_data_version_update`)} after update on ${sql.table(table)}
        referencing old table as old_rows new table as new_rows
        for each statement execute function bump_trial_data_version()`.execute(db);
    await sql`
      create trigger ${sql.id(`${table}_data_version_delete`)} after delete on ${sql.table(table)}
        referencing old table as old_rows
        for each statement execute function bump_trial_data_version()`.execute(db);
  }
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of tables) {
    for (const op of ['insert', 'update', 'delete'])
      await sql`drop trigger ${sql.id(`${table}_data_version_${op}`)} on ${sql.table(table)}`.execute(
        db,
      );
  }
  await sql`drop function bump_trial_data_version()`.execute(db);
  await sql`drop trigger trials_data_version on trials`.execute(db);
  await sql`drop function trial_data_version_on_update()`.execute(db);
  await sql`alter table trials drop column data_version`.execute(db);
}
