import crypto from 'node:crypto';
import { localToday } from '../../common/calendar-date';
import type { Insertable } from 'kysely';
import type { z } from 'zod';
import type {
  ListPhotosQuery,
  Photo,
  PhotoTagging,
  PhotoVariant,
  UpdatePhotoBody,
  uploadPhotoFields,
} from '../../common/contracts/photos';
import { type Actor, can } from '../../common/policy';
import type { DB } from '../../db/database';
import type { PhotosTable, Trial } from '../../db/schema';
import { AppError } from '../lib/app-error';
import type { ObjectStorage, StoredObject } from '../storage/object-storage';
import type { LoadedTrial } from '../trials/trial-access';
import type { TrialMembership } from '../trials/trial-membership';
import { trialAllows, trialForAction } from '../trials/trials-service';
import {
  acceptedTypes,
  defaultPhotoLimits,
  heicReadable,
  type PhotoLimitsConfig,
  type ProcessedPhoto,
  processPhoto,
} from './photo-processing';
import * as repo from './photos-repository';
import type { PhotoRow } from './photos-repository';

export interface PhotoDeps {
  db: DB;
  storage: ObjectStorage;
  limits?: PhotoLimitsConfig;
}

/** How long a deleted photo can be brought back before its files are removed for good. */
export const PHOTO_UNDO_WINDOW_MS = 24 * 60 * 60 * 1000;

export function variantKey(
  row: Pick<PhotoRow, 'storage_key' | 'original_ext'>,
  variant: PhotoVariant,
): string {
  if (variant === 'original') return `${row.storage_key}/original.${row.original_ext}`;
  return `${row.storage_key}/${variant}.webp`;
}

const allVariantKeys = (row: Pick<PhotoRow, 'storage_key' | 'original_ext'>) =>
  (['thumb', 'display', 'original'] as const).map((v) => variantKey(row, v));

const isLead = (actor: Actor | null, loaded: LoadedTrial) =>
  Boolean(actor?.isAdmin || loaded.access.role === 'lead');

const isUploader = (actor: Actor | null, row: Pick<PhotoRow, 'created_by'>) =>
  Boolean(actor && row.created_by && row.created_by === actor.userId);

/** Tags and deletion: the uploader (while still allowed to upload) and the lead. */
function canEdit(actor: Actor | null, loaded: LoadedTrial, row: PhotoRow): boolean {
  if (isLead(actor, loaded)) return true;
  return isUploader(actor, row) && can(actor, 'photos.upload', loaded.access);
}

/** The full-size file: its uploader and the lead. */
function canSeeOriginal(actor: Actor | null, loaded: LoadedTrial, row: PhotoRow): boolean {
  if (isLead(actor, loaded)) return true;
  return isUploader(actor, row) && can(actor, 'trial.read', loaded.access);
}

/**
 * Whether anyone, signed in or not, may see a photo's thumbnail and display size: the lead chose
 * it as an entry's cover (the results sheet's picture) and the trial is published. The results
 * sheet can link to /api/trials/:slug/photos/:id/display for these; the original never is public.
 */
export function isPhotoPublic(
  trial: Pick<Trial, 'status'>,
  photo: Pick<PhotoRow, 'is_cover' | 'deleted_at'>,
): boolean {
  return trial.status === 'published' && photo.is_cover && photo.deleted_at === null;
}

/**
 * Whether the actor may see a photo's thumbnail and display size, as `photoFile` serves them: a
 * public photo anyone, any other whoever may read its trial. A list that links to a photo of a
 * trial it does not load asks this, so it links only what the photo routes serve.
 */
export function maySeePhoto(
  actor: Actor | null,
  trial: TrialMembership,
  photo: Pick<PhotoRow, 'is_cover' | 'deleted_at'>,
): boolean {
  return isPhotoPublic(trial, photo) || trialAllows(actor, 'trial.read', trial);
}

function urlOf(slug: string, row: Pick<PhotoRow, 'id' | 'sha256'>, variant: PhotoVariant) {
  // The version in the address changes with the content, so the file can be cached for good.
  return `/api/trials/${slug}/photos/${row.id}/${variant}?v=${(row.sha256 ?? '').slice(0, 12)}`;
}

