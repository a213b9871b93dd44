import { sql } from 'kysely';
import type { DB } from '../../db/database';
import type { ResultSnapshot, SaveSheetBody } from '../../common/contracts/results';

export function findSheet(db: DB, trialId: string) {
  return db
    .selectFrom('results_sheets')
    .selectAll()
    .where('trial_id', '=', trialId)
    .executeTakeFirst();
}

export async function upsertSheet(db: DB, trialId: string, body: SaveSheetBody, userId: string) {
  const values = {
    summary: body.summary,
    methods: body.methods,
    traits: JSON.stringify(body.traits),
    entry_notes: JSON.stringify(body.entryNotes),
    cover_photos: JSON.stringify(body.coverPhotos),
    alpha: body.alpha,
    letters: body.letters,
    model: body.model,
    license: body.license,
    updated_by: userId,
  };
  await db
    .insertInto('results_sheets')
    .values({ trial_id: trialId, ...values, created_by: userId })
    .onConflict((oc) => oc.column('trial_id').doUpdateSet(values))
    .execute();
}

/**
 * Next season's trial starts with this one's sheet settings: the traits shown (with basis,
 * weight and order), alpha, the letters method, the model and the licence. The summary, methods, entry
 * notes and cover photos speak of this season's results and stay behind. Trait keys carry over
 * with the traits, so the choice still names the copy's own traits.
 */
export async function copySheetSettings(
  db: DB,
  fromTrialId: string,
  toTrialId: string,
  by: string,
) {
  const from = await findSheet(db, fromTrialId);
  if (!from) return;
  await db
    .insertInto('results_sheets')
    .values({
      trial_id: toTrialId,
      traits: JSON.stringify(from.traits),
      alpha: from.alpha,
      letters: from.letters,
      model: from.model,
      license: from.license,
      methods: null,
      created_by: by,
      updated_by: by,
    })
    .execute();
}

export async function latestVersionNumber(db: DB, trialId: string): Promise<number> {
  const row = await db
    .selectFrom('result_versions')
    .select(sql<number>`coalesce(max(version), 0)::int`.as('v'))
    .where('trial_id', '=', trialId)
    .executeTakeFirstOrThrow();
  return row.v;
}

export function insertVersion(
  db: DB,
  row: {
    trialId: string;
    version: number;
    changeNote: string;
    snapshot: ResultSnapshot;
    userId: string;
  },
) {
  return db
    .insertInto('result_versions')
    .values({
      trial_id: row.trialId,
      version: row.version,
      change_note: row.changeNote,
      snapshot: JSON.stringify(row.snapshot),
      published_by: row.userId,
    })
    .returning(['id', 'version', 'published_at'])
    .executeTakeFirstOrThrow();
}

/** The number and publication time of one version, or of the latest when none is named. */
export function versionStamp(db: DB, trialId: string, version?: number) {
  let q = db
    .selectFrom('result_versions')
    .select(['version', 'published_at'])
    .where('trial_id', '=', trialId);
  if (version !== undefined) q = q.where('version', '=', version);
  return q.orderBy('version', 'desc').limit(1).executeTakeFirst();
}

/**
 * The stamp of a published trial's version (the newest when none is named), read as nobody:
 * no row when the trial is not published; a row with a null version when it has no such one.
 */
export function publishedVersionStamp(db: DB, slug: string, version?: number) {
  return db
    .selectFrom('trials as t')
    .leftJoin('result_versions as v', (join) => {
      const on = join.onRef('v.trial_id', '=', 't.id');
      return version === undefined ? on : on.on('v.version', '=', version);
    })
    .select(['t.id as trial_id', 'v.version', 'v.published_at'])
    .where('t.slug', '=', slug)
    .where('t.status', '=', 'published')
    .orderBy('v.version', (o) => o.desc().nullsLast())
    .limit(1)
    .executeTakeFirst();
}

export function findVersion(db: DB, trialId: string, version: number) {
  return db
    .selectFrom('result_versions')
    .select(['version', 'snapshot', 'published_at', 'change_note'])
    .where('trial_id', '=', trialId)
    .where('version', '=', version)
    .executeTakeFirst();
}

/** Each entry of a trial with the slug of the register variety it is linked to (null: none). */
export function entryVarietySlugs(db: DB, trialId: string) {
  return db
    .selectFrom('entries as e')
    .leftJoin('varieties as v', 'v.id', 'e.variety_id')
    .select(['e.id', 'v.slug'])
    .where('e.trial_id', '=', trialId)
    .execute();
}

export function listVersions(db: DB, trialId: string) {
  return db
    .selectFrom('result_versions')
    .select(['version', 'published_at', 'change_note'])
    .where('trial_id', '=', trialId)
    .orderBy('version', 'desc')
    .execute();
}

