import { leadOnly, memberRead, type MatrixRow } from './matrix-types';
import { trialWithWorldMembers } from './matrix-world';

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
      const { slug } = await trialWithWorldMembers(w, 'doomed', {
        title: 'Disposable',
        design: 'crd',
      });
      return { url: `/api/trials/${slug}`, body: { confirmSlug: slug } };
    },
    expect: leadOnly(204),
  },
];
