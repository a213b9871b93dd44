import { type Kysely, sql } from 'kysely';

// Frozen. An upload carries an id made on the device; each photo keeps it with its place in
// that upload, so a retried upload whose answer was lost finds the photos it already made
// instead of storing them twice. Older photos have none.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    alter table photos
      add column upload_id uuid,
      add column upload_index integer check (upload_index >= 0),
      add constraint photos_upload_once unique (upload_id, upload_index),
      add constraint photos_upload_whole check ((upload_id is null) = (upload_index is null))
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`
    alter table photos
      drop constraint photos_upload_whole,
      drop constraint photos_upload_once,
      drop column upload_index,
      drop column upload_id
  `.execute(db);
}
