import type { Insertable, Transaction } from 'kysely';
import type { DB } from '../../db/database';
import type { Database, PhotosTable } from '../../db/schema';

type Q = DB | Transaction<Database>;

const photoColumns = [
  'p.id',
  'p.trial_id',
  'p.entry_id',
  'p.plot_id',
  'p.taken_on',
  'p.captured_at',
  'p.caption',
  'p.subject',
  'p.storage_key',
  'p.mime_type',
  'p.original_ext',
  'p.sha256',
  'p.width',
  'p.height',
  'p.bytes',
  'p.display_width',
  'p.display_height',
  'p.thumb_width',
  'p.thumb_height',
  'p.is_cover',
  'p.deleted_at',
  'p.purge_after',
  'p.purged_at',
  'p.created_at',
  'p.created_by',
  'u.name as uploader_name',
] as const;

function photosQuery(db: Q) {
  return db
    .selectFrom('photos as p')
    .leftJoin('users as u', 'u.id', 'p.created_by')
    .select(photoColumns);
}
export type PhotoRow = Awaited<
  ReturnType<ReturnType<typeof photosQuery>['executeTakeFirstOrThrow']>
>;

export interface PhotoFilters {
  entryId?: string;
  plotId?: string;
  from?: string;
  to?: string;
  subject?: PhotosTable['subject'];
  entryIds?: string[];
}

export function listPhotos(db: Q, trialId: string, f: PhotoFilters) {
  return photosQuery(db)
    .where('p.trial_id', '=', trialId)
    .where('p.deleted_at', 'is', null)
    .$if(f.entryId !== undefined, (q) => q.where('p.entry_id', '=', f.entryId!))
    .$if(f.plotId !== undefined, (q) => q.where('p.plot_id', '=', f.plotId!))
    .$if(f.from !== undefined, (q) => q.where('p.taken_on', '>=', f.from!))
    .$if(f.to !== undefined, (q) => q.where('p.taken_on', '<=', f.to!))
    .$if(f.subject !== undefined, (q) => q.where('p.subject', '=', f.subject!))
    .orderBy('p.taken_on', 'desc')
    .orderBy('p.created_at', 'desc')
    .orderBy('p.id')
    .execute();
}

export function findPhoto(db: Q, trialId: string, photoId: string) {
  return photosQuery(db)
    .where('p.trial_id', '=', trialId)
    .where('p.id', '=', photoId)
    .executeTakeFirst();
}

/** Locks the row so two edits, or an edit and the purge, do not interleave. */
export function lockPhoto(trx: Transaction<Database>, trialId: string, photoId: string) {
  return trx
    .selectFrom('photos')
    .select(['id', 'deleted_at', 'purge_after', 'purged_at', 'entry_id', 'is_cover', 'created_by'])
    .where('trial_id', '=', trialId)
    .where('id', '=', photoId)
    .forUpdate()
    .executeTakeFirst();
}

/** The new photos' ids; a photo whose upload id and place are taken already is left out. */
export function insertPhotos(trx: Transaction<Database>, rows: Insertable<PhotosTable>[]) {
  return trx
    .insertInto('photos')
    .values(rows)
    .onConflict((oc) => oc.columns(['upload_id', 'upload_index']).doNothing())
    .returning('id')
    .execute();
}

/** The photos an earlier attempt of this upload made, in the order they were sent. */
export function photosOfUpload(db: Q, uploadId: string) {
  return photosQuery(db).where('p.upload_id', '=', uploadId).orderBy('p.upload_index').execute();
}

/** The trial's photos with these ids, in one query (in no particular order). */
export function findPhotos(db: Q, trialId: string, photoIds: string[]) {
  return photosQuery(db).where('p.trial_id', '=', trialId).where('p.id', 'in', photoIds).execute();
}

export function updatePhoto(
  trx: Transaction<Database>,
  photoId: string,
  values: Partial<Pick<PhotosTable, 'caption' | 'entry_id' | 'plot_id' | 'subject'>> & {
    taken_on?: string;
    is_cover?: boolean;
    updated_by: string;
  },
) {
  return trx.updateTable('photos').set(values).where('id', '=', photoId).execute();
}

export function markDeleted(
  trx: Transaction<Database>,
  photoId: string,
  userId: string,
  purgeAfter: Date,
) {
  return trx
    .updateTable('photos')
    .set({ deleted_at: new Date(), purge_after: purgeAfter, is_cover: false, updated_by: userId })
    .where('id', '=', photoId)
    .execute();
}

export function markRestored(trx: Transaction<Database>, photoId: string, userId: string) {
  return trx
    .updateTable('photos')
    .set({ deleted_at: null, purge_after: null, updated_by: userId })
    .where('id', '=', photoId)
    .where('purged_at', 'is', null)
    .execute();
}

/** Clears the entry's cover (if any), so the new choice can take the one slot. */
export function clearEntryCover(trx: Transaction<Database>, entryId: string, userId: string) {
  return trx
    .updateTable('photos')
    .set({ is_cover: false, updated_by: userId })
    .where('entry_id', '=', entryId)
    .where('is_cover', '=', true)
    .execute();
}

export function entryInTrial(db: Q, trialId: string, entryId: string) {
  return db
    .selectFrom('entries')
    .select('id')
    .where('trial_id', '=', trialId)
    .where('id', '=', entryId)
    .executeTakeFirst();
}

export function plotInTrial(db: Q, trialId: string, plotId: string) {
  return db
    .selectFrom('plots')
    .select(['id', 'entry_id'])
    .where('trial_id', '=', trialId)
    .where('id', '=', plotId)
    .executeTakeFirst();
}

export async function taggingContext(db: Q, trialId: string) {
  const [entries, plots] = await Promise.all([
    db
      .selectFrom('entries as e')
      .leftJoin('photos as p', (j) =>
        j.onRef('p.entry_id', '=', 'e.id').on('p.is_cover', '=', true),
      )
      .select(['e.id', 'e.code', 'e.name', 'p.id as cover_photo_id'])
      .where('e.trial_id', '=', trialId)
      .orderBy('e.code')
      .execute(),
    db
      .selectFrom('plots as pl')
      .innerJoin('sites as s', 's.id', 'pl.site_id')
      .select([
        'pl.id',
        'pl.entry_id',
        'pl.site_id',
        's.name as site_name',
        'pl.plot_number',
        'pl.block',
      ])
      .where('pl.trial_id', '=', trialId)
      .orderBy('s.name')
      .orderBy('pl.plot_number')
      .execute(),
  ]);
  return { entries, plots };
}

/** Photos whose deletion is final: past the undo window, files not yet removed. */
export function photosDueForPurge(db: Q, now: Date, limit: number) {
  return db
    .selectFrom('photos')
    .select(['id', 'storage_key', 'original_ext'])
    .where('purged_at', 'is', null)
    .where('purge_after', '<=', now)
    .orderBy('purge_after')
    .limit(limit)
    .execute();
}

export function markPurged(db: Q, photoId: string) {
  return db
    .updateTable('photos')
    .set({ purged_at: new Date() })
    .where('id', '=', photoId)
    .where('deleted_at', 'is not', null)
    .execute();
}
