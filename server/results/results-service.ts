import crypto from 'node:crypto';
import zlib from 'node:zlib';
import sharp from 'sharp';
import type { Actor } from '../../common/policy';
import {
  type ResultSnapshot,
  resultSnapshotSchema,
  type SaveSheetBody,
  type SheetDraft,
  type PublishedSheetList,
  type PublishedSheetsQuery,
} from '../../common/contracts/results';
import { modelsForDesign } from '../../common/contracts/analysis';
import { designLabels } from '../../common/contracts/trials';
import type { DB } from '../../db/database';
import type { Trial } from '../../db/schema';
import { AppError } from '../lib/app-error';
import type { MailQueue } from '../mail/mail-queue';
import { composeMail } from '../mail/mailer';
import { trialFactor, trialForAction } from '../trials/trials-service';
import { variantKey } from '../photos/photos-service';
import type { ObjectStorage } from '../storage/object-storage';
import { hashToken, newToken } from './follower-tokens';
import * as repo from './results-repository';
import { buildSnapshot, defaultSheet, generatedMethods } from './snapshot';

export interface ResultsDeps {
  db: DB;
  mail: MailQueue;
  baseUrl: string;
}

/** The lead's saved sheet, or the default one for a trial that has none yet. */
async function currentSheet(db: DB, trial: Trial): Promise<SaveSheetBody> {
  const row = await repo.findSheet(db, trial.id);
  if (!row) return defaultSheet(db, trial);
  return {
    summary: row.summary,
    methods: row.methods,
    traits: row.traits as SaveSheetBody['traits'],
    entryNotes: row.entry_notes as SaveSheetBody['entryNotes'],
    coverPhotos: row.cover_photos as SaveSheetBody['coverPhotos'],
    alpha: row.alpha,
    letters: row.letters,
    model: row.model,
    license: row.license as SaveSheetBody['license'],
  };
}

/** The newest published version's number, 0 when nothing is published. */
export function latestPublishedVersion(db: DB, trialId: string) {
  return repo.latestVersionNumber(db, trialId);
}

/** Gives a trial copied for next season this trial's sheet settings (see the repository). */
export function copySheetSettings(db: DB, fromTrialId: string, toTrialId: string, by: string) {
  return repo.copySheetSettings(db, fromTrialId, toTrialId, by);
}

export async function getDraft(
  deps: ResultsDeps,
  slug: string,
  actor: Actor | null,
): Promise<SheetDraft> {
  const { trial } = await trialForAction(deps.db, slug, actor, 'trial.publish');
  const sheet = await currentSheet(deps.db, trial);
  const latest = await repo.latestVersionNumber(deps.db, trial.id);
  return {
    ...sheet,
    generatedMethods: await generatedMethods(deps.db, trial, sheet),
    publishedVersion: latest || null,
    isPublic: trial.status === 'published',
  };
}

export async function saveDraft(
  deps: ResultsDeps,
  slug: string,
  actor: Actor | null,
  body: SaveSheetBody,
) {
  const { trial } = await trialForAction(deps.db, slug, actor, 'trial.publish');
  await assertSheetRefersToTrial(deps.db, trial, body);
  await repo.upsertSheet(deps.db, trial.id, body, actor!.userId);
  return getDraft(deps, slug, actor);
}

