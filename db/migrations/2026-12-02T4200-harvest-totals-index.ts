import { type Kysely, sql } from 'kysely';

/**
 * The analysis adds up a trial's live harvests per plot. An index holding every column that sum
 * reads, for live rows only, lets the database read just that trial's entries in plot order
 * from the index (an index-only scan) instead of visiting every harvest row of every trial.
 */
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create index harvests_live_totals_idx on harvests (trial_id, plot_id, harvested_on)
      include (fruit_count, mass_g, grade) where deleted_at is null`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop index harvests_live_totals_idx`.execute(db);
}
