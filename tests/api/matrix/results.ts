/**
 * The results sheet, its public side and the comparison views. Publishing changes a trial's
 * status, so those rows act on a fresh copy of the matrix trial (same members) and leave the
 * shared trial as every other row expects it.
 */
import crypto from 'node:crypto';
import { type Caller, leadOnly, type MatrixRow, memberRead } from './matrix-types';
import { type MatrixWorld, trialWithWorldMembers } from './matrix-world';
import { publish } from '../../../server/results/results-service';

const everyone = (status: number): Record<Caller, number> => ({
  anonymous: status,
  viewer: status,
  contributor: status,
  growerInSite: status,
  growerOtherSite: status,
  lead: status,
  admin: status,
});

/** A copy of the matrix trial's membership on a new trial, optionally already published. */
async function trialCopy(w: MatrixWorld, published: boolean): Promise<string> {
  const { slug } = await trialWithWorldMembers(w, 'copy');
  if (published) {
    const deps = { db: w.t.db, mail: w.t.runtime.mail, baseUrl: 'http://127.0.0.1:3999' };
    await publish(deps, slug, { userId: w.users.lead.id, isAdmin: false }, '');
  }
  return slug;
}

const sheet = (w: MatrixWorld) => `/api/trials/${w.trial.slug}/results-sheet`;
const validSheet = {
  summary: 'A matrix season.',
  methods: null,
  traits: [{ key: 'plant_height', basis: 'plot', weight: 1 }],
  entryNotes: {},
  coverPhotos: {},
  alpha: 0.05,
  letters: 'hsd',
  license: 'CC-BY-4.0',
};
// A published trial is visible: signed-out callers are asked to sign in rather than told 404.
const leadOnPublished = (ok: number): Record<Caller, number> => ({
  ...leadOnly(ok),
  anonymous: 401,
});

export const rows: MatrixRow[] = [
  {
    method: 'GET',
    route: '/api/trials/:slug/results-sheet',
    request: (w) => ({ url: sheet(w) }),
    expect: leadOnly(200),
  },
  {
    method: 'PUT',
    route: '/api/trials/:slug/results-sheet',
    request: (w) => ({ url: sheet(w), body: validSheet }),
    expect: leadOnly(200),
  },
  // No plant heights are recorded in the matrix world: the preview leaves that trait off and still answers.
  {
    method: 'GET',
    route: '/api/trials/:slug/results-sheet/preview',
    request: (w) => ({ url: `${sheet(w)}/preview` }),
    expect: leadOnly(200),
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/results-sheet/publish',
    request: async (w) => ({
      url: `/api/trials/${await trialCopy(w, false)}/results-sheet/publish`,
      body: { changeNote: '' },
    }),
    expect: leadOnly(201),
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/results-sheet/unpublish',
    request: async (w) => ({
      url: `/api/trials/${await trialCopy(w, true)}/results-sheet/unpublish`,
    }),
    expect: leadOnPublished(204),
  },
  {
    method: 'GET',
    route: '/api/results',
    request: () => ({ url: '/api/results?q=okra' }),
    expect: everyone(200),
  },
  {
    method: 'GET',
    route: '/api/results/:slug',
    request: async (w) => ({ url: `/api/results/${await trialCopy(w, true)}` }),
    expect: everyone(200),
  },
  {
    method: 'GET',
    route: '/api/results/:slug/versions',
    request: async (w) => ({ url: `/api/results/${await trialCopy(w, true)}/versions` }),
    expect: everyone(200),
  },
  {
    method: 'POST',
    route: '/api/results/:slug/followers',
    request: async (w) => ({
      url: `/api/results/${await trialCopy(w, true)}/followers`,
      body: { email: 'reader@test.example' },
    }),
    expect: everyone(202),
  },
  {
    method: 'POST',
    route: '/api/results/followers/confirm',
    request: () => ({ url: '/api/results/followers/confirm', body: { token: 'x'.repeat(43) } }),
    expect: everyone(404),
  },
  {
    method: 'POST',
    route: '/api/results/unsubscribe',
    request: () => ({ url: `/api/results/unsubscribe?token=${'y'.repeat(43)}` }),
    expect: everyone(404),
  },
  // The unpublished matrix trial: nothing of it is public.
  {
    method: 'GET',
    route: '/api/results/:slug/v/:version',
    request: (w) => ({ url: `/api/results/${w.trial.slug}/v/1` }),
    expect: everyone(404),
  },
  {
    method: 'GET',
    route: '/api/results/:slug/v/:version/results.json',
    request: (w) => ({ url: `/api/results/${w.trial.slug}/v/1/results.json` }),
    expect: everyone(404),
  },
  {
    method: 'GET',
    route: '/api/results/:slug/v/:version/means.csv',
    request: (w) => ({ url: `/api/results/${w.trial.slug}/v/1/means.csv` }),
    expect: everyone(404),
  },
  {
    method: 'GET',
    route: '/api/results/:slug/v/:version/plots.csv',
    request: (w) => ({ url: `/api/results/${w.trial.slug}/v/1/plots.csv` }),
    expect: everyone(404),
  },
  {
    method: 'GET',
    route: '/api/results/:slug/v/:version/sheet.pdf',
    request: (w) => ({ url: `/api/results/${w.trial.slug}/v/1/sheet.pdf` }),
    expect: everyone(404),
  },
  {
    method: 'GET',
    route: '/api/results/:slug/v/:version/photos/:photoId/:variant',
    request: (w) => ({
      url: `/api/results/${w.trial.slug}/v/1/photos/${crypto.randomUUID()}/thumb`,
    }),
    expect: everyone(404),
  },
  {
    method: 'GET',
    route: '/api/trials/:slug/comparison/harvest-curve',
    request: (w) => ({ url: `/api/trials/${w.trial.slug}/comparison/harvest-curve` }),
    expect: memberRead,
  },
  // Permission passes for members; with no heights recorded the analysis answers 422.
  {
    method: 'GET',
    route: '/api/trials/:slug/comparison/entry-site',
    request: (w) => ({
      url: `/api/trials/${w.trial.slug}/comparison/entry-site?trait=plant_height`,
    }),
    expect: {
      ...memberRead,
      viewer: 422,
      contributor: 422,
      growerInSite: 422,
      growerOtherSite: 422,
      lead: 422,
      admin: 422,
    },
  },
];
