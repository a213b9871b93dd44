/**
 * A group's seed: lots and germination tests (coordinators write, members read), which lot each
 * trial entry was sown from, and offers of packets that members ask for and coordinators answer
 * (by mail). Every check goes through the group's entry points: `groupForAction` refuses,
 * `groupStanding` tells a page what to show.
 */
import type { z } from 'zod';
import { utcDateOf } from '../../common/calendar-date';
import { germinationRate } from '../../common/germination';
import { type Actor, canRequestSeed } from '../../common/policy';
import type {
  answerSeedRequestBody,
  createLotBody,
  createOfferBody,
  EntryLots,
  germinationTestBody,
  Offer,
  seedRequestBody,
  SeedRequestList,
  seedSettingsBody,
  setEntryLotBody,
  TrialOffers,
  updateLotBody,
  VarietySeed,
} from '../../common/contracts/seed';
import { seedsCountMessage, seedsCountWhole } from '../../common/contracts/seed';
import { lotWarnings, standPercent } from '../../common/seed-lots';
import type { DB } from '../../db/database';
import type { AppDeps } from '../app-deps';
import { AppError, fieldError } from '../lib/app-error';
import { composeMail } from '../mail/mailer';
import { groupForAction, groupStanding, trialForAction } from '../trials/trials-service';
import * as repo from './seed-repository';

type Out<T extends z.ZodType> = z.output<T>;
export type SeedDeps = Pick<AppDeps, 'db' | 'mail' | 'baseUrl'>;

const signedIn = (actor: Actor | null): Actor => {
  if (!actor) throw new AppError('unauthenticated', 'Sign in to do this.');
  return actor;
};

/** The work, with a clash on one unique constraint turned into the refusal given. */
async function unlessTaken<T>(work: Promise<T>, constraint: string, refusal: AppError): Promise<T> {
  try {
    return await work;
  } catch (err) {
    const e = err as { code?: string; constraint?: string };
    if (e.code === '23505' && e.constraint === constraint) throw refusal;
    throw err;
  }
}

const labelTaken = () => {
  const message = 'This variety already has a lot with this label.';
  return new AppError('conflict', message, { fields: [{ path: 'body.label', message }] });
};

/** A variety by its address and the caller's standing in its group (outsiders: 404). */
async function varietyFor(
  db: DB,
  actor: Actor | null,
  slug: string,
  action: 'seed.read' | 'seed.edit',
) {
  const variety = await repo.findVariety(db, slug);
  if (!variety) throw AppError.notFound('The variety');
  const { allows } = await groupForAction(db, variety.group_id, actor, action);
  return { variety, allows };
}

/** A lot and the caller's standing in its variety's group. */
async function lotFor(db: DB, actor: Actor | null, lotId: string, action: 'seed.edit') {
  const lot = await repo.findLot(db, lotId);
  if (!lot) throw AppError.notFound('The seed lot');
  await groupForAction(db, lot.group_id, actor, action);
  return lot;
}

const rateOf = (t: { seeds_germinated: number; seeds_tested: number }) =>
  germinationRate(t.seeds_germinated, t.seeds_tested);

