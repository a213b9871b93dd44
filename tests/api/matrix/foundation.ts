import crypto from 'node:crypto';
import { leadOnly, memberRead, type MatrixRow } from './matrix-types';
import type { MatrixWorld } from './matrix-world';

/** Deleting is for keeps: each caller gets a trial of its own with the world's members. */
async function disposableTrial(w: MatrixWorld): Promise<string> {
  const slug = `doomed-${crypto.randomBytes(4).toString('hex')}`;
  const trial = await w.t.db
    .insertInto('trials')
    .values({ slug, title: 'Disposable', crop: 'Okra', season: '2026', design: 'crd' })
    .returning('id')
    .executeTakeFirstOrThrow();
  const members = await w.t.db
    .selectFrom('trial_members')
    .select(['user_id', 'role'])
    .where('trial_id', '=', w.trial.id)
    .execute();
  await w.t.db
    .insertInto('trial_members')
    .values(members.map((m) => ({ trial_id: trial.id, user_id: m.user_id, role: m.role })))
    .execute();
  return slug;
}

const signedIn = {
  anonymous: 401,
  viewer: 200,
  contributor: 200,
  growerInSite: 200,
  growerOtherSite: 200,
  lead: 200,
  admin: 200,
};

export const rows: MatrixRow[] = [
  { method: 'GET', route: '/api/me', request: () => ({ url: '/api/me' }), expect: signedIn },
  {
    method: 'PATCH',
    route: '/api/me',
    request: () => ({ url: '/api/me', body: { unitSystem: 'us' } }),
    expect: signedIn,
  },
  {
    method: 'GET',
    route: '/api/session',
    request: () => ({ url: '/api/session' }),
    expect: {
      anonymous: 200,
      viewer: 200,
      contributor: 200,
      growerInSite: 200,
      growerOtherSite: 200,
      lead: 200,
      admin: 200,
    },
  },
  {
    method: 'GET',
    route: '/api/trials',
    request: () => ({ url: '/api/trials' }),
    expect: {
      anonymous: 200,
      viewer: 200,
      contributor: 200,
      growerInSite: 200,
      growerOtherSite: 200,
      lead: 200,
      admin: 200,
    },
  },
  {
    method: 'GET',
    route: '/api/trials/:slug',
    request: (w) => ({ url: `/api/trials/${w.trial.slug}` }),
    expect: memberRead,
  },
  {
    method: 'DELETE',
    route: '/api/trials/:slug',
    request: async (w) => {
      const slug = await disposableTrial(w);
      return { url: `/api/trials/${slug}`, body: { confirmSlug: slug } };
    },
    expect: leadOnly(204),
  },
];