function toPhoto(slug: string, actor: Actor | null, loaded: LoadedTrial, row: PhotoRow): Photo {
  return {
    id: row.id,
    entryId: row.entry_id,
    plotId: row.plot_id,
    takenOn: row.taken_on,
    capturedAt: row.captured_at ? row.captured_at.toISOString() : null,
    caption: row.caption,
    subject: row.subject,
    mimeType: row.mime_type,
    width: row.width,
    height: row.height,
    bytes: row.bytes,
    thumbWidth: row.thumb_width,
    thumbHeight: row.thumb_height,
    displayWidth: row.display_width,
    displayHeight: row.display_height,
    isCover: row.is_cover,
    uploadedBy:
      row.created_by && row.uploader_name ? { id: row.created_by, name: row.uploader_name } : null,
    createdAt: row.created_at.toISOString(),
    deletedAt: row.deleted_at ? row.deleted_at.toISOString() : null,
    canEdit: canEdit(actor, loaded, row),
    urls: {
      thumb: urlOf(slug, row, 'thumb'),
      display: urlOf(slug, row, 'display'),
      original: canSeeOriginal(actor, loaded, row) ? urlOf(slug, row, 'original') : null,
    },
  };
}

export function limitsOf(deps: PhotoDeps) {
  const limits = deps.limits ?? defaultPhotoLimits;
  return { ...limits, acceptedTypes, heicReadable: heicReadable() };
}

export async function tagging(
  deps: PhotoDeps,
  slug: string,
  actor: Actor | null,
): Promise<PhotoTagging> {
  const loaded = await trialForAction(deps.db, slug, actor, 'trial.read');
  const { entries, plots } = await repo.taggingContext(deps.db, loaded.trial.id);
  return {
    entries: entries.map((e) => ({
      id: e.id,
      code: e.code,
      name: e.name,
      coverPhotoId: e.cover_photo_id,
    })),
    plots: plots.map((p) => ({
      id: p.id,
      entryId: p.entry_id,
      siteId: p.site_id,
      siteName: p.site_name,
      plotNumber: p.plot_number,
      block: p.block,
    })),
    permissions: {
      upload: can(actor, 'photos.upload', loaded.access),
      chooseCover: isLead(actor, loaded),
    },
    limits: limitsOf(deps),
  };
}

export async function listPhotos(
  deps: PhotoDeps,
  slug: string,
  actor: Actor | null,
  query: ListPhotosQuery,
): Promise<Photo[]> {
  const loaded = await trialForAction(deps.db, slug, actor, 'trial.read');
  const rows = await repo.listPhotos(deps.db, loaded.trial.id, query);
  return rows.map((r) => toPhoto(slug, actor, loaded, r));
}

/** The entry a photo is of: the plot's own entry when a plot is given. */
async function resolveTags(
  db: DB,
  trialId: string,
  entryId: string | null | undefined,
  plotId: string | null | undefined,
  fieldPrefix: string,
): Promise<{ entry_id: string | null; plot_id: string | null }> {
  if (plotId) {
    const plot = await repo.plotInTrial(db, trialId, plotId);
    if (!plot) {
      throw new AppError('validation_failed', 'That plot is not part of this trial.', {
        fields: [
          { path: `${fieldPrefix}.plotId`, message: 'That plot is not part of this trial.' },
        ],
      });
    }
    if (entryId && entryId !== plot.entry_id) {
      const message = 'The plot holds a different entry; choose the plot’s own entry or no entry.';
      throw new AppError('validation_failed', message, {
        fields: [{ path: `${fieldPrefix}.entryId`, message }],
      });
    }
    return { entry_id: plot.entry_id, plot_id: plot.id };
  }
  if (entryId) {
    if (!(await repo.entryInTrial(db, trialId, entryId))) {
      throw new AppError('validation_failed', 'That entry is not part of this trial.', {
        fields: [
          { path: `${fieldPrefix}.entryId`, message: 'That entry is not part of this trial.' },
        ],
      });
    }
    return { entry_id: entryId, plot_id: null };
  }
  return { entry_id: null, plot_id: null };
}

export interface UploadedFile {
  buffer: Buffer;
  originalname: string;
}

/** Rolls back the insert of an upload whose id another attempt has used meanwhile. */
class UploadStoredMeanwhile extends Error {}

