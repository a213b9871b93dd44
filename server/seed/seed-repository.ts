import { sql, type Insertable, type Updateable } from 'kysely';
import type { DB } from '../../db/database';
import type { SeedLotsTable } from '../../db/schema';

/** A register variety by its address, with its group's name. */
export function findVariety(db: DB, slug: string) {
  return db
    .selectFrom('varieties as v')
    .innerJoin('groups as g', 'g.id', 'v.group_id')
    .select(['v.id', 'v.slug', 'v.name', 'v.crop', 'v.group_id', 'g.name as group_name'])
    .where('v.slug', '=', slug)
    .executeTakeFirst();
}

export function groupSettings(db: DB, groupId: string) {
  return db
    .selectFrom('groups')
    .select(['id', 'name', 'germination_threshold_percent', 'seed_requests_open'])
    .where('id', '=', groupId)
    .executeTakeFirstOrThrow();
}

export function updateGroupSettings(
  db: DB,
  groupId: string,
  values: { germination_threshold_percent?: number; seed_requests_open?: boolean; by: string },
) {
  const { by, ...set } = values;
  return db
    .updateTable('groups')
    .set({ ...set, updated_by: by })
    .where('id', '=', groupId)
    .execute();
}

/** A variety's lots, newest harvest first. */
export function lotsOfVariety(db: DB, varietyId: string) {
  return db
    .selectFrom('seed_lots')
    .selectAll()
    .where('variety_id', '=', varietyId)
    .orderBy(sql`harvest_year desc nulls last`)
    .orderBy('label')
    .execute();
}

/** Germination tests of these lots, newest first. */
export function testsOfLots(db: DB, lotIds: string[]) {
  if (lotIds.length === 0) return Promise.resolve([]);
  return db
    .selectFrom('germination_tests')
    .selectAll()
    .where('lot_id', 'in', lotIds)
    .orderBy('tested_on', 'desc')
    .orderBy('created_at', 'desc')
    .execute();
}

/**
 * Trial entries sown from these lots with their plots' stand counts, oldest season first. With
 * a reader, only trials they may read (a member of the trial, or the trial is published).
 */
export function sownFromLots(db: DB, lotIds: string[], readerId: string | null | 'all') {
  if (lotIds.length === 0) return Promise.resolve([]);
  let q = db
    .selectFrom('entries as e')
    .innerJoin('trials as t', 't.id', 'e.trial_id')
    .leftJoin('plots as p', 'p.entry_id', 'e.id')
    .leftJoin('sites as s', 's.id', 'p.site_id')
    .select([
      'e.lot_id',
      'e.id as entry_id',
      'e.name as entry_name',
      't.slug as trial_slug',
      't.title as trial_title',
      't.season',
      't.sowing_date',
      's.name as site',
      'p.plot_number',
      'p.plants_set',
      'p.plants_surviving',
    ])
    .where('e.lot_id', 'in', lotIds)
    .orderBy('t.season')
    .orderBy('t.sowing_date')
    .orderBy('t.title')
    .orderBy('s.name')
    .orderBy('p.plot_number');
  if (readerId !== 'all')
    q = q.where((eb) =>
      eb.or([
        eb('t.status', '=', 'published'),
        ...(readerId === null
          ? []
          : [
              eb.exists(
                eb
                  .selectFrom('trial_members as m')
                  .select('m.user_id')
                  .whereRef('m.trial_id', '=', 't.id')
                  .where('m.user_id', '=', readerId),
              ),
            ]),
      ]),
    );
  return q.execute();
}

export function insertLot(db: DB, values: Insertable<SeedLotsTable>) {
  return db.insertInto('seed_lots').values(values).returning('id').executeTakeFirstOrThrow();
}

export function updateLot(db: DB, id: string, values: Updateable<SeedLotsTable>) {
  return db.updateTable('seed_lots').set(values).where('id', '=', id).execute();
}

/** A lot with the group whose register holds its variety. */
export function findLot(db: DB, lotId: string) {
  return db
    .selectFrom('seed_lots as l')
    .innerJoin('varieties as v', 'v.id', 'l.variety_id')
    .selectAll('l')
    .select(['v.group_id', 'v.slug as variety_slug'])
    .where('l.id', '=', lotId)
    .executeTakeFirst();
}

