import { type Kysely, sql } from 'kysely';

// Frozen. Photo files: where the three sizes live, what the original was, when it was taken,
// the lead's cover choice per entry, and the two steps of deletion (undoable, then final).
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    alter table photos
      add column mime_type text not null default 'image/jpeg'
        check (mime_type in ('image/jpeg', 'image/png', 'image/webp', 'image/avif')),
      add column original_ext text not null default 'jpg'
        check (original_ext in ('jpg', 'png', 'webp', 'avif')),
      add column sha256 text check (sha256 ~ '^[0-9a-f]{64}$'),
      add column display_width integer check (display_width > 0),
      add column display_height integer check (display_height > 0),
      add column display_bytes integer check (display_bytes >= 0),
      add column thumb_width integer check (thumb_width > 0),
      add column thumb_height integer check (thumb_height > 0),
      add column thumb_bytes integer check (thumb_bytes >= 0),
      add column captured_at timestamptz,
      add column is_cover boolean not null default false,
      add column purge_after timestamptz,
      add column purged_at timestamptz,
      -- the random folder the files live under: never derived from anything guessable
      add constraint photos_storage_key_shape check (storage_key ~ '^photos/[0-9a-f-]{36}/[0-9a-f]{32}$'),
      add constraint photos_cover_has_entry check (not is_cover or entry_id is not null),
      add constraint photos_cover_not_deleted check (not is_cover or deleted_at is null),
      add constraint photos_purge_needs_delete check (purge_after is null or deleted_at is not null),
      add constraint photos_purged_needs_delete check (purged_at is null or deleted_at is not null);

    alter table photos alter column mime_type drop default, alter column original_ext drop default;

    create unique index photos_one_cover_per_entry on photos (entry_id) where is_cover;
    create index photos_trial_taken_idx on photos (trial_id, taken_on) where deleted_at is null;
    create index photos_purge_idx on photos (purge_after) where purged_at is null and purge_after is not null;
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`
    drop index photos_purge_idx;
    drop index photos_trial_taken_idx;
    drop index photos_one_cover_per_entry;
    alter table photos
      drop constraint photos_storage_key_shape,
      drop constraint photos_cover_has_entry,
      drop constraint photos_cover_not_deleted,
      drop constraint photos_purge_needs_delete,
      drop constraint photos_purged_needs_delete,
      drop column mime_type, drop column original_ext, drop column sha256,
      drop column display_width, drop column display_height, drop column display_bytes,
      drop column thumb_width, drop column thumb_height, drop column thumb_bytes,
      drop column captured_at, drop column is_cover, drop column purge_after, drop column purged_at;
  `.execute(db);
}