async function assertSheetRefersToTrial(db: DB, trial: Trial, body: SaveSheetBody) {
  const [traits, entries, photos] = await Promise.all([
    db.selectFrom('traits').select('key').where('trial_id', '=', trial.id).execute(),
    db.selectFrom('entries').select('id').where('trial_id', '=', trial.id).execute(),
    db
      .selectFrom('photos')
      .select(['id', 'entry_id'])
      .where('trial_id', '=', trial.id)
      .where('deleted_at', 'is', null)
      .execute(),
  ]);
  const traitKeys = new Set(traits.map((t) => t.key));
  const entryIds = new Set(entries.map((e) => e.id));
  const fields: { path: string; message: string }[] = [];
  const factor = trialFactor(trial);
  if (
    body.model &&
    !modelsForDesign(trial.design, factor !== null, factor?.arrangement === 'split_plot').includes(
      body.model,
    )
  )
    fields.push({
      path: 'body.model',
      message: factor
        ? 'A factorial in blocks is analysed by the classical analysis of variance only (the mixed model is offered for split plots).'
        : `A ${designLabels[trial.design].toLowerCase()} trial is analysed by the classical analysis of variance only.`,
    });
  body.traits.forEach((t, i) => {
    if (!traitKeys.has(t.key))
      fields.push({ path: `body.traits.${i}.key`, message: `The trial has no trait "${t.key}".` });
  });
  if (new Set(body.traits.map((t) => t.key)).size !== body.traits.length) {
    fields.push({ path: 'body.traits', message: 'Each trait may appear once.' });
  }
  for (const id of Object.keys(body.entryNotes)) {
    if (!entryIds.has(id))
      fields.push({ path: `body.entryNotes.${id}`, message: 'Not an entry of this trial.' });
  }
  const photoEntry = new Map(photos.map((p) => [p.id, p.entry_id]));
  for (const [entryId, photoId] of Object.entries(body.coverPhotos)) {
    if (!entryIds.has(entryId))
      fields.push({ path: `body.coverPhotos.${entryId}`, message: 'Not an entry of this trial.' });
    else if (photoEntry.get(photoId) !== entryId)
      fields.push({
        path: `body.coverPhotos.${entryId}`,
        message: "That photo is not one of this entry's photos.",
      });
  }
  if (fields.length) throw new AppError('validation_failed', fields[0]!.message, { fields });
}

export async function preview(
  deps: ResultsDeps,
  slug: string,
  actor: Actor | null,
): Promise<ResultSnapshot> {
  const { trial } = await trialForAction(deps.db, slug, actor, 'trial.publish');
  const sheet = await currentSheet(deps.db, trial);
  const next = (await repo.latestVersionNumber(deps.db, trial.id)) + 1;
  return buildSnapshot(deps.db, trial, sheet, {
    version: next,
    changeNote: '',
    publishedAt: new Date().toISOString(),
  });
}

/**
 * Freezes a new version. The number is taken under a lock on the trial row so two publishes
 * at once cannot both become "version 2".
 */
export async function publish(
  deps: ResultsDeps,
  slug: string,
  actor: Actor | null,
  changeNote: string,
) {
  const { trial } = await trialForAction(deps.db, slug, actor, 'trial.publish');
  const published = await deps.db.transaction().execute(async (trx) => {
    await trx
      .selectFrom('trials')
      .select('id')
      .where('id', '=', trial.id)
      .forUpdate()
      .executeTakeFirstOrThrow();
    const version = (await repo.latestVersionNumber(trx, trial.id)) + 1;
    if (version > 1 && !changeNote) {
      throw new AppError('validation_failed', 'Say what changed since the last version.', {
        fields: [{ path: 'body.changeNote', message: 'Say what changed since the last version.' }],
      });
    }
    const sheet = await currentSheet(trx, trial);
    const snapshot = await buildSnapshot(trx, trial, sheet, {
      version,
      changeNote,
      publishedAt: new Date().toISOString(),
    });
    const row = await repo.insertVersion(trx, {
      trialId: trial.id,
      version,
      changeNote,
      snapshot,
      userId: actor!.userId,
    });
    await repo.setTrialStatus(trx, trial.id, 'published', actor!.userId);
    // Queued with the version: a notice goes out exactly when the version exists.
    await notifyFollowers(deps, trx, trial, row.version, changeNote);
    return { version: row.version, snapshot };
  });
  return { version: published.version, url: `${deps.baseUrl}/r/${trial.slug}` };
}

export async function unpublish(deps: ResultsDeps, slug: string, actor: Actor | null) {
  const { trial } = await trialForAction(deps.db, slug, actor, 'trial.publish');
  if (trial.status !== 'published')
    throw new AppError('conflict', 'The results sheet is not published.');
  await repo.setTrialStatus(deps.db, trial.id, 'closed', actor!.userId);
}

