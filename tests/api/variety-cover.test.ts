/**
 * A register variety's own cover photo: set and cleared by the group's coordinator, only from
 * photos of the variety's own entries; carried by the variety record and the register list.
 * Permission rules are the product's own (group coordinators edit the register).
 */
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import { seedDemo } from '../../db/seed/seed';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
} from '../support/test-app';

const OKRA = 'larkhaven-okra-2026';
let t: TestApp;
const cookies: Record<string, string | null> = { signedOut: null };
const photoOf: Record<string, string> = {};

const as = (who: string) => {
  const cookie = cookies[who] ?? null;
  const withCookie = (r: request.Test) => (cookie ? r.set('Cookie', cookie) : r);
  return {
    get: (url: string) => withCookie(request(t.app).get(url)),
    patch: (url: string, body: object) =>
      withCookie(request(t.app).patch(url).set('Origin', TEST_ORIGIN)).send(body),
  };
};

beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.db);
  for (const a of demoAccounts) cookies[a.key] = await mintSessionCookie(t, a);
  cookies.outsider = await mintSessionCookie(t, await createUser(t.db, { name: 'Nell Outby' }));
  const entries = await t.db
    .selectFrom('entries as e')
    .innerJoin('trials as tr', 'tr.id', 'e.trial_id')
    .innerJoin('varieties as v', 'v.id', 'e.variety_id')
    .select(['e.id', 'e.trial_id', 'v.slug'])
    .where('tr.slug', '=', OKRA)
    .execute();
  // One photo record per okra entry (the files are not needed to choose a cover).
  for (const e of entries) {
    const row = await t.db
      .insertInto('photos')
      .values({
        trial_id: e.trial_id,
        entry_id: e.id,
        caption: `${e.slug} pods`,
        storage_key: `photos/${e.trial_id}/${randomUUID().replaceAll('-', '')}`,
        mime_type: 'image/jpeg',
        original_ext: 'jpg',
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    photoOf[e.slug] = row.id;
  }
}, 60_000);
afterAll(async () => {
  await t.close();
});

const record = async (who = 'lead') => (await as(who).get('/api/varieties/velvet-lantern')).body;
const listed = async () =>
  (await as('lead').get('/api/varieties')).body.varieties.find(
    (v: { slug: string }) => v.slug === 'velvet-lantern',
  );

describe('a variety’s cover photo', () => {
  it('has none until the coordinator chooses one of its photos, then shows it on the page and in the list', async () => {
    expect((await record()).variety.cover).toBeNull();
    expect((await listed()).cover).toBeNull();
    const id = photoOf['velvet-lantern']!;
    const res = await as('lead').patch('/api/varieties/velvet-lantern', { coverPhotoId: id });
    expect(res.status).toBe(204);
    const base = `/api/trials/${OKRA}/photos/${id}`;
    const cover = { id, thumbUrl: `${base}/thumb`, displayUrl: `${base}/display` };
    expect((await record()).variety.cover).toEqual(cover);
    expect((await record()).photos[0].id).toBe(id);
    expect((await listed()).cover).toEqual(cover);
    // A member of the trial sees the same cover.
    expect((await record('grower')).variety.cover).toEqual(cover);
    // A member of the group who is not in the trial could not open that photo: no cover listed.
    const stranger = await createUser(t.db, { name: 'Odile Farrow' });
    const group = await t.db
      .selectFrom('varieties')
      .select('group_id')
      .where('slug', '=', 'velvet-lantern')
      .executeTakeFirstOrThrow();
    await t.db
      .insertInto('group_members')
      .values({ group_id: group.group_id, user_id: stranger.id, role: 'member' })
      .execute();
    cookies.groupOnly = await mintSessionCookie(t, stranger);
    const theirs = (await as('groupOnly').get('/api/varieties')).body.varieties.find(
      (v: { slug: string }) => v.slug === 'velvet-lantern',
    );
    expect(theirs).toBeDefined();
    expect(theirs.cover).toBeNull();
  });

  it('refuses a photo of another variety, or no photo at all, on the cover field', async () => {
    const other = Object.keys(photoOf).find((s) => s !== 'velvet-lantern')!;
    for (const coverPhotoId of [photoOf[other], '00000000-0000-4000-8000-000000000000']) {
      const res = await as('lead').patch('/api/varieties/velvet-lantern', { coverPhotoId });
      expect(res.status).toBe(400);
      expect(res.body.error.details.fields).toEqual([
        expect.objectContaining({ path: 'body.coverPhotoId' }),
      ]);
    }
    expect((await record()).variety.cover.id).toBe(photoOf['velvet-lantern']);
  });

  it('refuses a grower, an outsider and the signed out', async () => {
    const id = photoOf['velvet-lantern']!;
    const statuses = [];
    for (const who of ['grower', 'outsider', 'signedOut'])
      statuses.push(
        (await as(who).patch('/api/varieties/velvet-lantern', { coverPhotoId: null })).status,
      );
    expect(statuses).toEqual([403, 404, 404]);
    expect((await record()).variety.cover.id).toBe(id);
  });

  it('clears with null, and drops a cover whose photo went to the bin', async () => {
    const id = photoOf['velvet-lantern']!;
    expect(
      (await as('lead').patch('/api/varieties/velvet-lantern', { coverPhotoId: null })).status,
    ).toBe(204);
    expect((await record()).variety.cover).toBeNull();
    expect((await listed()).cover).toBeNull();
    await as('lead').patch('/api/varieties/velvet-lantern', { coverPhotoId: id });
    await t.db.updateTable('photos').set({ deleted_at: new Date() }).where('id', '=', id).execute();
    expect((await record()).variety.cover).toBeNull();
    expect((await listed()).cover).toBeNull();
  });
});

