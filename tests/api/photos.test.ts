/**
 * Photo uploads end to end, on the real app and PostgreSQL: what is kept, what is stripped,
 * what is refused, who may see which file, and that failures leave nothing behind.
 */
import crypto from 'node:crypto';
import exifReader from 'exif-reader';
import sharp from 'sharp';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { heicReadable } from '../../server/photos/photo-processing';
import { purgeDeletedPhotos } from '../../server/photos/photos-service';
import { localStorage } from '../../server/storage/local-storage';
import type { ObjectStorage } from '../../server/storage/object-storage';
import { type FakeS3, startFakeS3 } from '../support/fake-s3';
import { createTestApp, TEST_ORIGIN, type TestApp } from '../support/test-app';
import { buildMatrixWorld, type MatrixWorld } from './matrix/matrix-world';
import { phonePhoto, pngClaiming } from './photos-fixtures';

const fetchBytes = (res: request.Response) => res.body as Buffer;
const binary = (r: request.Test) =>
  r.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });

interface Ctx {
  t: TestApp;
  w: MatrixWorld;
  storage: ObjectStorage;
}

function helpers(ctx: () => Ctx) {
  const base = () => `/api/trials/${ctx().w.trial.slug}/photos`;
  const as = (caller: keyof MatrixWorld['cookies'] | null) => {
    const agent = request(ctx().t.app);
    const cookie = caller ? ctx().w.cookies[caller] : undefined;
    const wrap = (r: request.Test) => {
      r = r.set('Origin', TEST_ORIGIN);
      return cookie ? r.set('Cookie', cookie) : r;
    };
    return {
      get: (url: string) => wrap(agent.get(url)),
      post: (url: string) => wrap(agent.post(url)),
      patch: (url: string) => wrap(agent.patch(url)),
      put: (url: string) => wrap(agent.put(url)),
      delete: (url: string) => wrap(agent.delete(url)),
    };
  };
  const stored = async () => ctx().storage.list(`photos/${ctx().w.trial.id}/`);
  const rowCount = async () =>
    (
      await ctx()
        .t.db.selectFrom('photos')
        .select((eb) => eb.fn.countAll<number>().as('n'))
        .where('trial_id', '=', ctx().w.trial.id)
        .executeTakeFirstOrThrow()
    ).n;
  return { base, as, stored, rowCount };
}

