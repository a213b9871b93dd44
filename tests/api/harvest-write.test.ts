/**
 * A harvest POST answers from what it stored (no read-back): the answer must be the record
 * exactly as the log reads it afterwards, and its audit entry — written by the same statement —
 * must hold the record as stored, timestamps written as a JSON Date is (ISO 8601 in UTC with
 * milliseconds, ECMA-262 Date.prototype.toISOString).
 */
import crypto from 'node:crypto';
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
const slug = 'write-answer-trial';

beforeAll(async () => {
  t = await createTestApp();
  const lead = await createUser(t.db, { name: 'Oriel Vantongeren' });
  trial = await insertBlocksTrial(t.db, {
    trial: { slug, title: 'Answer check', crop: 'bean' },
    siteName: 'Lower terrace',
    entryNames: ['Cobalt Runner', 'Marrow Fat'],
    blocks: 2,
    trait: vigorScoreTrait,
    leadId: lead.id,
  });
  cookie = await mintSessionCookie(t, lead);
}, 60_000);
afterAll(async () => {
  await t.close();
});

it('answers a new harvest exactly as the log then reads it, and audits it as stored', async () => {
  const id = crypto.randomUUID();
  const body = {
    id,
    plotId: trial.plotIds[102],
    harvestedOn: '2026-07-14',
    fruitCount: 3,
    massG: 412.5,
    grade: 'marketable',
    note: 'first picking',
  };
  const post = (b: object) =>
    request(t.app)
      .post(`/api/trials/${slug}/harvests`)
      .set('Origin', TEST_ORIGIN)
      .set('Cookie', cookie)
      .send(b);
  const created = await post(body);
  expect(created.status).toBe(201);
  const list = await request(t.app).get(`/api/trials/${slug}/harvests`).set('Cookie', cookie);
  const stored = list.body.harvests.find((h: { id: string }) => h.id === id);
  expect(created.body).toEqual(stored);
  expect(created.body).toMatchObject({
    plotNumber: 102,
    block: 1,
    siteName: 'Lower terrace',
    entryName: 'Marrow Fat',
    createdByName: 'Oriel Vantongeren',
    version: 1,
    deletedAt: null,
    massG: 412.5,
  });

  // A retry of the same id answers 200 with the same record and writes no second audit entry.
  const again = await post(body);
  expect(again.status).toBe(200);
  expect(again.body).toEqual(stored);

  const audit = await t.db
    .selectFrom('audit_log')
    .selectAll()
    .where('record_id', '=', id)
    .execute();
  expect(audit).toHaveLength(1);
  expect(audit[0]).toMatchObject({ action: 'create', table_name: 'harvests', before: null });
  const row = await t.db
    .selectFrom('harvests')
    .selectAll()
    .where('id', '=', id)
    .executeTakeFirstOrThrow();
  // The same JSON the audit writer makes from the row as read by the app.
  expect(audit[0]!.after).toEqual(JSON.parse(JSON.stringify(row)));
});

it('refuses a plot of no trial on the plot field, and stores nothing', async () => {
  const id = crypto.randomUUID();
  const res = await request(t.app)
    .post(`/api/trials/${slug}/harvests`)
    .set('Origin', TEST_ORIGIN)
    .set('Cookie', cookie)
    .send({
      id,
      plotId: crypto.randomUUID(),
      harvestedOn: '2026-07-14',
      fruitCount: 1,
      massG: 10,
      grade: 'cull',
    });
  expect(res.status).toBe(400);
  expect(res.body.error.details.fields[0].path).toBe('body.plotId');
  const audit = await t.db
    .selectFrom('audit_log')
    .select('id')
    .where('record_id', '=', id)
    .execute();
  expect(audit).toEqual([]);
});