describe('a variety’s cover signed out', () => {
  it('shows only where the published version shows that photo', async () => {
    const id = photoOf['velvet-lantern']!;
    await t.db.updateTable('photos').set({ deleted_at: null }).where('id', '=', id).execute();
    expect(
      (await as('lead').patch('/api/varieties/velvet-lantern', { coverPhotoId: id })).status,
    ).toBe(204);
    const entry = await t.db
      .selectFrom('photos')
      .select('entry_id')
      .where('id', '=', id)
      .executeTakeFirstOrThrow();
    const publish = async (coverPhotos: Record<string, string>, changeNote: string) => {
      const sheet = {
        summary: 'Published for the cover test.',
        methods: null,
        traits: [{ key: 'marketable_yield', basis: 'plot', weight: 1 }],
        entryNotes: {},
        coverPhotos,
        alpha: 0.05,
        letters: 'hsd',
        license: 'CC-BY-4.0',
      };
      const put = await request(t.app)
        .put(`/api/trials/${OKRA}/results-sheet`)
        .set('Origin', TEST_ORIGIN)
        .set('Cookie', cookies.lead!)
        .send(sheet);
      expect(put.status).toBe(200);
      const res = await request(t.app)
        .post(`/api/trials/${OKRA}/results-sheet/publish`)
        .set('Origin', TEST_ORIGIN)
        .set('Cookie', cookies.lead!)
        .send({ changeNote });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
    };
    await publish({}, '');
    expect((await record('signedOut')).variety.cover).toBeNull();
    await publish({ [entry.entry_id!]: id }, 'A cover photo for Velvet Lantern.');
    const cover = (await record('signedOut')).variety.cover;
    expect(cover.id).toBe(id);
    expect(cover.displayUrl).toMatch(
      new RegExp(`^/api/results/${OKRA}/v/\\d+/photos/${id}/display$`),
    );
  });

  it('leaves the list when its entry is relinked to another variety', async () => {
    const id = photoOf['velvet-lantern']!;
    expect(
      (await as('lead').patch('/api/varieties/velvet-lantern', { coverPhotoId: id })).status,
    ).toBe(204);
    expect((await listed()).cover.id).toBe(id);
    const photo = await t.db
      .selectFrom('photos')
      .select('entry_id')
      .where('id', '=', id)
      .executeTakeFirstOrThrow();
    const entry = await t.db
      .selectFrom('entries')
      .select('variety_id')
      .where('id', '=', photo.entry_id!)
      .executeTakeFirstOrThrow();
    const other = Object.keys(photoOf).find((s) => s !== 'velvet-lantern')!;
    const otherVariety = await t.db
      .selectFrom('varieties')
      .select('id')
      .where('slug', '=', other)
      .executeTakeFirstOrThrow();
    await t.db
      .updateTable('entries')
      .set({ variety_id: otherVariety.id })
      .where('id', '=', photo.entry_id!)
      .execute();
    try {
      expect((await listed()).cover).toBeNull();
      expect((await record()).variety.cover).toBeNull();
    } finally {
      await t.db
        .updateTable('entries')
        .set({ variety_id: entry.variety_id })
        .where('id', '=', photo.entry_id!)
        .execute();
    }
    expect((await listed()).cover.id).toBe(id);
  });
});