export async function varietySeed(
  db: DB,
  actor: Actor | null,
  slug: string,
  today = utcDateOf(new Date()),
): Promise<VarietySeed> {
  const { variety, allows } = await varietyFor(db, actor, slug, 'seed.read');
  const canEdit = allows('seed.edit');
  // Read together: only the lots' tests and sowings wait for the lots.
  const [settings, lots, offers] = await Promise.all([
    repo.groupSettings(db, variety.group_id),
    repo.lotsOfVariety(db, variety.id),
    repo.offersOfVariety(db, variety.id),
  ]);
  const lotIds = lots.map((l) => l.id);
  const [tests, sown] = await Promise.all([
    repo.testsOfLots(db, lotIds),
    // Coordinators follow every trial of their group; a member sees the trials they may read.
    repo.sownFromLots(db, lotIds, canEdit ? 'all' : actor!.userId),
  ]);
  return {
    variety: { slug: variety.slug, name: variety.name, crop: variety.crop },
    group: { id: variety.group_id, name: variety.group_name },
    canEdit,
    settings: {
      germinationThresholdPercent: settings.germination_threshold_percent,
      requestsOpen: settings.seed_requests_open,
    },
    lots: lots.map((l) => {
      const lotTests = tests
        .filter((t) => t.lot_id === l.id)
        .map((t) => ({
          id: t.id,
          testedOn: t.tested_on,
          seedsTested: t.seeds_tested,
          seedsGerminated: t.seeds_germinated,
          days: t.days,
          notes: t.notes,
          ...rateOf(t),
        }));
      const entries = new Map<string, VarietySeed['lots'][number]['sown'][number]>();
      for (const r of sown.filter((s) => s.lot_id === l.id)) {
        let e = entries.get(r.entry_id);
        if (!e) {
          e = {
            trialSlug: r.trial_slug,
            trialTitle: r.trial_title,
            season: r.season,
            sowingDate: r.sowing_date,
            entryName: r.entry_name,
            plots: [],
            standPercent: null,
          };
          entries.set(r.entry_id, e);
        }
        if (r.plot_number !== null)
          e.plots.push({
            site: r.site ?? '',
            plotNumber: r.plot_number,
            plantsSet: r.plants_set,
            plantsSurviving: r.plants_surviving,
          });
      }
      for (const e of entries.values()) e.standPercent = standPercent(e.plots);
      return {
        id: l.id,
        label: l.label,
        source: l.source,
        harvestYear: l.harvest_year,
        amount: l.amount,
        amountUnit: l.amount_unit,
        storagePlace: l.storage_place,
        notes: l.notes,
        tests: lotTests,
        warnings: lotWarnings(lotTests, settings.germination_threshold_percent, today),
        sown: [...entries.values()],
      };
    }),
    offers: offers.map((o) => ({
      id: o.id,
      lotId: o.lot_id,
      lotLabel: o.lot_label,
      packetsOffered: o.packets_offered,
      packetsLeft: o.packets_left,
      note: o.note,
      status: o.status,
      createdAt: o.created_at.toISOString(),
    })),
  };
}

export async function createLot(
  db: DB,
  actor: Actor | null,
  slug: string,
  b: Out<typeof createLotBody>,
): Promise<{ id: string }> {
  const { variety } = await varietyFor(db, actor, slug, 'seed.edit');
  return unlessTaken(
    repo.insertLot(db, {
      variety_id: variety.id,
      label: b.label,
      source: b.source,
      harvest_year: b.harvestYear,
      amount: b.amount,
      amount_unit: b.amountUnit,
      storage_place: b.storagePlace,
      notes: b.notes,
      created_by: actor!.userId,
      updated_by: actor!.userId,
    }),
    'seed_lots_variety_id_label_key',
    labelTaken(),
  );
}

export async function updateLot(
  db: DB,
  actor: Actor | null,
  lotId: string,
  b: Out<typeof updateLotBody>,
): Promise<void> {
  const lot = await lotFor(db, actor, lotId, 'seed.edit');
  const unit = b.amountUnit ?? lot.amount_unit;
  const amount = b.amount === undefined ? lot.amount : b.amount;
  if (!seedsCountWhole({ amountUnit: unit, amount }))
    throw fieldError('body.amount', seedsCountMessage.message);
  await unlessTaken(
    repo.updateLot(db, lot.id, {
      label: b.label,
      source: b.source,
      harvest_year: b.harvestYear,
      amount: b.amount,
      amount_unit: b.amountUnit,
      storage_place: b.storagePlace,
      notes: b.notes,
      updated_by: actor!.userId,
    }),
    'seed_lots_variety_id_label_key',
    labelTaken(),
  );
}

export async function addTest(
  db: DB,
  actor: Actor | null,
  lotId: string,
  b: Out<typeof germinationTestBody>,
): Promise<{ id: string }> {
  const lot = await lotFor(db, actor, lotId, 'seed.edit');
  // A test is read on the day it ends: the device may be a day ahead of UTC, never more.
  if (b.testedOn > utcDateOf(new Date(Date.now() + 86_400_000)))
    throw fieldError('body.testedOn', 'A germination test cannot be dated in the future.');
  return repo.insertTest(db, {
    lot_id: lot.id,
    tested_on: b.testedOn,
    seeds_tested: b.seedsTested,
    seeds_germinated: b.seedsGerminated,
    days: b.days,
    notes: b.notes,
    created_by: actor!.userId,
  });
}