/**
 * Processes every file first, then writes the files and the rows; any failure removes what was
 * written, so a failed upload leaves neither orphan files nor rows.
 */
export async function uploadPhotos(
  deps: PhotoDeps,
  loaded: LoadedTrial,
  actor: Actor,
  slug: string,
  files: UploadedFile[],
  fields: z.output<typeof uploadPhotoFields>,
): Promise<{ photos: Photo[]; created: boolean }> {
  const { db, storage } = deps;
  const limits = deps.limits ?? defaultPhotoLimits;
  if (files.length === 0) {
    throw new AppError('validation_failed', 'Choose a photo to upload.', {
      fields: [{ path: 'body.photo', message: 'Choose a photo to upload.' }],
    });
  }
  /** The new photos as answered, in the order they were sent. */
  const answerOf = async (ids: string[]) => {
    const rows = new Map(
      (await repo.findPhotos(db, loaded.trial.id, ids)).map((row) => [row.id, row]),
    );
    return ids.flatMap((id) => {
      const row = rows.get(id);
      return row ? [toPhoto(slug, actor, loaded, row)] : [];
    });
  };
  /** The photos an earlier attempt of this upload stored, or null when there was none. */
  const earlier = async () => {
    if (!fields.uploadId) return null;
    const made = await repo.photosOfUpload(db, fields.uploadId);
    if (made.length === 0) return null;
    if (made.some((p) => p.trial_id !== loaded.trial.id || p.created_by !== actor.userId))
      throw new AppError('conflict', 'This upload id is already used by another upload.', {
        fields: [{ path: 'body.uploadId', message: 'Make a new id for a new upload.' }],
      });
    return made.map((row) => toPhoto(slug, actor, loaded, row));
  };
  // A retry is answered before its photos are processed again.
  const before = await earlier();
  if (before) return { photos: before, created: false };
  const tags = await resolveTags(db, loaded.trial.id, fields.entryId, fields.plotId, 'body');
  const processed: { file: UploadedFile; photo: ProcessedPhoto }[] = [];
  for (const file of files) {
    try {
      processed.push({ file, photo: await processPhoto(file.buffer, limits) });
    } catch (err) {
      if (err instanceof AppError && files.length > 1) {
        throw new AppError(err.code, `${file.originalname}: ${err.message}`, err.details);
      }
      throw err;
    }
  }

  const written: string[] = [];
  try {
    const rows: Insertable<PhotosTable>[] = [];
    for (const [index, { photo }] of processed.entries()) {
      const storageKey = `photos/${loaded.trial.id}/${crypto.randomBytes(16).toString('hex')}`;
      const keyRow = { storage_key: storageKey, original_ext: photo.original.ext };
      for (const [variant, out] of [
        ['thumb', photo.thumb],
        ['display', photo.display],
        ['original', photo.original],
      ] as const) {
        const key = variantKey(keyRow, variant);
        written.push(key);
        await storage.put(key, out.buffer, out.contentType);
      }
      rows.push({
        trial_id: loaded.trial.id,
        ...tags,
        // The device sends its own calendar day; only a client too old to send it gets ours.
        taken_on: fields.takenOn ?? photo.capturedOn ?? fields.today ?? localToday(),
        captured_at: photo.capturedAt,
        caption: fields.caption,
        subject: fields.subject ?? null,
        storage_key: storageKey,
        mime_type: photo.original.contentType as PhotosTable['mime_type'],
        original_ext: photo.original.ext,
        sha256: photo.sha256,
        width: photo.original.width,
        height: photo.original.height,
        bytes: photo.original.buffer.length,
        display_width: photo.display.width,
        display_height: photo.display.height,
        display_bytes: photo.display.buffer.length,
        thumb_width: photo.thumb.width,
        thumb_height: photo.thumb.height,
        thumb_bytes: photo.thumb.buffer.length,
        created_by: actor.userId,
        updated_by: actor.userId,
        upload_id: fields.uploadId ?? null,
        upload_index: fields.uploadId ? index : null,
      });
    }
    const ids = await db.transaction().execute(async (trx) => {
      const inserted = await repo.insertPhotos(trx, rows);
      // Another attempt of the same upload stored its photos first: keep those, not these.
      if (inserted.length < rows.length) throw new UploadStoredMeanwhile();
      return inserted.map((r) => r.id);
    });
    return { photos: await answerOf(ids), created: true };
  } catch (err) {
    await Promise.allSettled(written.map((key) => storage.delete(key)));
    if (err instanceof UploadStoredMeanwhile) {
      const meanwhile = await earlier();
      if (meanwhile) return { photos: meanwhile, created: false };
    }
    throw err;
  }
}