/** The public side: a published trial's versions. Unpublished (or never published) is 404. */
export async function publishedTrial(db: DB, slug: string): Promise<Trial> {
  // Read as nobody: only a published sheet is open to anyone, and anything else is 404.
  const { trial } = await trialForAction(db, slug, null, 'results.read').catch((err: unknown) => {
    if (err instanceof AppError) throw AppError.notFound('The results sheet');
    throw err;
  });
  return trial;
}

/**
 * A published version as it is sent: the checked snapshot, its JSON text, the same as UTF-8
 * bytes and gzip-compressed once, and a strong ETag for each of the two encodings.
 */
export interface FrozenVersion {
  snapshot: ResultSnapshot;
  json: string;
  body: Buffer;
  gzip: Buffer;
  etag: string;
  gzipEtag: string;
}

/**
 * Published versions never change once written, so each is checked once per process and kept
 * (the most recent few hundred). The key holds the version's row identity and publication time,
 * so a republished or deleted trial can never be answered from it; whether the trial is still
 * published is asked of the database on every request.
 *
 * Versions published before snapshots named each entry's register variety lack `varietySlug`.
 * Their stored rows stay as published (a trigger keeps them from changing, and readers must see
 * exactly the numbers that were published); the link to a variety's page is a way to get there,
 * not a published figure, so it is filled in on every read from the entry's register link, the
 * same link the variety's page reads to list that trial, and an entry relinked since is followed
 * at once. Each set of links is serialised and compressed once (`served`), so its bytes and ETag
 * (and the page drawn from it, see sheet-page.ts) are those of the links it carries. Newer
 * versions keep the slug from publishing and are served from memory alone.
 */
interface StoredVersion {
  key: string;
  /** As stored and checked; never changed (the served copies are built beside it). */
  snapshot: ResultSnapshot;
  /** Whether some entry lacks the variety link, so it is read from the register on each request. */
  unlinked: boolean;
  /** The version as served, by the links filled in ('' when none are). */
  served: Map<string, FrozenVersion>;
}
const frozenVersions = new Map<string, StoredVersion>();
const FROZEN_VERSIONS_KEPT = 200;
/** Sets of links kept per version: a relink replaces the set, so a few cover any churn. */
const LINK_SETS_KEPT = 4;

/**
 * A published sheet's version for anyone: one query for the stamp, the rest from memory (a
 * version lacking variety links asks one more, for its entries' links).
 */
export async function frozenVersion(
  db: DB,
  slug: string,
  version?: number,
): Promise<FrozenVersion> {
  const stamp = await repo.publishedVersionStamp(db, slug, version);
  if (!stamp) throw AppError.notFound('The results sheet');
  if (stamp.version === null || stamp.published_at === null)
    throw AppError.notFound(`Version ${version ?? 1} of the results sheet`);
  return frozenFromStamp(db, stamp.trial_id, {
    version: stamp.version,
    published_at: stamp.published_at,
  });
}

/** The same for a trial already read as published (see `publishedTrial`). */
export async function frozenVersionOf(
  db: DB,
  trial: Trial,
  version?: number,
): Promise<FrozenVersion> {
  const meta = await repo.versionStamp(db, trial.id, version);
  if (!meta) throw AppError.notFound(`Version ${version ?? 1} of the results sheet`);
  return frozenFromStamp(db, trial.id, meta);
}

async function frozenFromStamp(
  db: DB,
  trialId: string,
  meta: { version: number; published_at: Date },
): Promise<FrozenVersion> {
  const stored = await storedVersion(db, trialId, meta);
  const links = stored.unlinked ? await entryVarietyLinks(db, trialId) : null;
  const snapshot = links ? withVarietyLinks(stored.snapshot, links) : stored.snapshot;
  const linksKey = links ? JSON.stringify(snapshot.entries.map((e) => e.varietySlug ?? null)) : '';
  const kept = stored.served.get(linksKey);
  if (kept) return kept;
  const json = JSON.stringify(snapshot);
  const tag = crypto
    .createHash('sha256')
    .update(stored.key)
    .update(json)
    .digest('base64url')
    .slice(0, 27);
  const body = Buffer.from(json, 'utf8');
  const frozen: FrozenVersion = {
    snapshot,
    json,
    body,
    gzip: zlib.gzipSync(body, { level: zlib.constants.Z_BEST_COMPRESSION }),
    etag: `"${tag}"`,
    gzipEtag: `"${tag}-gz"`,
  };
  if (stored.served.size >= LINK_SETS_KEPT) stored.served.clear();
  stored.served.set(linksKey, frozen);
  return frozen;
}