export async function deleteTest(
  db: DB,
  actor: Actor | null,
  lotId: string,
  testId: string,
): Promise<void> {
  await lotFor(db, actor, lotId, 'seed.edit');
  const done = await repo.deleteTest(db, lotId, testId);
  if (!done.numDeletedRows) throw AppError.notFound('The germination test');
}

export async function updateSettings(
  db: DB,
  actor: Actor | null,
  groupId: string,
  b: Out<typeof seedSettingsBody>,
): Promise<void> {
  await groupForAction(db, groupId, actor, 'seed.edit');
  await repo.updateGroupSettings(db, groupId, {
    germination_threshold_percent: b.germinationThresholdPercent,
    seed_requests_open: b.requestsOpen,
    by: actor!.userId,
  });
}

/* ---------- Which lot each entry was sown from ---------- */

export async function entryLots(db: DB, actor: Actor | null, slug: string): Promise<EntryLots> {
  const { trial, access } = await trialForAction(db, slug, actor, 'trial.read');
  const entries = await repo.entriesWithLots(db, trial.id);
  // The lots to choose from are the group's seed records: its people see them.
  const seesLots = (await groupStanding(db, trial.group_id, actor)).allows('seed.read');
  const lots = seesLots
    ? await repo.lotsOfVarieties(db, [
        ...new Set(entries.flatMap((e) => (e.variety_id ? [e.variety_id] : []))),
      ])
    : [];
  return {
    canEdit: actor?.isAdmin === true || access.role === 'lead',
    entries: entries.map((e) => ({
      entryId: e.id,
      entryName: e.name,
      entryCode: e.code,
      variety: e.variety_slug ? { slug: e.variety_slug, name: e.variety_name! } : null,
      lotId: e.lot_id,
      lots: lots
        .filter((l) => l.variety_id === e.variety_id)
        .map((l) => ({ id: l.id, label: l.label, harvestYear: l.harvest_year })),
    })),
  };
}

export async function setEntryLot(
  db: DB,
  actor: Actor | null,
  slug: string,
  entryId: string,
  b: Out<typeof setEntryLotBody>,
): Promise<void> {
  const { trial } = await trialForAction(db, slug, actor, 'trial.edit');
  const entry = await repo.findEntry(db, trial.id, entryId);
  if (!entry) throw AppError.notFound('The entry');
  if (b.lotId !== null) {
    const lot = await repo.findLot(db, b.lotId);
    if (!lot || lot.variety_id !== entry.variety_id)
      throw fieldError('body.lotId', 'Choose one of this entry’s variety’s lots.');
  }
  await repo.setEntryLot(db, trial.id, entry.id, b.lotId);
}

/* ---------- Offers ---------- */

export async function createOffer(
  db: DB,
  actor: Actor | null,
  slug: string,
  b: Out<typeof createOfferBody>,
): Promise<{ id: string }> {
  const { variety } = await varietyFor(db, actor, slug, 'seed.edit');
  const lot = await repo.findLot(db, b.lotId);
  if (!lot || lot.variety_id !== variety.id)
    throw fieldError('body.lotId', 'Choose one of this variety’s lots.');
  return unlessTaken(
    repo.insertOffer(db, {
      variety_id: variety.id,
      lot_id: lot.id,
      packets: b.packets,
      note: b.note,
      by: actor!.userId,
    }),
    'seed_offers_one_open',
    new AppError('conflict', 'This variety already has an open offer: close it first.'),
  );
}

/** An offer as a coordinator manages it (outsiders: 404, members: 403). */
async function offerToManage(db: DB, actor: Actor | null, offerId: string) {
  const offer = await repo.findOffer(db, offerId);
  if (!offer) throw AppError.notFound('The offer');
  await groupForAction(db, offer.group_id, actor, 'seed.edit');
  return offer;
}

export async function closeOffer(db: DB, actor: Actor | null, offerId: string): Promise<void> {
  await offerToManage(db, actor, offerId);
  await repo.closeOffer(db, offerId, actor!.userId);
}

