/**
 * Analyses are kept per trial data version: asking twice with nothing changed gives the same
 * answer, and every kind of write — a record logged, deleted, restored, a design change made
 * anywhere (even straight in the database) — gives the next request fresh numbers.
 * Expected means are arithmetic means of the plot values (a plot's repeated scores are
 * averaged first), worked by hand beside each check.
 */
import crypto from 'node:crypto';
import { sql } from 'kysely';
import request from 'supertest';
import { afterAll, beforeAll, expect, it } from 'vitest';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
} from '../support/test-app';
import { insertBlocksTrial, type SmallTrial, vigorScoreTrait } from '../support/trial-fixture';

let t: TestApp;
let trial: SmallTrial;
let cookie: string;
const slug = 'cache-check-trial';

// Entry 1 (position 1) scores 3, 4, 5 in blocks 1–3; entry 2 scores 2, 2, 3; entry 3 4, 5, 5.
const scores: Record<number, number> = {
  101: 3,
  201: 4,
  301: 5,
  102: 2,
  202: 2,
  302: 3,
  103: 4,
  203: 5,
  303: 5,
};

beforeAll(async () => {
  t = await createTestApp();
  const lead = await createUser(t.db);
  trial = await insertBlocksTrial(t.db, {
    trial: { slug, title: 'Cache check', crop: 'squash' },
    siteName: 'Orchard strip',
    entryNames: ['Ashen Crookneck', 'Tallow Pie', 'Verdigris Turban'],
    blocks: 3,
    trait: vigorScoreTrait,
    leadId: lead.id,
  });
  await t.db
    .insertInto('observations')
    .values(
      Object.entries(scores).map(([plot, value]) => ({
        trial_id: trial.trialId,
        plot_id: trial.plotIds[Number(plot)]!,
        trait_id: trial.traitId,
        observed_on: '2026-07-01',
        value,
      })),
    )
    .execute();
  cookie = await mintSessionCookie(t, lead);
}, 60_000);
afterAll(async () => {
  await t.close();
});

const analysis = async () => {
  const res = await request(t.app)
    .get(`/api/trials/${slug}/analysis?trait=vigor`)
    .set('Cookie', cookie);
  expect(res.status).toBe(200);
  return res.body as { means: { variety: string; mean: number }[] };
};
const meanOf = (body: { means: { variety: string; mean: number }[] }, variety: string) =>
  body.means.find((m) => m.variety === variety)?.mean;
const send = (method: 'post' | 'delete', path: string, body?: object) => {
  const url = `/api/trials/${slug}${path}`;
  const req = method === 'post' ? request(t.app).post(url) : request(t.app).delete(url);
  return req.set('Origin', TEST_ORIGIN).set('Cookie', cookie).send(body);
};
const version = async () =>
  (
    await t.db
      .selectFrom('trials')
      .select('data_version')
      .where('id', '=', trial.trialId)
      .executeTakeFirstOrThrow()
  ).data_version;

it('answers the same until the data changes, then from the changed data', async () => {
  const first = await analysis();
  expect(meanOf(first, 'Ashen Crookneck')).toBeCloseTo(4, 12); // (3 + 4 + 5) / 3
  expect(await analysis()).toEqual(first);

  // A second score of 1 on plot 101: the plot's value is (3 + 1) / 2 = 2, the mean (2 + 4 + 5) / 3.
  const before = await version();
  const id = crypto.randomUUID();
  const logged = await send('post', '/observations', {
    id,
    plotId: trial.plotIds[101],
    traitId: trial.traitId,
    observedOn: '2026-07-08',
    value: 1,
  });
  expect(logged.status).toBe(201);
  expect(await version()).toBeGreaterThan(before);
  expect(meanOf(await analysis(), 'Ashen Crookneck')).toBeCloseTo(11 / 3, 12);

  // Deleted: back to (3 + 4 + 5) / 3; undone: (2 + 4 + 5) / 3 again.
  expect((await send('delete', `/observations/${id}`)).status).toBe(200);
  expect(meanOf(await analysis(), 'Ashen Crookneck')).toBeCloseTo(4, 12);
  expect((await send('post', `/observations/${id}/undo-delete`)).status).toBe(200);
  expect(meanOf(await analysis(), 'Ashen Crookneck')).toBeCloseTo(11 / 3, 12);
});

it('answers from fresh data after a change made outside the app as well', async () => {
  await analysis();
  await t.db
    .updateTable('entries')
    .set({ name: 'Ashen Crookneck Select' })
    .where('trial_id', '=', trial.trialId)
    .where('code', '=', 'E1')
    .execute();
  const renamed = await analysis();
  expect(renamed.means.map((m) => m.variety)).toContain('Ashen Crookneck Select');
  expect(renamed.means.map((m) => m.variety)).not.toContain('Ashen Crookneck');

  // Plot 303 scored 1 instead of 5: entry 3's mean becomes (4 + 5 + 1) / 3.
  await sql`update observations set value = 1 where plot_id = ${trial.plotIds[303]!}`.execute(t.db);
  expect(meanOf(await analysis(), 'Verdigris Turban')).toBeCloseTo(10 / 3, 12);
});