export function insertTest(
  db: DB,
  values: {
    lot_id: string;
    tested_on: string;
    seeds_tested: number;
    seeds_germinated: number;
    days: number;
    notes: string;
    created_by: string;
  },
) {
  return db
    .insertInto('germination_tests')
    .values(values)
    .returning('id')
    .executeTakeFirstOrThrow();
}

export function deleteTest(db: DB, lotId: string, testId: string) {
  return db
    .deleteFrom('germination_tests')
    .where('id', '=', testId)
    .where('lot_id', '=', lotId)
    .executeTakeFirst();
}

/** A trial's entries with their variety and the lot each was sown from. */
export function entriesWithLots(db: DB, trialId: string) {
  return db
    .selectFrom('entries as e')
    .leftJoin('varieties as v', 'v.id', 'e.variety_id')
    .select([
      'e.id',
      'e.name',
      'e.code',
      'e.lot_id',
      'e.variety_id',
      'v.slug as variety_slug',
      'v.name as variety_name',
    ])
    .where('e.trial_id', '=', trialId)
    .orderBy('e.code')
    .orderBy('e.name')
    .execute();
}

export function lotsOfVarieties(db: DB, varietyIds: string[]) {
  if (varietyIds.length === 0) return Promise.resolve([]);
  return db
    .selectFrom('seed_lots')
    .select(['id', 'variety_id', 'label', 'harvest_year'])
    .where('variety_id', 'in', varietyIds)
    .orderBy(sql`harvest_year desc nulls last`)
    .orderBy('label')
    .execute();
}

export function setEntryLot(db: DB, trialId: string, entryId: string, lotId: string | null) {
  return db
    .updateTable('entries')
    .set({ lot_id: lotId })
    .where('id', '=', entryId)
    .where('trial_id', '=', trialId)
    .executeTakeFirst();
}

export function findEntry(db: DB, trialId: string, entryId: string) {
  return db
    .selectFrom('entries')
    .select(['id', 'variety_id'])
    .where('id', '=', entryId)
    .where('trial_id', '=', trialId)
    .executeTakeFirst();
}

/* ---------- Offers and requests ---------- */

const offerColumns = [
  'o.id',
  'o.variety_id',
  'o.lot_id',
  'o.packets_offered',
  'o.packets_left',
  'o.note',
  'o.status',
  'o.created_at',
  'l.label as lot_label',
  'l.harvest_year as lot_harvest_year',
] as const;

/** A variety's offers, the open one first, then newest first. */
export function offersOfVariety(db: DB, varietyId: string) {
  return db
    .selectFrom('seed_offers as o')
    .innerJoin('seed_lots as l', 'l.id', 'o.lot_id')
    .select(offerColumns)
    .where('o.variety_id', '=', varietyId)
    .orderBy(sql`o.status = 'open' desc`)
    .orderBy('o.created_at', 'desc')
    .execute();
}

