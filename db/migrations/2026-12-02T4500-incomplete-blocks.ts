import { type Kysely, sql } from 'kysely';

// Frozen. Incomplete-block trials: a resolvable layout at one site ('incomplete') or a network of
// gardens that each grow some of the entries ('network'). The trial keeps how many entries a
// block (or garden) holds; each plot keeps the replicate its block belongs to.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    alter table trials drop constraint trials_design_check;
    alter table trials add constraint trials_design_check
      check (design in ('crd', 'rcbd', 'multisite', 'incomplete', 'network'));
    alter table trials add column block_size integer check (block_size between 2 and 999);
    alter table trials add constraint trials_block_size_design check (
      (design in ('incomplete', 'network')) = (block_size is not null) or layout_seed is null);
    alter table plots add column replicate integer check (replicate between 1 and 999);
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  // Trials of the new designs keep their plots; their blocks read as the older designs' blocks.
  await sql`
    alter table plots drop column replicate;
    alter table trials drop constraint trials_block_size_design;
    alter table trials drop column block_size;
    update trials set design = 'multisite' where design = 'network';
    update trials set design = 'rcbd' where design = 'incomplete';
    alter table trials drop constraint trials_design_check;
    alter table trials add constraint trials_design_check
      check (design in ('crd', 'rcbd', 'multisite'));
  `.execute(db);
}
