import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import { seedDemoIfEmpty } from '../../db/seed/seed';
import { localStorage } from '../../server/storage/local-storage';
import { createTestApp, mintSessionCookie, TEST_ORIGIN, type TestApp } from '../support/test-app';

const SLUG = 'larkhaven-okra-2026';
const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-delete-'));
const storage = localStorage(folder);
let t: TestApp;

beforeAll(async () => {
  t = await createTestApp({ storage });
  await seedDemoIfEmpty(t.db, storage);
}, 60_000);
afterAll(async () => {
  await t.close();
  fs.rmSync(folder, { recursive: true, force: true });
});

const cookieOf = (key: string) =>
  mintSessionCookie(
    t,
    demoAccounts.find((a) => a.key === key)!,
  );
const del = async (key: string, body: object) =>
  request(t.app)
    .delete(`/api/trials/${SLUG}`)
    .set('Origin', TEST_ORIGIN)
    .set('Cookie', await cookieOf(key))
    .send(body);

describe('deleting a trial', () => {
  it('is for the lead, asks for the address again, and removes every record and photo file', async () => {
    const trial = await t.db
      .selectFrom('trials')
      .select('id')
      .where('slug', '=', SLUG)
      .executeTakeFirstOrThrow();
    expect((await storage.list(`photos/${trial.id}/`)).length).toBe(18); // 6 cover drawings × 3 sizes

    expect((await del('viewer', { confirmSlug: SLUG })).status).toBe(403);
    expect((await del('grower2', { confirmSlug: SLUG })).status).toBe(403);
    const wrong = await del('lead', { confirmSlug: 'larkhaven-okra' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.details.fields).toEqual([
      { path: 'body.confirmSlug', message: `Type "${SLUG}" to confirm.` },
    ]);
    expect((await del('lead', {})).status).toBe(400);

    expect((await del('lead', { confirmSlug: SLUG })).status).toBe(204);
    for (const table of [
      'plots',
      'harvests',
      'observations',
      'field_events',
      'photos',
      'trial_members',
      'sites',
      'entries',
    ] as const) {
      const n = await t.db
        .selectFrom(table)
        .select((eb) => eb.fn.countAll<number>().as('n'))
        .where('trial_id', '=', trial.id)
        .executeTakeFirstOrThrow();
      expect([table, Number(n.n)]).toEqual([table, 0]);
    }
    expect(await storage.list(`photos/${trial.id}/`)).toEqual([]);
    expect(
      (
        await request(t.app)
          .get(`/api/trials/${SLUG}`)
          .set('Cookie', await cookieOf('lead'))
      ).status,
    ).toBe(404);
    // The library's other trial is untouched.
    const beans = await request(t.app)
      .get('/api/trials/fennick-bush-beans-2026')
      .set('Cookie', await cookieOf('lead'));
    expect(beans.status).toBe(200);
    expect(beans.body.plotCount).toBe(20);
  });
});