/** Why someone signed in may not ask for a packet: who the group offers its seed to. */
const whoMayRequest = (offer: { seed_requests_open: boolean; group_name: string }) =>
  offer.seed_requests_open
    ? 'Confirm your e-mail address to ask for a packet.'
    : `This seed is offered to members of ${offer.group_name}.`;

/**
 * An offer's page: an open offer is public (a published sheet links to it); a closed one only
 * for the group's people.
 */
export async function offerView(db: DB, actor: Actor | null, offerId: string): Promise<Offer> {
  const offer = await repo.findOffer(db, offerId);
  if (!offer) throw AppError.notFound('The offer');
  const { role, allows } = await groupStanding(db, offer.group_id, actor);
  if (offer.status !== 'open' && !allows('seed.read')) throw AppError.notFound('The offer');
  const verified = actor ? await repo.emailVerified(db, actor.userId) : false;
  const allowed = canRequestSeed(actor, role, { requestsOpen: offer.seed_requests_open }, verified);
  const mine = actor ? await repo.myRequest(db, offer.id, actor.userId) : undefined;
  const [last] = await repo.testsOfLots(db, [offer.lot_id]);
  const whyNot = !actor
    ? 'Sign in to ask for a packet.'
    : !allowed
      ? whoMayRequest(offer)
      : mine
        ? 'You have asked for a packet of this offer.'
        : offer.status !== 'open'
          ? 'This offer is closed.'
          : offer.packets_left === 0
            ? 'No packets are left.'
            : null;
  return {
    id: offer.id,
    variety: { slug: offer.variety_slug, name: offer.variety_name, crop: offer.crop },
    group: { name: offer.group_name },
    lot: {
      label: offer.lot_label,
      harvestYear: offer.lot_harvest_year,
      lastTest: last ? { testedOn: last.tested_on, ...rateOf(last) } : null,
    },
    packetsOffered: offer.packets_offered,
    packetsLeft: offer.packets_left,
    note: offer.note,
    status: offer.status,
    canRequest: whyNot === null,
    whyNot,
    canManage: allows('seed.edit'),
    myRequest: mine
      ? { status: mine.status, createdAt: mine.created_at.toISOString(), answer: mine.answer }
      : null,
  };
}

/** Open offers of the varieties a trial grew, for its published sheet (or its members). */
export async function trialOffers(db: DB, actor: Actor | null, slug: string): Promise<TrialOffers> {
  const { trial } = await trialForAction(db, slug, actor, 'results.read');
  return { offers: await openOffersOf(db, trial.id) };
}

/** The open offers of a trial the caller has already read as readable (e.g. as published). */
export async function openOffersOf(db: DB, trialId: string): Promise<TrialOffers['offers']> {
  const rows = await repo.openOffersOfTrial(db, trialId);
  return rows.map((r) => ({
    id: r.id,
    varietyName: r.variety_name,
    entryName: r.entry_name,
    packetsLeft: r.packets_left,
  }));
}

/**
 * Takes a packet for the caller and tells the group's coordinators by mail. The mail is queued
 * in the same transaction and sent by the queue's worker, so a relay that is down delays the
 * letters but never loses or refuses the request.
 */
export async function requestPacket(
  deps: SeedDeps,
  actor: Actor | null,
  offerId: string,
  b: Out<typeof seedRequestBody>,
): Promise<{ id: string }> {
  const { db } = deps;
  const me = signedIn(actor);
  const offer = await repo.findOffer(db, offerId);
  if (!offer) throw AppError.notFound('The offer');
  const { role } = await groupStanding(db, offer.group_id, me);
  const verified = await repo.emailVerified(db, me.userId);
  if (!canRequestSeed(me, role, { requestsOpen: offer.seed_requests_open }, verified)) {
    if (offer.status !== 'open') throw AppError.notFound('The offer');
    throw new AppError('forbidden', whoMayRequest(offer));
  }
  return db.transaction().execute(async (trx) => {
    // Taking the packet first locks the offer's row, so two last requests cannot both get it.
    const taken = await repo.takePacket(trx, offer.id);
    if (!taken)
      throw new AppError(
        'conflict',
        offer.status === 'open' ? 'No packets are left of this offer.' : 'This offer is closed.',
      );
    const created = await unlessTaken(
      repo.insertRequest(trx, {
        offer_id: offer.id,
        requester_id: me.userId,
        ship_to: b.shipTo,
        message: b.message,
      }),
      'seed_requests_offer_id_requester_id_key',
      new AppError('conflict', 'You have already asked for a packet of this offer.'),
    );
    await tellCoordinators(deps, trx, offer, me.userId, b, taken.packets_left);
    return created;
  });
}