describe.each(['local', 's3'] as const)('photos on the %s driver', (driver) => {
  let ctx: Ctx;
  let s3: FakeS3 | undefined;
  const { base, as, stored, rowCount } = helpers(() => ctx);

  beforeAll(async () => {
    let storage: ObjectStorage | undefined;
    if (driver === 's3') {
      s3 = await startFakeS3();
      storage = s3.storage;
    }
    const t = await createTestApp({ storage });
    const w = await buildMatrixWorld(t);
    ctx = { t, w, storage: t.runtime.deps.storage! };
  }, 60_000);
  afterAll(async () => {
    await ctx?.t.close();
    await s3?.close();
  });

  it('keeps the capture time, applies the orientation and strips every EXIF block', async () => {
    // Orientation 6: the stored pixels must be turned 90° clockwise to stand upright
    // (EXIF 2.32, CIPA DC-008-2019, tag 0x0112 Orientation).
    const original = await phonePhoto({
      width: 640,
      height: 480,
      orientation: 6,
      dateTimeOriginal: '2026:07:14 08:30:05',
      offsetTimeOriginal: '-05:00',
    });
    // The fixture really carries GPS and orientation before upload.
    const before = exifReader((await sharp(original).metadata()).exif!);
    expect(before.GPSInfo?.GPSLatitude).toEqual([45, 30, 12.34]);
    expect(before.Image?.Orientation).toBe(6);

    const res = await as('contributor')
      .post(base())
      .field('caption', 'Pods of entry MG on the bench')
      .field('plotId', ctx.w.plotA)
      .field('subject', 'fruit')
      .attach('photo', original, { filename: 'IMG_0001.jpg', contentType: 'image/jpeg' });
    expect(res.status, res.text).toBe(201);
    const photo = res.body.photos[0];
    expect(photo).toMatchObject({
      entryId: ctx.w.entries[0],
      plotId: ctx.w.plotA,
      takenOn: '2026-07-14',
      // 08:30:05 at UTC−05:00 is 13:30:05 UTC
      capturedAt: '2026-07-14T13:30:05.000Z',
      caption: 'Pods of entry MG on the bench',
      subject: 'fruit',
      mimeType: 'image/jpeg',
      width: 480,
      height: 640,
      // long edge 400 for the thumbnail; the display size never enlarges (1600 > 640)
      thumbWidth: 300,
      thumbHeight: 400,
      displayWidth: 480,
      displayHeight: 640,
      isCover: false,
      canEdit: true,
      uploadedBy: { id: ctx.w.users.contributor.id, name: 'Cato Contributor' },
    });
    expect(photo.urls.original).toMatch(/\/original\?v=[0-9a-f]{12}$/);

    const expected = {
      thumb: { type: 'image/webp', format: 'webp', width: 300, height: 400 },
      display: { type: 'image/webp', format: 'webp', width: 480, height: 640 },
      original: { type: 'image/jpeg', format: 'jpeg', width: 480, height: 640 },
    } as const;
    for (const [variant, want] of Object.entries(expected)) {
      const file = await binary(as('contributor').get(photo.urls[variant]));
      expect(file.status).toBe(200);
      expect(file.headers['content-type']).toBe(want.type);
      expect(file.headers['cache-control']).toBe('private, max-age=31536000, immutable');
      expect(file.headers.etag).toMatch(/^"[0-9a-f]{20}-\w+"$/);
      const bytes = fetchBytes(file);
      const meta = await sharp(bytes).metadata();
      expect(meta).toMatchObject({ format: want.format, width: want.width, height: want.height });
      expect(meta.exif).toBeUndefined();
      expect(meta.xmp).toBeUndefined();
      expect(meta.iptc).toBeUndefined();
      expect(meta.orientation).toBeUndefined();
      for (const marker of ['GPS', 'Testcam', 'Fieldphone', 'Exif\0\0'])
        expect(bytes.includes(Buffer.from(marker, 'latin1'))).toBe(false);
      // Upright: the red left half of the stored pixels is now the top, blue the bottom.
      const { data, info } = await sharp(bytes).raw().toBuffer({ resolveWithObject: true });
      const px = (x: number, y: number) => {
        const i = (y * info.width + x) * info.channels;
        return [data[i]!, data[i + 1]!, data[i + 2]!];
      };
      const top = px(Math.floor(info.width / 2), 5);
      const bottom = px(Math.floor(info.width / 2), info.height - 5);
      expect(top[0]).toBeGreaterThan(150);
      expect(top[2]).toBeLessThan(100);
      expect(bottom[2]).toBeGreaterThan(150);
      expect(bottom[0]).toBeLessThan(100);
    }

    // The same ETag again: nothing to send.
    const first = await as('viewer').get(photo.urls.thumb);
    const again = await as('viewer')
      .get(photo.urls.thumb)
      .set('If-None-Match', first.headers.etag!);
    expect(again.status).toBe(304);
  });

  it('uses the upload day when the photo has no capture time, and lists by entry and date', async () => {
    const res = await as('growerInSite')
      .post(base())
      .field('caption', 'Leaf spots on entry MR')
      .field('entryId', ctx.w.entries[1])
      .field('today', '2026-08-02')
      .attach('photo', await phonePhoto({ gps: false }), {
        filename: 'a.jpg',
        contentType: 'image/jpeg',
      });
    expect(res.status, res.text).toBe(201);
    expect(res.body.photos[0]).toMatchObject({
      takenOn: '2026-08-02',
      capturedAt: null,
      plotId: null,
    });

    const byEntry = await as('viewer').get(`${base()}?entryId=${ctx.w.entries[1]}`);
    expect(byEntry.body.photos.map((p: { caption: string }) => p.caption)).toEqual([
      'Leaf spots on entry MR',
    ]);
    // A viewer sees thumbnails but not the uploader's original, and may not edit.
    expect(byEntry.body.photos[0]).toMatchObject({ canEdit: false, urls: { original: null } });
    const byWeek = await as('viewer').get(`${base()}?from=2026-07-13&to=2026-07-19`);
    expect(byWeek.body.photos.map((p: { takenOn: string }) => p.takenOn)).toEqual(['2026-07-14']);
  });

  it('refuses what is not a readable photo, and stores nothing', async () => {
    const filesBefore = await stored();
    const rowsBefore = await rowCount();
    const cases: {
      name: string;
      send: () => PromiseLike<request.Response>;
      status: number;
      message: RegExp;
    }[] = [
      {
        name: 'a text file renamed .jpg',
        send: () =>
          as('contributor')
            .post(base())
            .field('caption', 'Not a photo')
            .attach('photo', Buffer.from('okra pods, 12 count, 240 g\n'), {
              filename: 'pods.jpg',
              contentType: 'image/jpeg',
            }),
        status: 415,
        message: /not a photo we can read.*JPEG, PNG, WebP or AVIF/,
      },
      {
        name: 'a header claiming 20 000 × 20 000 pixels',
        send: async () =>
          as('contributor')
            .post(base())
            .field('caption', 'Bomb')
            .attach('photo', await pngClaiming(20_000, 20_000), {
              filename: 'big.png',
              contentType: 'image/png',
            }),
        status: 422,
        message: /20000 × 20000 pixels \(400\.0 megapixels\); the limit is 60 megapixels/,
      },
      {
        name: 'more files than allowed',
        send: () => {
          let r = as('contributor').post(base()).field('caption', 'Nine at once');
          for (let i = 0; i < 9; i++)
            r = r.attach('photo', Buffer.from([0xff, 0xd8, 0xff, i]), {
              filename: `p${i}.jpg`,
              contentType: 'image/jpeg',
            });
          return r;
        },
        status: 413,
        message: /At most 8 photos can be sent in one upload/,
      },
      {
        name: 'a file over the size limit',
        send: () => {
          const big = Buffer.alloc(25 * 1024 * 1024 + 10, 7);
          big.set([0xff, 0xd8, 0xff]);
          return as('contributor')
            .post(base())
            .field('caption', 'Too big')
            .attach('photo', big, { filename: 'big.jpg', contentType: 'image/jpeg' });
        },
        status: 413,
        message: /Each photo can be at most 25 MB/,
      },
      {
        name: 'an upload without a caption',
        send: async () =>
          as('contributor')
            .post(base())
            .attach('photo', await phonePhoto({ width: 32, height: 32 }), {
              filename: 'x.jpg',
              contentType: 'image/jpeg',
            }),
        status: 400,
        message: /body\.caption/,
      },
      {
        name: 'a plot of one entry tagged with the other entry',
        send: async () =>
          as('contributor')
            .post(base())
            .field('caption', 'Mismatch')
            .field('plotId', ctx.w.plotA)
            .field('entryId', ctx.w.entries[1])
            .attach('photo', await phonePhoto({ width: 32, height: 32 }), {
              filename: 'x.jpg',
              contentType: 'image/jpeg',
            }),
        status: 400,
        message: /different entry/,
      },
    ];
    for (const c of cases) {
      const res = await c.send();
      expect(res.status, `${c.name}: ${res.text}`).toBe(c.status);
      expect(res.body.error.message, c.name).toMatch(c.message);
    }
    expect(await stored()).toEqual(filesBefore);
    expect(await rowCount()).toBe(rowsBefore);
  });

  it('asks for JPEG when HEIC cannot be read here', async () => {
    // An ISO BMFF 'ftyp' box with the 'heic' major brand (ISO/IEC 23008-12), then junk.
    const box = Buffer.alloc(24);
    box.writeUInt32BE(24, 0);
    box.write('ftypheic', 4, 'latin1');
    box.write('mif1heic', 16, 'latin1');
    const res = await as('contributor')
      .post(base())
      .field('caption', 'Phone default format')
      .attach('photo', Buffer.concat([box, Buffer.alloc(200, 1)]), {
        filename: 'IMG_0002.HEIC',
        contentType: 'image/heic',
      });
    if (heicReadable()) {
      expect(res.status).toBe(422);
    } else {
      expect(res.status).toBe(415);
      expect(res.body.error.message).toMatch(/cannot read HEIC.*JPEG/);
    }
  });

  it('refuses signed-out and viewer uploads before keeping anything', async () => {
    const filesBefore = await stored();
    const file = await phonePhoto({ width: 32, height: 32 });
    const anon = await as(null)
      .post(base())
      .field('caption', 'x')
      .attach('photo', file, { filename: 'x.jpg', contentType: 'image/jpeg' });
    expect(anon.status).toBe(404);
    const viewer = await as('viewer')
      .post(base())
      .field('caption', 'x')
      .attach('photo', file, { filename: 'x.jpg', contentType: 'image/jpeg' });
    expect(viewer.status).toBe(403);
    expect(viewer.body.error.message).toMatch(/role/);
    expect(await stored()).toEqual(filesBefore);
  });

  it('edits tags, deletes with undo, and removes the files once the deletion is final', async () => {
    const up = await as('contributor')
      .post(base())
      .field('caption', 'Habit at 60 days')
      .field('entryId', ctx.w.entries[0])
      .attach('photo', await phonePhoto({ width: 200, height: 100 }), {
        filename: 'h.jpg',
        contentType: 'image/jpeg',
      });
    const photo = up.body.photos[0];
    const prefix = (
      await ctx.t.db
        .selectFrom('photos')
        .select('storage_key')
        .where('id', '=', photo.id)
        .executeTakeFirstOrThrow()
    ).storage_key;
    expect(prefix).toMatch(/^photos\/[0-9a-f-]{36}\/[0-9a-f]{32}$/);
    expect(await ctx.storage.list(`${prefix}/`)).toHaveLength(3);

    const edit = await as('lead')
      .patch(`${base()}/${photo.id}`)
      .send({ caption: 'Plant habit at 60 days', takenOn: '2026-07-01', subject: 'plant' });
    expect(edit.status, edit.text).toBe(200);
    expect(edit.body.photo).toMatchObject({
      caption: 'Plant habit at 60 days',
      takenOn: '2026-07-01',
      subject: 'plant',
    });
    const bad = await as('lead').patch(`${base()}/${photo.id}`).send({ caption: '  ' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fields[0].path).toBe('body.caption');

    const del = await as('contributor').delete(`${base()}/${photo.id}`);
    expect(del.status).toBe(200);
    const undoUntil = new Date(del.body.undoUntil).getTime();
    expect(undoUntil - Date.now()).toBeGreaterThan(23 * 3600_000);
    expect((await as('lead').get(photo.urls.thumb)).status).toBe(404);
    const list = await as('lead').get(base());
    expect(list.body.photos.some((p: { id: string }) => p.id === photo.id)).toBe(false);

    const undo = await as('contributor').post(`${base()}/${photo.id}/restore`);
    expect(undo.status).toBe(200);
    expect((await as('lead').get(photo.urls.thumb)).status).toBe(200);

    await as('lead').delete(`${base()}/${photo.id}`);
    // Within the window nothing is removed…
    expect(await purgeDeletedPhotos({ db: ctx.t.db, storage: ctx.storage })).toBe(0);
    expect(await ctx.storage.list(`${prefix}/`)).toHaveLength(3);
    // …after it, the files go and the deletion cannot be undone.
    const later = new Date(undoUntil + 1000);
    expect(await purgeDeletedPhotos({ db: ctx.t.db, storage: ctx.storage }, later)).toBe(1);
    expect(await ctx.storage.list(`${prefix}/`)).toEqual([]);
    const row = await ctx.t.db
      .selectFrom('photos')
      .select(['purged_at', 'deleted_at'])
      .where('id', '=', photo.id)
      .executeTakeFirstOrThrow();
    expect(row.purged_at).not.toBeNull();
    expect((await as('lead').post(`${base()}/${photo.id}/restore`)).status).toBe(404);
  });

  it('keeps one cover per entry, and serves a published trial’s covers to anyone', async () => {
    const upload = async (caption: string) =>
      (
        await as('contributor')
          .post(base())
          .field('caption', caption)
          .field('entryId', ctx.w.entries[1])
          .attach('photo', await phonePhoto({ width: 120, height: 90 }), {
            filename: 'c.jpg',
            contentType: 'image/jpeg',
          })
      ).body.photos[0];
    const a = await upload('Cover candidate A');
    const b = await upload('Cover candidate B');
    expect((await as('lead').put(`${base()}/${a.id}/cover`)).body.photo.isCover).toBe(true);
    expect((await as('lead').put(`${base()}/${b.id}/cover`)).body.photo.isCover).toBe(true);
    const covers = await ctx.t.db
      .selectFrom('photos')
      .select('id')
      .where('entry_id', '=', ctx.w.entries[1])
      .where('is_cover', '=', true)
      .execute();
    expect(covers.map((c) => c.id)).toEqual([b.id]);
    // The database itself refuses a second cover for the entry.
    await expect(
      ctx.t.db.updateTable('photos').set({ is_cover: true }).where('id', '=', a.id).execute(),
    ).rejects.toThrow(/photos_one_cover_per_entry/);

    // Unpublished: strangers learn nothing.
    expect((await as(null).get(b.urls.display)).status).toBe(404);
    await ctx.t.db
      .updateTable('trials')
      .set({ status: 'published' })
      .where('id', '=', ctx.w.trial.id)
      .execute();
    try {
      const pub = await as(null).get(b.urls.display);
      expect(pub.status).toBe(200);
      expect(pub.headers['cache-control']).toBe('public, max-age=86400');
      // Not a cover, or the original: still for members only.
      expect((await as(null).get(a.urls.display)).status).toBe(401);
      expect((await as(null).get(b.urls.original)).status).toBe(401);
    } finally {
      await ctx.t.db
        .updateTable('trials')
        .set({ status: 'active' })
        .where('id', '=', ctx.w.trial.id)
        .execute();
    }
  });

  it('answers a retried upload with the photos it already stored, never a second copy', async () => {
    const uploadId = crypto.randomUUID();
    const photo = await phonePhoto({ gps: false });
    const send = (caller: 'contributor' | 'growerInSite') =>
      as(caller)
        .post(base())
        .field('uploadId', uploadId)
        .field('plotId', ctx.w.plotA)
        .field('caption', 'Retried after the answer was lost')
        .attach('photo', photo, { filename: 'retry.jpg', contentType: 'image/jpeg' });
    const rowsBefore = await rowCount();
    const filesBefore = (await stored()).length;
    const first = await send('contributor');
    expect(first.status, first.text).toBe(201);
    const again = await send('contributor');
    expect(again.status, again.text).toBe(200);
    expect(again.body.photos.map((p: { id: string }) => p.id)).toEqual(
      first.body.photos.map((p: { id: string }) => p.id),
    );
    expect(await rowCount()).toBe(rowsBefore + 1);
    // Three stored sizes of one photo, not six.
    expect((await stored()).length).toBe(filesBefore + 3);
    // Someone else's upload cannot reuse the id (and learns nothing of its photos).
    const other = await send('growerInSite');
    expect(other.status).toBe(409);
    expect(other.body.error.details.fields[0].path).toBe('body.uploadId');
    expect(await rowCount()).toBe(rowsBefore + 1);
  });
});

describe('a failed storage write', () => {
  let t: TestApp;
  let w: MatrixWorld;
  let inner: ObjectStorage;
  let failOn: RegExp | null = null;
  beforeAll(async () => {
    // The real local driver, with writes made to fail on demand.
    const holder: { storage?: ObjectStorage } = {};
    const failing: ObjectStorage = {
      driver: 'local',
      put: async (key, body, type) => {
        if (failOn?.test(key)) throw new Error('disk full (simulated)');
        return holder.storage!.put(key, body, type);
      },
      get: (key) => holder.storage!.get(key),
      delete: (key) => holder.storage!.delete(key),
      list: (prefix) => holder.storage!.list(prefix),
      check: () => holder.storage!.check(),
    };
    t = await createTestApp({ storage: failing });
    inner = localStorage(t.runtime.deps.env.UPLOADS_DIR);
    holder.storage = inner;
    w = await buildMatrixWorld(t);
  }, 60_000);
  afterAll(async () => {
    await t?.close();
  });

  it('leaves neither files nor rows', async () => {
    failOn = /\/original\.jpg$/; // after the thumbnail and display size were written
    const res = await request(t.app)
      .post(`/api/trials/${w.trial.slug}/photos`)
      .set('Origin', TEST_ORIGIN)
      .set('Cookie', w.cookies.contributor!)
      .field('caption', 'Pods')
      .attach('photo', await phonePhoto({ width: 64, height: 64 }), {
        filename: 'p.jpg',
        contentType: 'image/jpeg',
      });
    expect(res.status).toBe(500);
    expect(await inner.list('photos/')).toEqual([]);
    const n = await t.db
      .selectFrom('photos')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .executeTakeFirstOrThrow();
    expect(n.n).toBe(0);
    failOn = null;
  });
});