async function editablePhoto(
  deps: PhotoDeps,
  slug: string,
  actor: Actor | null,
  photoId: string,
  { allowDeleted = false } = {},
) {
  const loaded = await trialForAction(deps.db, slug, actor, 'trial.read');
  const row = await repo.findPhoto(deps.db, loaded.trial.id, photoId);
  if (!row || row.purged_at || (row.deleted_at && !allowDeleted))
    throw AppError.notFound('The photo');
  if (!canEdit(actor, loaded, row)) {
    throw new AppError(
      'forbidden',
      'Only the person who uploaded this photo and the trial lead can change it.',
    );
  }
  // canEdit holds only for someone signed in.
  return { loaded, row, editor: actor! };
}

export async function updatePhoto(
  deps: PhotoDeps,
  slug: string,
  actor: Actor | null,
  photoId: string,
  body: UpdatePhotoBody,
): Promise<Photo> {
  const { loaded, row, editor } = await editablePhoto(deps, slug, actor, photoId);
  const entryId =
    body.entryId === undefined && body.plotId === undefined ? row.entry_id : body.entryId;
  const plotId =
    body.plotId === undefined ? (body.entryId === undefined ? row.plot_id : null) : body.plotId;
  const tags =
    body.entryId === undefined && body.plotId === undefined
      ? { entry_id: row.entry_id, plot_id: row.plot_id }
      : await resolveTags(deps.db, loaded.trial.id, entryId, plotId, 'body');
  await deps.db.transaction().execute(async (trx) => {
    const locked = await repo.lockPhoto(trx, loaded.trial.id, photoId);
    if (!locked || locked.deleted_at) throw AppError.notFound('The photo');
    await repo.updatePhoto(trx, photoId, {
      ...(body.caption !== undefined ? { caption: body.caption } : {}),
      ...(body.takenOn !== undefined ? { taken_on: body.takenOn } : {}),
      ...(body.subject !== undefined ? { subject: body.subject } : {}),
      ...tags,
      // A cover belongs to its entry; moving the photo to another entry gives up the cover.
      ...(locked.is_cover && tags.entry_id !== locked.entry_id ? { is_cover: false } : {}),
      updated_by: editor.userId,
    });
  });
  const fresh = await repo.findPhoto(deps.db, loaded.trial.id, photoId);
  return toPhoto(slug, actor, loaded, fresh!);
}

export async function deletePhoto(
  deps: PhotoDeps,
  slug: string,
  actor: Actor | null,
  photoId: string,
) {
  const { loaded, editor } = await editablePhoto(deps, slug, actor, photoId);
  const purgeAfter = new Date(Date.now() + PHOTO_UNDO_WINDOW_MS);
  await deps.db.transaction().execute(async (trx) => {
    const locked = await repo.lockPhoto(trx, loaded.trial.id, photoId);
    if (!locked || locked.deleted_at) throw AppError.notFound('The photo');
    await repo.markDeleted(trx, photoId, editor.userId, purgeAfter);
  });
  const fresh = await repo.findPhoto(deps.db, loaded.trial.id, photoId);
  return { photo: toPhoto(slug, actor, loaded, fresh!), undoUntil: purgeAfter.toISOString() };
}

export async function restorePhoto(
  deps: PhotoDeps,
  slug: string,
  actor: Actor | null,
  photoId: string,
) {
  const { loaded, editor } = await editablePhoto(deps, slug, actor, photoId, {
    allowDeleted: true,
  });
  await deps.db.transaction().execute(async (trx) => {
    const locked = await repo.lockPhoto(trx, loaded.trial.id, photoId);
    if (!locked || locked.purged_at) throw AppError.notFound('The photo');
    if (!locked.deleted_at) return;
    if (locked.purge_after && locked.purge_after <= new Date()) {
      throw new AppError('conflict', 'The deletion is final: the undo window has passed.');
    }
    await repo.markRestored(trx, photoId, editor.userId);
  });
  const fresh = await repo.findPhoto(deps.db, loaded.trial.id, photoId);
  return toPhoto(slug, actor, loaded, fresh!);
}

