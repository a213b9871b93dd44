import { type Kysely, sql } from 'kysely';

// Frozen. A trial copied to a new season remembers the trial it came from, so the new one can
// link back; deleting the old trial leaves the copy standing.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    alter table trials
      add column copied_from_trial_id uuid references trials (id) on delete set null
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`alter table trials drop column copied_from_trial_id`.execute(db);
}
