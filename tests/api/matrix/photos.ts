import request from 'supertest';
import { TEST_ORIGIN } from '../../support/test-app';
import { phonePhoto } from '../photos-fixtures';
import { type Caller, leadOnly, type MatrixRow, memberRead } from './matrix-types';
import type { MatrixWorld } from './matrix-world';

let jpeg: Buffer | undefined;
const photoFile = async () => (jpeg ??= await phonePhoto({ width: 64, height: 48 }));

/** A fresh photo of entry 1 at plot A, uploaded by the contributor (or by `by`). */
async function uploadedPhoto(w: MatrixWorld, by: Caller = 'contributor'): Promise<string> {
  const res = await request(w.t.app)
    .post(`/api/trials/${w.trial.slug}/photos`)
    .set('Origin', TEST_ORIGIN)
    .set('Cookie', w.cookies[by]!)
    .field('caption', 'Matrix pods on the bench')
    .field('plotId', w.plotA)
    .attach('photo', await photoFile(), { filename: 'pods.jpg', contentType: 'image/jpeg' });
  if (res.status !== 201) throw new Error(`matrix photo upload failed: ${res.status} ${res.text}`);
  return res.body.photos[0].id;
}

async function deletedPhoto(w: MatrixWorld): Promise<string> {
  const id = await uploadedPhoto(w);
  await w.t.db
    .updateTable('photos')
    .set({ deleted_at: new Date(), purge_after: new Date(Date.now() + 3_600_000) })
    .where('id', '=', id)
    .execute();
  return id;
}

/** The uploader (here the contributor) and the lead may change a photo. */
const uploaderOrLead = (ok = 200): Record<Caller, number> => ({
  anonymous: 404,
  viewer: 403,
  contributor: ok,
  growerInSite: 403,
  growerOtherSite: 403,
  lead: ok,
  admin: ok,
});

const base = (w: MatrixWorld) => `/api/trials/${w.trial.slug}/photos`;

export const rows: MatrixRow[] = [
  {
    method: 'GET',
    route: '/api/trials/:slug/photos',
    request: (w) => ({ url: base(w) }),
    expect: memberRead,
  },
  {
    method: 'GET',
    route: '/api/trials/:slug/photos/tagging',
    request: (w) => ({ url: `${base(w)}/tagging` }),
    expect: memberRead,
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/photos',
    request: async (w) => ({
      url: base(w),
      fields: { caption: 'Okra leaf, upper side', entryId: w.entries[1] },
      attach: [
        {
          field: 'photo',
          file: await photoFile(),
          filename: 'leaf.jpg',
          contentType: 'image/jpeg',
        },
      ],
    }),
    expect: {
      anonymous: 404,
      viewer: 403,
      contributor: 201,
      growerInSite: 201,
      growerOtherSite: 201,
      lead: 201,
      admin: 201,
    },
  },
  {
    method: 'PATCH',
    route: '/api/trials/:slug/photos/:photoId',
    request: async (w) => ({
      url: `${base(w)}/${await uploadedPhoto(w)}`,
      body: { caption: 'Pods at first pick' },
    }),
    expect: uploaderOrLead(),
  },
  {
    method: 'DELETE',
    route: '/api/trials/:slug/photos/:photoId',
    request: async (w) => ({ url: `${base(w)}/${await uploadedPhoto(w)}` }),
    expect: uploaderOrLead(),
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/photos/:photoId/restore',
    request: async (w) => ({ url: `${base(w)}/${await deletedPhoto(w)}/restore` }),
    expect: uploaderOrLead(),
  },
  {
    method: 'PUT',
    route: '/api/trials/:slug/photos/:photoId/cover',
    request: async (w) => ({ url: `${base(w)}/${await uploadedPhoto(w)}/cover` }),
    expect: leadOnly(),
  },
  {
    method: 'DELETE',
    route: '/api/trials/:slug/photos/:photoId/cover',
    request: async (w) => ({ url: `${base(w)}/${await uploadedPhoto(w)}/cover` }),
    expect: leadOnly(),
  },
  {
    method: 'GET',
    route: '/api/trials/:slug/photos/:photoId/:variant',
    request: async (w) => ({ url: `${base(w)}/${await uploadedPhoto(w)}/thumb` }),
    expect: memberRead,
  },
  {
    // The full-size original: its uploader (the contributor) and the lead only.
    method: 'GET',
    route: '/api/trials/:slug/photos/:photoId/:variant',
    request: async (w) => ({ url: `${base(w)}/${await uploadedPhoto(w)}/original` }),
    expect: uploaderOrLead(),
  },
];
