/**
 * Seed lots, germination tests, offers and requests. The world's group coordinator (in no
 * trial) keeps the seed; the trial's people are group members who read lots and ask for
 * packets; the outsider is in neither (the group keeps its offers to members). An open offer's
 * page is public, as a published sheet links to it.
 */
import type { Caller, MatrixRow } from './matrix-types';
import { coordinatorOnly, leadOnly, memberRead } from './matrix-types';
import type { MatrixWorld } from './matrix-world';

const everyone = (ok: number): Record<Caller, number> => ({
  anonymous: ok,
  viewer: ok,
  contributor: ok,
  growerInSite: ok,
  growerOtherSite: ok,
  lead: ok,
  admin: ok,
});

let made = 0;
const variety = (w: MatrixWorld) =>
  w.t.db
    .selectFrom('varieties')
    .select('id')
    .where('slug', '=', w.varieties[0])
    .executeTakeFirstOrThrow();

async function newLot(w: MatrixWorld) {
  const v = await variety(w);
  return (
    await w.t.db
      .insertInto('seed_lots')
      .values({ variety_id: v.id, label: `Matrix lot ${++made}`, amount_unit: 'g' })
      .returning('id')
      .executeTakeFirstOrThrow()
  ).id;
}

/** A fresh open offer (its own variety, as a variety has one open offer at a time). */
async function newOffer(w: MatrixWorld) {
  const v = await w.t.db
    .insertInto('varieties')
    .values({
      group_id: w.groupId,
      slug: `matrix-offered-${++made}`,
      name: `Matrix offered ${made}`,
      crop: 'Okra',
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  const lot = await w.t.db
    .insertInto('seed_lots')
    .values({ variety_id: v.id, label: 'Offered', amount_unit: 'seeds', amount: 100 })
    .returning('id')
    .executeTakeFirstOrThrow();
  return (
    await w.t.db
      .insertInto('seed_offers')
      .values({ variety_id: v.id, lot_id: lot.id, packets_offered: 5, packets_left: 5 })
      .returning('id')
      .executeTakeFirstOrThrow()
  ).id;
}

export const rows: MatrixRow[] = [
  {
    method: 'GET',
    route: '/api/varieties/:slug/seed',
    request: (w) => ({ url: `/api/varieties/${w.varieties[0]}/seed` }),
    expect: memberRead,
    expectExtra: { coordinator: 200, outsider: 404 },
  },
  {
    method: 'POST',
    route: '/api/varieties/:slug/seed/lots',
    request: (w) => ({
      url: `/api/varieties/${w.varieties[0]}/seed/lots`,
      body: { label: `Matrix new lot ${++made}`, amountUnit: 'seeds', amount: 300 },
    }),
    ...coordinatorOnly(201),
  },
  {
    method: 'POST',
    route: '/api/varieties/:slug/seed/offers',
    request: async (w) => {
      const offered = await w.t.db
        .insertInto('varieties')
        .values({
          group_id: w.groupId,
          slug: `matrix-to-offer-${++made}`,
          name: `Matrix to offer ${made}`,
          crop: 'Okra',
        })
        .returning(['id', 'slug'])
        .executeTakeFirstOrThrow();
      const lot = await w.t.db
        .insertInto('seed_lots')
        .values({ variety_id: offered.id, label: 'To offer', amount_unit: 'g' })
        .returning('id')
        .executeTakeFirstOrThrow();
      return {
        url: `/api/varieties/${offered.slug}/seed/offers`,
        body: { lotId: lot.id, packets: 4 },
      };
    },
    ...coordinatorOnly(201),
  },
  {
    method: 'PATCH',
    route: '/api/seed/lots/:lotId',
    request: async (w) => ({
      url: `/api/seed/lots/${await newLot(w)}`,
      body: { storagePlace: 'Matrix drawer' },
    }),
    ...coordinatorOnly(204),
  },
  {
    method: 'POST',
    route: '/api/seed/lots/:lotId/tests',
    request: async (w) => ({
      url: `/api/seed/lots/${await newLot(w)}/tests`,
      body: { testedOn: '2026-03-01', seedsTested: 50, seedsGerminated: 45, days: 10 },
    }),
    ...coordinatorOnly(201),
  },
  {
    method: 'DELETE',
    route: '/api/seed/lots/:lotId/tests/:testId',
    request: async (w) => {
      const lot = await newLot(w);
      const test = await w.t.db
        .insertInto('germination_tests')
        .values({
          lot_id: lot,
          tested_on: '2026-03-01',
          seeds_tested: 50,
          seeds_germinated: 45,
          days: 10,
        })
        .returning('id')
        .executeTakeFirstOrThrow();
      return { url: `/api/seed/lots/${lot}/tests/${test.id}` };
    },
    ...coordinatorOnly(204),
  },
  {
    method: 'PATCH',
    route: '/api/seed/groups/:groupId/settings',
    request: (w) => ({
      url: `/api/seed/groups/${w.groupId}/settings`,
      body: { germinationThresholdPercent: 75 },
    }),
    ...coordinatorOnly(204),
  },
  {
    method: 'GET',
    route: '/api/seed/offers',
    // The matrix trial is unpublished: only its members see which of its varieties are offered.
    request: (w) => ({ url: `/api/seed/offers?trial=${w.trial.slug}` }),
    expect: memberRead,
    expectExtra: { coordinator: 404, outsider: 404 },
  },
  {
    method: 'GET',
    route: '/api/seed/offers/:offerId',
    request: async (w) => ({ url: `/api/seed/offers/${await newOffer(w)}` }),
    expect: everyone(200),
    expectExtra: { coordinator: 200, outsider: 200 },
  },
  {
    method: 'PATCH',
    route: '/api/seed/offers/:offerId',
    request: async (w) => ({
      url: `/api/seed/offers/${await newOffer(w)}`,
      body: { status: 'closed' },
    }),
    ...coordinatorOnly(204),
  },
  {
    method: 'GET',
    route: '/api/seed/offers/:offerId/requests',
    request: async (w) => ({ url: `/api/seed/offers/${await newOffer(w)}/requests` }),
    ...coordinatorOnly(200),
  },
  {
    method: 'POST',
    route: '/api/seed/offers/:offerId/requests',
    request: async (w) => ({
      url: `/api/seed/offers/${await newOffer(w)}/requests`,
      body: { shipTo: '3 Matrix Lane' },
    }),
    expect: { ...everyone(201), anonymous: 401 },
    // The group keeps its offers to its people unless it opens them to confirmed addresses.
    expectExtra: { coordinator: 201, outsider: 403 },
  },
  {
    method: 'PATCH',
    route: '/api/seed/requests/:requestId',
    request: async (w) => {
      const offer = await newOffer(w);
      const r = await w.t.db
        .insertInto('seed_requests')
        .values({ offer_id: offer, requester_id: w.users.viewer.id, ship_to: '3 Matrix Lane' })
        .returning('id')
        .executeTakeFirstOrThrow();
      return { url: `/api/seed/requests/${r.id}`, body: { status: 'declined' } };
    },
    ...coordinatorOnly(204),
  },
  {
    method: 'GET',
    route: '/api/trials/:slug/entry-lots',
    request: (w) => ({ url: `/api/trials/${w.trial.slug}/entry-lots` }),
    expect: memberRead,
    // The lots sown belong to the trial: the group's coordinator outside it sees none of it.
    expectExtra: { coordinator: 404, outsider: 404 },
  },
  {
    method: 'PUT',
    route: '/api/trials/:slug/entry-lots/:entryId',
    request: (w) => ({
      url: `/api/trials/${w.trial.slug}/entry-lots/${w.entries[0]}`,
      body: { lotId: null },
    }),
    expect: leadOnly(204),
    expectExtra: { coordinator: 404, outsider: 404 },
  },
];
