import { type Kysely, sql } from 'kysely';

// Frozen. A register variety's own cover: one photo from one of its trial entries.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    alter table varieties
      add column cover_photo_id uuid references photos (id) on delete set null;
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`alter table varieties drop column cover_photo_id;`.execute(db);
}
