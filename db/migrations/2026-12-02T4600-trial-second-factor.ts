import { type Kysely, sql } from 'kysely';

// Frozen. A trial may compare a second factor (a treatment such as fertilizer or irrigation)
// across its varieties: the factor's name, its levels in the lead's order, and how it is laid
// out (every treatment × variety plot in each block, or treatments on main plots of a split
// plot). Each plot carries its treatment level.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    alter table trials
      add column factor_name text,
      add column factor_levels text[],
      add column factor_arrangement text
        check (factor_arrangement in ('factorial', 'split_plot')),
      add constraint trials_factor_complete check (
        (factor_name is null) = (factor_levels is null)
        and (factor_name is null) = (factor_arrangement is null)
        and (factor_levels is null or cardinality(factor_levels) >= 2)
      )
  `.execute(db);
  await sql`alter table plots add column treatment text`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`alter table plots drop column treatment`.execute(db);
  await sql`
    alter table trials
      drop constraint trials_factor_complete,
      drop column factor_arrangement,
      drop column factor_levels,
      drop column factor_name
  `.execute(db);
}