/** The version as stored, read and checked once per process (see `frozenVersions`). */
async function storedVersion(
  db: DB,
  trialId: string,
  meta: { version: number; published_at: Date },
): Promise<StoredVersion> {
  const key = `${trialId}:${meta.version}:${meta.published_at.getTime()}`;
  const kept = frozenVersions.get(key);
  if (kept) return kept;
  const row = await repo.findVersion(db, trialId, meta.version);
  if (!row) throw AppError.notFound(`Version ${meta.version} of the results sheet`);
  const parsed = resultSnapshotSchema.safeParse(row.snapshot);
  if (!parsed.success)
    throw new AppError('internal', 'This version of the results sheet could not be read.');
  const stored: StoredVersion = {
    key,
    snapshot: parsed.data,
    unlinked: parsed.data.entries.some((e) => e.varietySlug === undefined),
    served: new Map(),
  };
  if (frozenVersions.size >= FROZEN_VERSIONS_KEPT)
    frozenVersions.delete(frozenVersions.keys().next().value!);
  frozenVersions.set(key, stored);
  return stored;
}

/** Entry id → the slug of the register variety it is linked to now (null: none). */
async function entryVarietyLinks(db: DB, trialId: string): Promise<Map<string, string | null>> {
  return new Map((await repo.entryVarietySlugs(db, trialId)).map((r) => [r.id, r.slug ?? null]));
}

/** A copy of the version with each entry that lacks a variety link given its register link. */
function withVarietyLinks(
  snapshot: ResultSnapshot,
  links: ReadonlyMap<string, string | null>,
): ResultSnapshot {
  return {
    ...snapshot,
    entries: snapshot.entries.map((e) =>
      e.varietySlug === undefined ? { ...e, varietySlug: links.get(e.id) ?? null } : e,
    ),
  };
}

export async function publicVersion(
  db: DB,
  slug: string,
  version?: number,
): Promise<ResultSnapshot> {
  return (await frozenVersion(db, slug, version)).snapshot;
}

export async function publicVersions(db: DB, slug: string) {
  const trial = await publishedTrial(db, slug);
  const rows = await repo.listVersions(db, trial.id);
  return {
    title: trial.title,
    versions: rows.map((r) => ({
      version: r.version,
      publishedAt: r.published_at.toISOString(),
      changeNote: r.change_note,
    })),
  };
}

/* Followers: double opt-in, one-click unsubscribe. */

/**
 * Limits on asking to follow (common practice, no source): anyone may ask, so the form must not
 * become a way to mail strangers. Per caller address: a few requests an hour. Per recipient:
 * one pending confirmation per trial per hour, and a few confirmations a day in all.
 */
export const followLimits = {
  requestsPerAddressPerHour: 10,
  confirmationsPerRecipientPerDay: 3,
  pendingConfirmationMs: 60 * 60 * 1000,
} as const;
const HOUR_MS = 60 * 60 * 1000;
const DAY_MS = 24 * HOUR_MS;

/**
 * Asks `email` to confirm following the trial. The caller always gets the same neutral answer
 * (whether the address already follows, has a confirmation pending, or has had its share of
 * mail today), except when the caller's own address is over its limit.
 */