export function setTrialStatus(
  db: DB,
  trialId: string,
  status: 'published' | 'closed',
  userId: string,
) {
  return db
    .updateTable('trials')
    .set({ status, updated_by: userId })
    .where('id', '=', trialId)
    .execute();
}

export function findFollower(db: DB, trialId: string, email: string) {
  return db
    .selectFrom('result_followers')
    .selectAll()
    .where('trial_id', '=', trialId)
    .where('email', '=', email)
    .executeTakeFirst();
}

export function confirmedFollowers(db: DB, trialId: string) {
  return db
    .selectFrom('result_followers')
    .select(['id', 'email', 'unsubscribe_token'])
    .where('trial_id', '=', trialId)
    .where('confirmed_at', 'is not', null)
    .where('unsubscribed_at', 'is', null)
    .execute();
}

/* Requests to follow: counted for the limits, kept for a day. */

/** Serializes follow requests that share a caller address or a recipient, until commit. */
export async function lockFollowRequests(trx: DB, clientIp: string, email: string) {
  // Always in this order, so two requests cannot wait on each other.
  for (const key of [`follow-ip:${clientIp}`, `follow-to:${email}`])
    await sql`select pg_advisory_xact_lock(hashtextextended(${key}, 0))`.execute(trx);
}

/** How many follow requests came from this address since `since`, and when the first did. */
export async function followRequestsFrom(db: DB, clientIp: string, since: Date) {
  const row = await db
    .selectFrom('follow_requests')
    .select((eb) => [eb.fn.countAll<number>().as('count'), eb.fn.min('requested_at').as('first')])
    .where('client_ip', '=', clientIp)
    .where('requested_at', '>', since)
    .executeTakeFirstOrThrow();
  return { count: Number(row.count), first: row.first as Date | null };
}

/** Confirmation mails sent to this address since `since`, for one trial or for all. */
export async function confirmationsSentTo(
  db: DB,
  email: string,
  since: Date,
  trialId?: string,
): Promise<number> {
  let query = db
    .selectFrom('follow_requests')
    .select((eb) => eb.fn.countAll<number>().as('count'))
    .where('email', '=', email)
    .where('mailed', '=', true)
    .where('requested_at', '>', since);
  if (trialId) query = query.where('trial_id', '=', trialId);
  return Number((await query.executeTakeFirstOrThrow()).count);
}

export function recordFollowRequest(
  db: DB,
  values: { trialId: string; email: string; clientIp: string; mailed: boolean },
) {
  return db
    .insertInto('follow_requests')
    .values({
      trial_id: values.trialId,
      email: values.email,
      client_ip: values.clientIp,
      mailed: values.mailed,
    })
    .execute();
}

export function forgetFollowRequestsBefore(db: DB, before: Date) {
  return db.deleteFrom('follow_requests').where('requested_at', '<', before).execute();
}

/** `%` and `_` typed by a reader are letters, not wildcards. */
const likePattern = (text: string) => `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

/**
 * Published trials whose crop, title or one of whose entries' variety names contains `q`
 * (case-insensitive), newest latest version first, one page of them and the count of all.
 */
export async function listPublishedSheets(db: DB, q: string, page: number, pageSize: number) {
  const latest = db
    .selectFrom('result_versions')
    .select(['trial_id', sql<number>`max(version)::int`.as('version')])
    .select(sql<Date>`max(published_at)`.as('published_at'))
    .groupBy('trial_id')
    .as('v');
  const base = db
    .selectFrom('trials as t')
    .innerJoin(latest, 'v.trial_id', 't.id')
    .where('t.status', '=', 'published')
    .$if(q !== '', (qb) =>
      qb.where((eb) =>
        eb.or([
          eb('t.crop', 'ilike', likePattern(q)),
          eb('t.title', 'ilike', likePattern(q)),
          eb.exists(
            eb
              .selectFrom('entries as e')
              .select('e.id')
              .whereRef('e.trial_id', '=', 't.id')
              .where('e.name', 'ilike', likePattern(q)),
          ),
        ]),
      ),
    );
  const [rows, count] = await Promise.all([
    base
      .select([
        't.slug',
        't.title',
        't.crop',
        't.season',
        'v.version',
        'v.published_at',
        sql<number>`(select count(*)::int from entries e where e.trial_id = t.id)`.as('entryCount'),
      ])
      .orderBy('v.published_at', 'desc')
      .orderBy('t.slug')
      .limit(pageSize)
      .offset((page - 1) * pageSize)
      .execute(),
    base.select(sql<number>`count(*)::int`.as('n')).executeTakeFirstOrThrow(),
  ]);
  return { rows, total: count.n };
}
