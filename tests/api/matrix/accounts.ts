/** Matrix rows for members and invitations (the account routes under /api/me are in foundation.ts). */
import crypto from 'node:crypto';
import { newInvitationToken } from '../../../server/invitations/invitation-token';
import { createUser } from '../../support/test-app';
import { type Caller, leadOnly, type MatrixRow } from './matrix-types';
import type { MatrixWorld } from './matrix-world';

const everyone = (status: number): Record<Caller, number> => ({
  anonymous: status,
  viewer: status,
  contributor: status,
  growerInSite: status,
  growerOtherSite: status,
  lead: status,
  admin: status,
});

/** A viewer added just for this request, so removing or changing one leaves the world as it was. */
async function extraViewer(w: MatrixWorld) {
  const user = await createUser(w.t.db, { name: 'Matrix Extra' });
  await w.t.db
    .insertInto('trial_members')
    .values({ trial_id: w.trial.id, user_id: user.id, role: 'viewer' })
    .execute();
  return user;
}

async function openInvitation(w: MatrixWorld, opts: { trialId?: string; email?: string } = {}) {
  const { token, hash } = newInvitationToken();
  const row = await w.t.db
    .insertInto('invitations')
    .values({
      trial_id: opts.trialId ?? w.trial.id,
      email: opts.email ?? `invitee-${crypto.randomUUID().slice(0, 8)}@test.example`,
      role: 'viewer',
      token_hash: hash,
      invited_by: w.users.lead.id,
      expires_at: new Date(Date.now() + 86_400_000),
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return { id: row.id, token };
}

/** Another trial with nobody in it, so accepting an invitation leaves the matrix trial alone. */
async function sideTrial(w: MatrixWorld) {
  const slug = `side-${crypto.randomUUID().slice(0, 8)}`;
  return w.t.db
    .insertInto('trials')
    .values({ slug, title: 'Side trial', crop: 'Okra', season: '2026', design: 'crd' })
    .returning('id')
    .executeTakeFirstOrThrow();
}

export const rows: MatrixRow[] = [
  {
    method: 'GET',
    route: '/api/trials/:slug/members',
    request: (w) => ({ url: `/api/trials/${w.trial.slug}/members` }),
    expect: leadOnly(200),
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/members',
    request: async (w) => {
      const user = await createUser(w.t.db, { name: 'Matrix Added' });
      return {
        url: `/api/trials/${w.trial.slug}/members`,
        body: { email: user.email, role: 'contributor' },
      };
    },
    // Putting an account straight into a trial is the administrators' recovery action.
    expect: { ...leadOnly(403), lead: 403, admin: 201 },
  },
  {
    method: 'PATCH',
    route: '/api/trials/:slug/members/:userId',
    request: async (w) => ({
      url: `/api/trials/${w.trial.slug}/members/${(await extraViewer(w)).id}`,
      body: { role: 'contributor' },
    }),
    expect: leadOnly(200),
  },
  {
    method: 'DELETE',
    route: '/api/trials/:slug/members/:userId',
    request: async (w) => ({
      url: `/api/trials/${w.trial.slug}/members/${(await extraViewer(w)).id}`,
    }),
    expect: leadOnly(204),
  },
  {
    method: 'GET',
    route: '/api/trials/:slug/invitations',
    request: (w) => ({ url: `/api/trials/${w.trial.slug}/invitations` }),
    expect: leadOnly(200),
  },
  {
    method: 'GET',
    route: '/api/trials/:slug/mail',
    request: (w) => ({ url: `/api/trials/${w.trial.slug}/mail` }),
    expect: leadOnly(200),
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/invitations',
    request: (w) => ({
      url: `/api/trials/${w.trial.slug}/invitations`,
      body: { email: `new-${crypto.randomUUID().slice(0, 8)}@test.example`, role: 'viewer' },
    }),
    expect: leadOnly(201),
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/invitations/:invitationId/resend',
    request: async (w) => ({
      url: `/api/trials/${w.trial.slug}/invitations/${(await openInvitation(w)).id}/resend`,
    }),
    expect: leadOnly(200),
  },
  {
    method: 'DELETE',
    route: '/api/trials/:slug/invitations/:invitationId',
    request: async (w) => ({
      url: `/api/trials/${w.trial.slug}/invitations/${(await openInvitation(w)).id}`,
    }),
    expect: leadOnly(204),
  },
  {
    method: 'POST',
    route: '/api/invitations/lookup',
    // Whoever holds the link may read what it offers.
    request: async (w) => ({
      url: '/api/invitations/lookup',
      body: { token: (await openInvitation(w)).token },
    }),
    expect: everyone(200),
  },
  {
    method: 'POST',
    route: '/api/invitations/accept',
    // Each caller accepts an invitation sent to their own address, in a trial of its own.
    request: async (w, caller) => {
      const trial = await sideTrial(w);
      const email = caller === 'anonymous' ? undefined : w.users[caller].email;
      return {
        url: '/api/invitations/accept',
        body: { token: (await openInvitation(w, { trialId: trial.id, email })).token },
      };
    },
    expect: { ...everyone(200), anonymous: 401 },
  },
  {
    method: 'POST',
    route: '/api/invitations/sign-up',
    request: async (w) => {
      const trial = await sideTrial(w);
      return {
        url: '/api/invitations/sign-up',
        body: {
          token: (await openInvitation(w, { trialId: trial.id })).token,
          name: 'Matrix Newcomer',
          password: 'a-long-enough-password',
        },
      };
    },
    expect: everyone(201),
  },
];