export async function follow(deps: ResultsDeps, slug: string, email: string, clientIp: string) {
  const trial = await publishedTrial(deps.db, slug);
  const confirm = newToken();
  const now = Date.now();
  const outcome = await deps.db.transaction().execute(async (trx) => {
    await repo.lockFollowRequests(trx, clientIp, email);
    const fromCaller = await repo.followRequestsFrom(trx, clientIp, new Date(now - HOUR_MS));
    if (fromCaller.count >= followLimits.requestsPerAddressPerHour) {
      const freesAt = (fromCaller.first?.getTime() ?? now) + HOUR_MS;
      return { retryAfterSeconds: Math.max(1, Math.ceil((freesAt - now) / 1000)) } as const;
    }
    await repo.forgetFollowRequestsBefore(trx, new Date(now - DAY_MS));
    const existing = await repo.findFollower(trx, trial.id, email);
    const mayMail =
      !(existing?.confirmed_at && !existing.unsubscribed_at) &&
      (await repo.confirmationsSentTo(
        trx,
        email,
        new Date(now - followLimits.pendingConfirmationMs),
        trial.id,
      )) === 0 &&
      (await repo.confirmationsSentTo(trx, email, new Date(now - DAY_MS))) <
        followLimits.confirmationsPerRecipientPerDay;
    await repo.recordFollowRequest(trx, { trialId: trial.id, email, clientIp, mailed: mayMail });
    if (!mayMail) return { mail: false } as const;
    if (existing) {
      await trx
        .updateTable('result_followers')
        .set({ confirm_token_hash: confirm.hash, confirmed_at: null, unsubscribed_at: null })
        .where('id', '=', existing.id)
        .execute();
    } else {
      await trx
        .insertInto('result_followers')
        .values({
          trial_id: trial.id,
          email,
          confirm_token_hash: confirm.hash,
          unsubscribe_token: newToken().token,
        })
        .execute();
    }
    await deps.mail.enqueue(
      trx,
      composeMail({
        to: email,
        subject: `Confirm: follow the results of ${trial.title}`,
        lines: [
          `Someone (we hope you) asked to be told by e-mail when new results of "${trial.title}" are published on Rowtally.`,
          'Nothing will be sent until you confirm. If it was not you, ignore this message.',
        ],
        action: {
          label: 'Confirm and follow',
          url: `${deps.baseUrl}/r/${trial.slug}/follow?token=${confirm.token}`,
        },
      }),
      { kind: 'follow_confirmation', trialId: trial.id },
    );
    return { mail: true } as const;
  });
  if ('retryAfterSeconds' in outcome) {
    throw new AppError('rate_limited', 'Too many requests to follow from here. Try again later.', {
      retryAfterSeconds: outcome.retryAfterSeconds,
    });
  }
}

export async function confirmFollow(db: DB, token: string) {
  const row = await db
    .updateTable('result_followers')
    .set({ confirmed_at: new Date() })
    .where('confirm_token_hash', '=', hashToken(token))
    .where('unsubscribed_at', 'is', null)
    .returning(['trial_id', 'email'])
    .executeTakeFirst();
  if (!row)
    throw new AppError(
      'not_found',
      'This confirmation link is not valid any more. Ask for a new one from the results page.',
    );
  const trial = await db
    .selectFrom('trials')
    .select(['title', 'slug'])
    .where('id', '=', row.trial_id)
    .executeTakeFirstOrThrow();
  return { title: trial.title, slug: trial.slug, email: row.email };
}

export async function unsubscribe(db: DB, token: string) {
  const row = await db
    .updateTable('result_followers')
    .set({ unsubscribed_at: new Date() })
    .where('unsubscribe_token', '=', token)
    .returning(['trial_id', 'email'])
    .executeTakeFirst();
  if (!row) throw new AppError('not_found', 'This unsubscribe link is not valid.');
  const trial = await db
    .selectFrom('trials')
    .select(['title', 'slug'])
    .where('id', '=', row.trial_id)
    .executeTakeFirstOrThrow();
  return { title: trial.title, slug: trial.slug, email: row.email };
}

