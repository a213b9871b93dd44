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

/**
 * The register list links a cover exactly where the photo routes serve it: anyone once it is a
 * published trial's sheet cover (the results sheet's picture), else whoever may read its trial
 * (the permission table in common/policy.ts: trial members and administrators).
 */
describe('a cover in the register list, for each reader', () => {
  it('is listed for whoever the photo routes serve it to, and to no one else', async () => {
    const id = photoOf['velvet-lantern']!;
    const photo = await t.db
      .selectFrom('photos as p')
      .innerJoin('trials as tr', 'tr.id', 'p.trial_id')
      .select(['p.storage_key', 'p.original_ext', 'tr.id as trial_id', 'tr.status', 'tr.group_id'])
      .where('p.id', '=', id)
      .executeTakeFirstOrThrow();
    await t.db.updateTable('photos').set({ deleted_at: null }).where('id', '=', id).execute();
    expect(
      (await as('lead').patch('/api/varieties/velvet-lantern', { coverPhotoId: id })).status,
    ).toBe(204);
    // The stored thumbnail, so the photo route answers with the file where it allows it.
    await t.runtime.deps.storage.put(
      `${photo.storage_key}/thumb.webp`,
      Buffer.from('RIFF\0\0\0\0WEBP'),
      'image/webp',
    );
    // A member of the trial's group who has no part in the trial.
    const member = await createUser(t.db, { name: 'Orla Groupwide' });
    await t.db
      .insertInto('group_members')
      .values({ group_id: photo.group_id!, user_id: member.id, role: 'member' })
      .execute();
    cookies.groupMember = await mintSessionCookie(t, member);

    const states = [
      { status: 'active', sheetCover: false },
      { status: 'active', sheetCover: true },
      { status: 'published', sheetCover: true },
      { status: 'published', sheetCover: false },
    ] as const;
    const readers = ['lead', 'viewer', 'grower', 'admin', 'groupMember'];
    try {
      for (const state of states) {
        await t.db
          .updateTable('trials')
          .set({ status: state.status })
          .where('id', '=', photo.trial_id)
          .execute();
        await t.db
          .updateTable('photos')
          .set({ is_cover: state.sheetCover })
          .where('id', '=', id)
          .execute();
        const route = `/api/trials/${OKRA}/photos/${id}/thumb`;
        for (const who of readers) {
          const list = await as(who).get('/api/varieties');
          expect(list.status).toBe(200);
          const cover = list.body.varieties.find(
            (v: { slug: string }) => v.slug === 'velvet-lantern',
          ).cover as { thumbUrl: string } | null;
          const served = (await as(who).get(route)).status === 200;
          // Trial members and administrators always; the group's other people only once public.
          const expected =
            who !== 'groupMember' || (state.status === 'published' && state.sheetCover);
          const what = `${who}, ${state.status}, sheet cover ${state.sheetCover}`;
          expect(cover !== null, what).toBe(expected);
          expect(served, what).toBe(expected);
          if (cover) expect(cover.thumbUrl).toBe(route);
        }
        // Outside the group the variety is not listed at all; signed out, there is no list.
        const outside = await as('outsider').get('/api/varieties');
        expect(outside.body.varieties.map((v: { slug: string }) => v.slug)).not.toContain(
          'velvet-lantern',
        );
        expect((await as('signedOut').get('/api/varieties')).status).toBe(401);
      }
    } finally {
      await t.db
        .updateTable('trials')
        .set({ status: photo.status })
        .where('id', '=', photo.trial_id)
        .execute();
    }
  });
});
