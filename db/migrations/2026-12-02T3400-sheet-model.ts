import { type Kysely, sql } from 'kysely';

// Frozen. The results sheet remembers which model the lead chose for its analysis; null means
// "the one the design suggests", so sheets saved before the choice existed follow their design.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    alter table results_sheets
      add column model text check (model in ('anova', 'mixed'))
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`alter table results_sheets drop column model`.execute(db);
}