async function notifyFollowers(
  deps: ResultsDeps,
  trx: DB,
  trial: Trial,
  version: number,
  changeNote: string,
) {
  const followers = await repo.confirmedFollowers(trx, trial.id);
  for (const f of followers) {
    const unsubscribeUrl = `${deps.baseUrl}/api/results/unsubscribe?token=${f.unsubscribe_token}`;
    const unsubscribePage = `${deps.baseUrl}/unsubscribe?token=${f.unsubscribe_token}`;
    const mail = composeMail({
      to: f.email,
      subject:
        version === 1
          ? `Results published: ${trial.title}`
          : `Results updated (version ${version}): ${trial.title}`,
      lines: [
        version === 1
          ? `The results of "${trial.title}" are published.`
          : `Version ${version} of the results of "${trial.title}" is published.`,
        ...(changeNote ? [`What changed: ${changeNote}`] : []),
        `To stop these messages, open: ${unsubscribePage}`,
      ],
      action: { label: 'Read the results', url: `${deps.baseUrl}/r/${trial.slug}/v/${version}` },
    });
    // One-click unsubscribe in mail clients that offer it (RFC 8058).
    const withHeaders = {
      ...mail,
      headers: {
        'List-Unsubscribe': `<${unsubscribeUrl}>`,
        'List-Unsubscribe-Post': 'List-Unsubscribe=One-Click',
      },
    };
    await deps.mail.enqueue(trx, withHeaders, { kind: 'publish_notice', trialId: trial.id });
  }
}

/**
 * A photo that a published version shows: readable by anyone while the sheet is public, because
 * the version itself names it (later cover changes do not break earlier versions).
 */
export async function publishedPhoto(
  db: DB,
  storage: ObjectStorage,
  params: { slug: string; version: number; photoId: string; variant: 'thumb' | 'display' },
) {
  const snapshot = await publicVersion(db, params.slug, params.version);
  return photoOfSnapshot(db, storage, snapshot, params.photoId, params.variant);
}

async function photoOfSnapshot(
  db: DB,
  storage: ObjectStorage,
  snapshot: ResultSnapshot,
  photoId: string,
  variant: 'thumb' | 'display',
) {
  if (!snapshot.entries.some((e) => e.photo?.id === photoId)) throw AppError.notFound('The photo');
  const row = await db
    .selectFrom('photos')
    .select(['id', 'storage_key', 'original_ext', 'sha256'])
    .where('id', '=', photoId)
    .executeTakeFirst();
  const file = row ? await storage.get(variantKey(row, variant)) : null;
  if (!row || !file) throw AppError.notFound('The photo file');
  return { file, etag: `${(row.sha256 ?? row.id).slice(0, 20)}-${variant}` };
}

/** The version's photos as JPEG, for the PDF (which cannot embed WebP). Missing files are skipped. */
export async function sheetPhotosForPdf(db: DB, storage: ObjectStorage, snapshot: ResultSnapshot) {
  const out: { entry: string; caption: string; jpeg: Buffer }[] = [];
  for (const e of snapshot.entries) {
    if (!e.photo) continue;
    try {
      const photo = await photoOfSnapshot(db, storage, snapshot, e.photo.id, 'display');
      const chunks: Buffer[] = [];
      for await (const c of photo.file.body) chunks.push(c as Buffer);
      const jpeg = await sharp(Buffer.concat(chunks))
        .resize({ width: 640, withoutEnlargement: true })
        .jpeg({ quality: 80 })
        .toBuffer();
      out.push({ entry: e.name, caption: e.photo.caption, jpeg });
    } catch (err) {
      if (!(err instanceof AppError && err.code === 'not_found')) throw err;
    }
  }
  return out;
}

/** The public index: anyone may list what is published. */
export async function publishedSheets(
  db: DB,
  query: PublishedSheetsQuery,
): Promise<PublishedSheetList> {
  const { rows, total } = await repo.listPublishedSheets(db, query.q, query.page, query.pageSize);
  return {
    sheets: rows.map((r) => ({
      slug: r.slug,
      title: r.title,
      crop: r.crop,
      season: r.season,
      version: r.version,
      publishedAt: new Date(r.published_at).toISOString(),
      entryCount: r.entryCount,
    })),
    page: query.page,
    pageSize: query.pageSize,
    total,
  };
}
