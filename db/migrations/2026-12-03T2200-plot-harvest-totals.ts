import { type Kysely, sql } from 'kysely';

// Frozen. Each plot's live harvests added up, kept by triggers on every change to harvests, so
// an analysis reads one row per plot and its cost follows the plots, not the pickings. Triggers
// keep it, not the app: no write path, present or future (forms, imports, offline batches,
// cascades from a deleted plot or trial), can forget to.
//
// Masses are summed as numeric (exact decimal), so adding and taking away the same harvest
// leaves exactly what was there and the order of the pickings never shows in the last digit.
//
// A new harvest is added to its plot's row. An edit, soft delete, restore or hard delete
// recounts each plot it touched from that plot's live harvests: distinct days, first and last
// day and the decimals the masses need cannot be taken back from a total.
//
// Concurrency: each trigger first locks the plots it changes (FOR NO KEY UPDATE, which a
// harvest's own foreign-key check does not wait for), then reads and writes in later statements,
// each with a fresh snapshot under READ COMMITTED, so two writers to one plot take turns and
// the second sees the first's harvests. The triggers are named after the trial data-version
// ones, which fire first (triggers fire in name order) and lock the trial row: plots are locked
// after their trial, in plot id order, always.

/**
 * Decimals a recorded mass needs: the fewest (up to 6) that give it back within 1e-9 relative,
 * the same test the app's decimalsOf uses.
 */
const massDecimals = sql.raw(`
  create function harvest_mass_decimals(mass double precision) returns integer
    language sql immutable parallel safe as $$
      select case
        ${[0, 1, 2, 3, 4, 5]
          .map(
            (d) =>
              `when abs(round(mass * ${10 ** d}) / ${10 ** d} - mass) <= 1e-9 * greatest(1, abs(mass)) then ${d}`,
          )
          .join('\n        ')}
        else 6 end
    $$`);

/** Every column of the totals from a set of live harvest rows `h`, grouped by plot. */
const totalsOf = (from: string) => `
  select h.plot_id, h.trial_id,
    count(*)::int as harvests,
    sum(h.fruit_count) as fruit_count,
    sum(h.mass_g::numeric) as mass_g,
    coalesce(sum(h.fruit_count) filter (where h.grade = 'marketable'), 0) as marketable_fruit_count,
    coalesce(sum(h.mass_g::numeric) filter (where h.grade = 'marketable'), 0) as marketable_mass_g,
    count(distinct h.harvested_on)::int as harvest_days,
    min(h.harvested_on) as first_harvested_on,
    max(h.harvested_on) as last_harvested_on,
    max(harvest_mass_decimals(h.mass_g)) as mass_decimals
  ${from}
  group by h.plot_id, h.trial_id`;

const columns = `plot_id, trial_id, harvests, fruit_count, mass_g, marketable_fruit_count,
  marketable_mass_g, harvest_days, first_harvested_on, last_harvested_on, mass_decimals`;

const recount = sql.raw(`
  create function plot_harvest_totals_recount(plot_ids uuid[]) returns void
    language plpgsql as $$
    begin
      perform 1 from plots where id = any(plot_ids) order by id for no key update;
      with fresh as (${totalsOf('from harvests h where h.plot_id = any(plot_ids) and h.deleted_at is null')}),
      emptied as (
        delete from plot_harvest_totals t
        where t.plot_id = any(plot_ids) and t.plot_id not in (select plot_id from fresh))
      insert into plot_harvest_totals as t (${columns})
      select ${columns} from fresh order by plot_id
      on conflict (plot_id) do update set
        harvests = excluded.harvests,
        fruit_count = excluded.fruit_count,
        mass_g = excluded.mass_g,
        marketable_fruit_count = excluded.marketable_fruit_count,
        marketable_mass_g = excluded.marketable_mass_g,
        harvest_days = excluded.harvest_days,
        first_harvested_on = excluded.first_harvested_on,
        last_harvested_on = excluded.last_harvested_on,
        mass_decimals = excluded.mass_decimals;
    end $$`);