/** The lead's choice of one photo per entry for the results sheet. */
export async function setCover(
  deps: PhotoDeps,
  slug: string,
  actor: Actor | null,
  photoId: string,
  cover: boolean,
): Promise<Photo> {
  const loaded = await trialForAction(deps.db, slug, actor, 'trial.read');
  if (!isLead(actor, loaded)) {
    throw new AppError('forbidden', 'Only the trial lead chooses the cover photos.');
  }
  await deps.db.transaction().execute(async (trx) => {
    const locked = await repo.lockPhoto(trx, loaded.trial.id, photoId);
    if (!locked || locked.deleted_at) throw AppError.notFound('The photo');
    if (cover && !locked.entry_id) {
      throw new AppError(
        'validation_failed',
        'Tag the photo with an entry before making it the entry’s cover.',
        {
          fields: [{ path: 'body.entryId', message: 'The photo has no entry.' }],
        },
      );
    }
    if (cover) {
      await repo.clearEntryCover(trx, locked.entry_id!, actor!.userId);
      await repo.updatePhoto(trx, photoId, { is_cover: true, updated_by: actor!.userId });
    } else if (locked.is_cover) {
      await repo.updatePhoto(trx, photoId, { is_cover: false, updated_by: actor!.userId });
    }
  });
  const fresh = await repo.findPhoto(deps.db, loaded.trial.id, photoId);
  return toPhoto(slug, actor, loaded, fresh!);
}

export interface ServedFile {
  file: StoredObject;
  etag: string;
  cacheControl: string;
  filename: string;
}

/**
 * One stored size of a photo, with the trial's permissions: members read thumbnails and the
 * display size; the original only its uploader and the lead; a published trial's cover photos
 * anyone. Everyone else is told the photo does not exist or must sign in, as for the trial.
 */
export async function photoFile(
  deps: PhotoDeps,
  slug: string,
  actor: Actor | null,
  photoId: string,
  variant: PhotoVariant,
): Promise<ServedFile> {
  const trial = await deps.db
    .selectFrom('trials')
    .select(['id', 'status'])
    .where('slug', '=', slug)
    .executeTakeFirst();
  let loaded: LoadedTrial | null = null;
  let publicRow: PhotoRow | undefined;
  if (trial && trial.status === 'published' && variant !== 'original') {
    publicRow = await repo.findPhoto(deps.db, trial.id, photoId);
    if (publicRow && !isPhotoPublic(trial, publicRow)) publicRow = undefined;
  }
  if (!publicRow) loaded = await trialForAction(deps.db, slug, actor, 'trial.read');
  const row = publicRow ?? (await repo.findPhoto(deps.db, loaded!.trial.id, photoId));
  if (!row || row.deleted_at) throw AppError.notFound('The photo');
  if (variant === 'original' && !canSeeOriginal(actor, loaded!, row)) {
    throw new AppError(
      'forbidden',
      'The full-size original is for its uploader and the trial lead.',
    );
  }
  const file = await deps.storage.get(variantKey(row, variant));
  if (!file) throw AppError.notFound('The photo file');
  return {
    file,
    etag: `"${(row.sha256 ?? row.id).slice(0, 20)}-${variant}"`,
    // A photo's files never change once written: cache them for good, privately for members.
    cacheControl: publicRow ? 'public, max-age=86400' : 'private, max-age=31536000, immutable',
    filename: `photo-${row.id}-${variant}.${variant === 'original' ? row.original_ext : 'webp'}`,
  };
}

/**
 * Makes deletions final: removes the files of photos deleted longer ago than the undo window,
 * then marks them purged. Safe to run on several servers at once (deleting twice is harmless).
 */
export async function purgeDeletedPhotos(
  deps: Pick<PhotoDeps, 'db' | 'storage'>,
  now = new Date(),
  batch = 100,
): Promise<number> {
  const due = await repo.photosDueForPurge(deps.db, now, batch);
  let purged = 0;
  for (const row of due) {
    for (const key of allVariantKeys(row)) await deps.storage.delete(key);
    await repo.markPurged(deps.db, row.id);
    purged += 1;
  }
  return purged;
}