/** One letter to each coordinator of the offer's group (not to one who asked for the packet). */
async function tellCoordinators(
  deps: SeedDeps,
  trx: DB,
  offer: NonNullable<Awaited<ReturnType<typeof repo.findOffer>>>,
  requesterId: string,
  b: Out<typeof seedRequestBody>,
  packetsLeft: number,
) {
  const [coordinators, requester] = await Promise.all([
    repo.groupCoordinators(trx, offer.group_id),
    repo.userName(trx, requesterId),
  ]);
  for (const c of coordinators.filter((x) => x.id !== requesterId)) {
    await deps.mail.enqueue(
      trx,
      composeMail({
        to: c.email,
        subject: `${requester.name} asks for a packet of ${offer.variety_name} seed`,
        lines: [
          `Hello ${c.name},`,
          `${requester.name} has asked ${offer.group_name} for a packet of ${offer.variety_name} seed (lot ${offer.lot_label}). ${packetsLeft === 1 ? '1 packet is' : `${packetsLeft} packets are`} left of this offer.`,
          ...(b.message ? [`Their note: ${b.message}`] : []),
          // The postal address stays in Rowtally, where only the group's coordinators see it.
          'Where to send it is on the request list, where you mark the packet sent or declined.',
        ],
        action: {
          label: 'Answer the request',
          url: `${deps.baseUrl}/varieties/${offer.variety_slug}/seed`,
        },
      }),
      { kind: 'seed_request_received' },
    );
  }
}

export async function offerRequests(
  db: DB,
  actor: Actor | null,
  offerId: string,
): Promise<SeedRequestList> {
  await offerToManage(db, actor, offerId);
  const rows = await repo.requestsOfOffer(db, offerId);
  return {
    requests: rows.map((r) => ({
      id: r.id,
      requester: { name: r.name, email: r.email },
      shipTo: r.ship_to,
      message: r.message,
      status: r.status,
      answer: r.answer,
      createdAt: r.created_at.toISOString(),
      answeredAt: r.answered_at ? new Date(r.answered_at).toISOString() : null,
    })),
  };
}

/** Sent or declined, told to the requester by mail in the same transaction. */
export async function answerRequest(
  deps: SeedDeps,
  actor: Actor | null,
  requestId: string,
  b: Out<typeof answerSeedRequestBody>,
): Promise<void> {
  await deps.db.transaction().execute(async (trx) => {
    const r = await repo.findRequestForUpdate(trx, requestId);
    if (!r) throw AppError.notFound('The request');
    await groupForAction(trx, r.group_id, actor, 'seed.edit');
    if (r.status !== 'requested')
      throw new AppError('conflict', 'This request has already been answered.');
    await repo.answerRequest(trx, r.id, { status: b.status, answer: b.answer, by: actor!.userId });
    if (b.status === 'declined') await repo.returnPacket(trx, r.offer_id);
    const lines = [
      `Hello ${r.requester_name},`,
      b.status === 'sent'
        ? `${r.group_name} has sent you a packet of ${r.variety_name} seed.`
        : `${r.group_name} cannot send you a packet of ${r.variety_name} seed this time.`,
      ...(b.answer ? [`Their note: ${b.answer}`] : []),
    ];
    await deps.mail.enqueue(
      trx,
      composeMail({
        to: r.requester_email,
        subject:
          b.status === 'sent'
            ? `Your ${r.variety_name} seed is on its way`
            : `Your request for ${r.variety_name} seed`,
        lines,
        action: { label: 'See the offer', url: `${deps.baseUrl}/offers/${r.offer_id}` },
      }),
      { kind: 'seed_request_answer' },
    );
  });
}