export function insertOffer(
  db: DB,
  values: { variety_id: string; lot_id: string; packets: number; note: string; by: string },
) {
  return db
    .insertInto('seed_offers')
    .values({
      variety_id: values.variety_id,
      lot_id: values.lot_id,
      packets_offered: values.packets,
      packets_left: values.packets,
      note: values.note,
      created_by: values.by,
      updated_by: values.by,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
}

/** An offer with its variety, lot and group. */
export function findOffer(db: DB, offerId: string) {
  return db
    .selectFrom('seed_offers as o')
    .innerJoin('seed_lots as l', 'l.id', 'o.lot_id')
    .innerJoin('varieties as v', 'v.id', 'o.variety_id')
    .innerJoin('groups as g', 'g.id', 'v.group_id')
    .select(offerColumns)
    .select([
      'v.slug as variety_slug',
      'v.name as variety_name',
      'v.crop',
      'g.id as group_id',
      'g.name as group_name',
      'g.seed_requests_open',
    ])
    .where('o.id', '=', offerId)
    .executeTakeFirst();
}

/** The group's coordinators, who answer its seed requests, with their addresses. */
export function groupCoordinators(db: DB, groupId: string) {
  return db
    .selectFrom('group_members as m')
    .innerJoin('users as u', 'u.id', 'm.user_id')
    .select(['u.id', 'u.name', 'u.email'])
    .where('m.group_id', '=', groupId)
    .where('m.role', '=', 'coordinator')
    .orderBy('u.name')
    .execute();
}

export function userName(db: DB, userId: string) {
  return db.selectFrom('users').select('name').where('id', '=', userId).executeTakeFirstOrThrow();
}

export function closeOffer(db: DB, offerId: string, by: string) {
  return db
    .updateTable('seed_offers')
    .set({ status: 'closed', updated_by: by })
    .where('id', '=', offerId)
    .execute();
}

/** Takes one packet from an open offer with packets left; undefined when there is none. */
export function takePacket(db: DB, offerId: string) {
  return db
    .updateTable('seed_offers')
    .set((eb) => ({ packets_left: eb('packets_left', '-', 1) }))
    .where('id', '=', offerId)
    .where('status', '=', 'open')
    .where('packets_left', '>', 0)
    .returning('packets_left')
    .executeTakeFirst();
}

/** A declined request's packet goes back to the offer. */
export function returnPacket(db: DB, offerId: string) {
  return db
    .updateTable('seed_offers')
    .set((eb) => ({ packets_left: eb('packets_left', '+', 1) }))
    .where('id', '=', offerId)
    .whereRef('packets_left', '<', 'packets_offered')
    .execute();
}

/** Open offers of the varieties a trial's entries grow. */
export function openOffersOfTrial(db: DB, trialId: string) {
  return db
    .selectFrom('entries as e')
    .innerJoin('seed_offers as o', 'o.variety_id', 'e.variety_id')
    .innerJoin('varieties as v', 'v.id', 'e.variety_id')
    .select(['o.id', 'v.name as variety_name', 'e.name as entry_name', 'o.packets_left'])
    .where('e.trial_id', '=', trialId)
    .where('o.status', '=', 'open')
    .orderBy('e.name')
    .execute();
}

export function insertRequest(
  db: DB,
  values: { offer_id: string; requester_id: string; ship_to: string; message: string },
) {
  return db.insertInto('seed_requests').values(values).returning('id').executeTakeFirstOrThrow();
}

export function myRequest(db: DB, offerId: string, userId: string) {
  return db
    .selectFrom('seed_requests')
    .select(['status', 'created_at', 'answer'])
    .where('offer_id', '=', offerId)
    .where('requester_id', '=', userId)
    .executeTakeFirst();
}

export function requestsOfOffer(db: DB, offerId: string) {
  return db
    .selectFrom('seed_requests as r')
    .innerJoin('users as u', 'u.id', 'r.requester_id')
    .select([
      'r.id',
      'r.ship_to',
      'r.message',
      'r.status',
      'r.answer',
      'r.created_at',
      'r.answered_at',
      'u.name',
      'u.email',
    ])
    .where('r.offer_id', '=', offerId)
    .orderBy(sql`r.status = 'requested' desc`)
    .orderBy('r.created_at')
    .execute();
}

/** A request with its offer's variety and group and the requester's address, locked for the answer. */
export function findRequestForUpdate(db: DB, requestId: string) {
  return db
    .selectFrom('seed_requests as r')
    .innerJoin('seed_offers as o', 'o.id', 'r.offer_id')
    .innerJoin('varieties as v', 'v.id', 'o.variety_id')
    .innerJoin('groups as g', 'g.id', 'v.group_id')
    .innerJoin('users as u', 'u.id', 'r.requester_id')
    .select([
      'r.id',
      'r.offer_id',
      'r.status',
      'v.name as variety_name',
      'g.id as group_id',
      'g.name as group_name',
      'u.name as requester_name',
      'u.email as requester_email',
    ])
    .where('r.id', '=', requestId)
    .forUpdate('r')
    .executeTakeFirst();
}

export function answerRequest(
  db: DB,
  requestId: string,
  values: { status: 'sent' | 'declined'; answer: string; by: string },
) {
  return db
    .updateTable('seed_requests')
    .set({
      status: values.status,
      answer: values.answer,
      answered_by: values.by,
      answered_at: new Date(),
    })
    .where('id', '=', requestId)
    .execute();
}

export function emailVerified(db: DB, userId: string) {
  return db
    .selectFrom('users')
    .select('email_verified')
    .where('id', '=', userId)
    .executeTakeFirst()
    .then((u) => u?.email_verified ?? false);
}