// New harvests: their sums are added; a day counts once more for a plot only when no other live
// harvest of that plot is on it (the new rows set aside).
const onInsert = sql.raw(`
  create function plot_harvest_totals_on_insert() returns trigger
    language plpgsql as $$
    begin
      perform 1 from plots
        where id in (select plot_id from new_rows where deleted_at is null)
        order by id for no key update;
      with added as (${totalsOf('from new_rows h where h.deleted_at is null')}),
      days as (
        select plot_id, harvested_on, array_agg(id) as ids
        from new_rows where deleted_at is null
        group by plot_id, harvested_on),
      new_days as (
        select d.plot_id, count(*)::int as n
        from days d
        where not exists (
          select 1 from harvests h
          where h.plot_id = d.plot_id and h.harvested_on = d.harvested_on
            and h.deleted_at is null and h.id <> all (d.ids))
        group by d.plot_id)
      insert into plot_harvest_totals as t (${columns})
      select a.plot_id, a.trial_id, a.harvests, a.fruit_count, a.mass_g, a.marketable_fruit_count,
        a.marketable_mass_g, coalesce(n.n, 0), a.first_harvested_on, a.last_harvested_on,
        a.mass_decimals
      from added a left join new_days n using (plot_id)
      order by a.plot_id
      on conflict (plot_id) do update set
        harvests = t.harvests + excluded.harvests,
        fruit_count = t.fruit_count + excluded.fruit_count,
        mass_g = t.mass_g + excluded.mass_g,
        marketable_fruit_count = t.marketable_fruit_count + excluded.marketable_fruit_count,
        marketable_mass_g = t.marketable_mass_g + excluded.marketable_mass_g,
        harvest_days = t.harvest_days + excluded.harvest_days,
        first_harvested_on = least(t.first_harvested_on, excluded.first_harvested_on),
        last_harvested_on = greatest(t.last_harvested_on, excluded.last_harvested_on),
        mass_decimals = greatest(t.mass_decimals, excluded.mass_decimals);
      return null;
    end $$`);

// An edit recounts the plots of the rows whose counted values or liveness changed (a note-only
// edit recounts nothing), before and after (a harvest moved to another plot changes both).
const onUpdate = sql.raw(`
  create function plot_harvest_totals_on_update() returns trigger
    language plpgsql as $$
    declare
      touched uuid[];
    begin
      select array_agg(distinct p.plot_id) into touched
      from old_rows o full join new_rows n on n.id = o.id
      cross join lateral (values (o.plot_id), (n.plot_id)) as p (plot_id)
      where p.plot_id is not null
        and (o.plot_id, o.harvested_on, o.fruit_count, o.mass_g, o.grade, o.deleted_at is null)
          is distinct from
            (n.plot_id, n.harvested_on, n.fruit_count, n.mass_g, n.grade, n.deleted_at is null);
      if touched is not null then
        perform plot_harvest_totals_recount(touched);
      end if;
      return null;
    end $$`);

const onDelete = sql.raw(`
  create function plot_harvest_totals_on_delete() returns trigger
    language plpgsql as $$
    declare
      touched uuid[];
    begin
      select array_agg(distinct plot_id) into touched from old_rows where deleted_at is null;
      if touched is not null then
        perform plot_harvest_totals_recount(touched);
      end if;
      return null;
    end $$`);

export async function up(db: Kysely<any>): Promise<void> {
  // Rows are updated in place on every harvest: room on each page keeps those updates HOT.
  await sql`
    create table plot_harvest_totals (
      plot_id uuid primary key,
      trial_id uuid not null,
      harvests integer not null check (harvests > 0),
      fruit_count bigint not null,
      mass_g numeric not null,
      marketable_fruit_count bigint not null,
      marketable_mass_g numeric not null,
      -- a harvest about to be added is checked before it meets its plot's row, with the days it
      -- adds (none, when the plot already has that day), so only this bound holds for both
      harvest_days integer not null check (harvest_days <= harvests),
      first_harvested_on date not null,
      last_harvested_on date not null,
      mass_decimals integer not null,
      foreign key (plot_id, trial_id) references plots (id, trial_id) on delete cascade
    ) with (fillfactor = 50)`.execute(db);
  await sql`create index plot_harvest_totals_trial_idx on plot_harvest_totals (trial_id)`.execute(
    db,
  );
  await massDecimals.execute(db);
  await recount.execute(db);
  await onInsert.execute(db);
  await onUpdate.execute(db);
  await onDelete.execute(db);
  await sql`
    create trigger harvests_totals_insert after insert on harvests
      referencing new table as new_rows
      for each statement execute function plot_harvest_totals_on_insert()`.execute(db);
  await sql`
    create trigger harvests_totals_update after update on harvests
      referencing old table as old_rows new table as new_rows
      for each statement execute function plot_harvest_totals_on_update()`.execute(db);
  await sql`
    create trigger harvests_totals_delete after delete on harvests
      referencing old table as old_rows
      for each statement execute function plot_harvest_totals_on_delete()`.execute(db);
  await sql
    .raw(
      `insert into plot_harvest_totals (${columns})
      ${totalsOf('from harvests h where h.deleted_at is null')}`,
    )
    .execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const op of ['insert', 'update', 'delete'])
    await sql`drop trigger ${sql.id(`harvests_totals_${op}`)} on harvests`.execute(db);
  await sql`drop function plot_harvest_totals_on_insert()`.execute(db);
  await sql`drop function plot_harvest_totals_on_update()`.execute(db);
  await sql`drop function plot_harvest_totals_on_delete()`.execute(db);
  await sql`drop function plot_harvest_totals_recount(uuid[])`.execute(db);
  await sql`drop function harvest_mass_decimals(double precision)`.execute(db);
  await sql`drop table plot_harvest_totals`.execute(db);
}
