/**
 * Invitations end to end: the lead invites, the letter arrives at the real SMTP capture server,
 * the link signs the person up (or they sign in) and joins them; old, used, withdrawn and
 * replaced links are refused. Mail failures: tests/api/mail-queue.test.ts.
 */
import crypto from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashInvitationToken } from '../../server/invitations/invitation-token';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
} from '../support/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t.close();
});

const uniqueEmail = (label: string) => `${label}-${crypto.randomUUID().slice(0, 8)}@test.example`;

async function trialWithLead() {
  const slug = `inv-${crypto.randomUUID().slice(0, 8)}`;
  const trial = await t.db
    .insertInto('trials')
    .values({
      slug,
      title: 'Bush beans at Tansy Hill',
      crop: 'Bush bean',
      season: '2026',
      design: 'rcbd',
      status: 'active',
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  const sites = await t.db
    .insertInto('sites')
    .values([
      { trial_id: trial.id, name: 'Tansy Hill Plot' },
      { trial_id: trial.id, name: 'Orchard Corner' },
    ])
    .returning(['id', 'name'])
    .execute();
  const lead = await createUser(t.db, { name: 'Hester Quill' });
  await t.db
    .insertInto('trial_members')
    .values({ trial_id: trial.id, user_id: lead.id, role: 'lead' })
    .execute();
  return { id: trial.id, slug, sites, lead, leadCookie: await mintSessionCookie(t, lead) };
}

const send = (method: 'post' | 'delete' | 'get', url: string, cookie?: string, body?: object) => {
  let r = request(t.app)[method](url).set('Origin', TEST_ORIGIN);
  if (cookie) r = r.set('Cookie', cookie);
  return body ? r.send(body) : r;
};

/** The token from the letter's link (it travels in the fragment). */
const tokenIn = (links: string[]) => {
  const link = links.find((l) => l.includes('/invitations/accept#token='))!;
  return new URL(link).hash.replace('#token=', '');
};

async function invite(trial: Awaited<ReturnType<typeof trialWithLead>>, body: object) {
  const res = await send('post', `/api/trials/${trial.slug}/invitations`, trial.leadCookie, body);
  expect(res.status).toBe(201);
  const email = (body as { email: string }).email.toLowerCase();
  const mail = await t.mailbox.waitFor(
    (m) => m.to.includes(email) && m.subject.includes('invites you'),
  );
  return { invitation: res.body, mail, token: tokenIn(mail.links) };
}

describe('inviting by e-mail', () => {
  it('stores only a hash of the link token, with a 7-day expiry, and mails a plain and an HTML letter', async () => {
    const trial = await trialWithLead();
    const email = uniqueEmail('Grower').replace('grower', 'Grower');
    const before = Date.now();
    const { invitation, mail, token } = await invite(trial, {
      email,
      role: 'grower',
      siteIds: [trial.sites[0]!.id],
    });
    expect(invitation).toMatchObject({
      email: email.toLowerCase(),
      role: 'grower',
      siteIds: [trial.sites[0]!.id],
      state: 'pending',
      // Queued with the invitation; the queue's worker sends it (tests/api/mail-queue.test.ts).
      mailStatus: 'pending',
      sendAttempts: 1,
      invitedBy: 'Hester Quill',
    });
    await expect
      .poll(async () => {
        const list = await send('get', `/api/trials/${trial.slug}/invitations`, trial.leadCookie);
        return list.body.invitations[0].mailStatus;
      })
      .toBe('sent');
    const lifetime = new Date(invitation.expiresAt).getTime() - before;
    expect(lifetime).toBeGreaterThanOrEqual(7 * 86_400_000 - 5_000);
    expect(lifetime).toBeLessThanOrEqual(7 * 86_400_000 + 5_000);

    expect(mail.subject).toBe('Hester Quill invites you to “Bush beans at Tansy Hill” on Rowtally');
    expect(mail.text).toContain('as grower');
    expect(mail.text).toContain('Your sites: Tansy Hill Plot.');
    expect(mail.html).toContain('Join the trial');
    expect(mail.html).not.toMatch(/<img/i);
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);

    const row = await t.db
      .selectFrom('invitations')
      .selectAll()
      .where('id', '=', invitation.id)
      .executeTakeFirstOrThrow();
    // sha256 of the token (FIPS 180-4), computed here independently of the app.
    expect(row.token_hash).toBe(crypto.createHash('sha256').update(token).digest('hex'));
    expect(JSON.stringify(row)).not.toContain(token);
  });

  it('lists open invitations for the lead, refuses a duplicate and an existing member', async () => {
    const trial = await trialWithLead();
    const email = uniqueEmail('viewer');
    await invite(trial, { email, role: 'viewer' });
    const again = await send('post', `/api/trials/${trial.slug}/invitations`, trial.leadCookie, {
      email,
      role: 'viewer',
    });
    expect(again.status).toBe(409);
    expect(again.body.error.details.fields[0]).toEqual({
      path: 'body.email',
      message: 'Already invited; resend the invitation.',
    });
    const member = await send('post', `/api/trials/${trial.slug}/invitations`, trial.leadCookie, {
      email: trial.lead.email,
      role: 'viewer',
    });
    expect(member.status).toBe(409);
    const list = await send('get', `/api/trials/${trial.slug}/invitations`, trial.leadCookie);
    expect(list.body.invitations.map((i: { email: string }) => i.email)).toEqual([email]);
  });

  it('refuses malformed input with the field, and writes nothing', async () => {
    const trial = await trialWithLead();
    const cases = [
      [{ email: 'not an address', role: 'viewer' }, 'body.email'],
      [{ email: uniqueEmail('x'), role: 'boss' }, 'body.role'],
      [{ email: uniqueEmail('x'), role: 'viewer', siteIds: [trial.sites[0]!.id] }, 'body.siteIds'],
      [{ email: uniqueEmail('x'), role: 'grower', siteIds: ['not-a-uuid'] }, 'body.siteIds.0'],
      [{ email: uniqueEmail('x'), role: 'grower', siteIds: [crypto.randomUUID()] }, 'body.siteIds'],
    ] as const;
    for (const [body, path] of cases) {
      const res = await send(
        'post',
        `/api/trials/${trial.slug}/invitations`,
        trial.leadCookie,
        body,
      );
      expect(res.status).toBe(400);
      expect(res.body.error.details.fields[0].path).toBe(path);
    }
    const rows = await t.db
      .selectFrom('invitations')
      .select('id')
      .where('trial_id', '=', trial.id)
      .execute();
    expect(rows).toEqual([]);
  });
});

describe('opening the link', () => {
  it('shows what the link offers, signs a new person up as verified, joins them with their sites, and signs them in', async () => {
    const trial = await trialWithLead();
    const email = uniqueEmail('newbie');
    const { token } = await invite(trial, { email, role: 'grower', siteIds: [trial.sites[1]!.id] });

    const preview = await send('post', '/api/invitations/lookup', undefined, { token });
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({
      trial: { slug: trial.slug, title: 'Bush beans at Tansy Hill' },
      email,
      role: 'grower',
      siteNames: ['Orchard Corner'],
      invitedBy: 'Hester Quill',
      state: 'pending',
      accountExists: false,
    });

    const res = await send('post', '/api/invitations/sign-up', undefined, {
      token,
      name: 'Pim Okonkwo-Reyes',
      password: 'okra-rows-forever',
    });
    expect(res.status).toBe(201);
    expect(res.body).toEqual({ trialSlug: trial.slug, role: 'grower', alreadyMember: false });
    const cookie = (res.headers['set-cookie'] as unknown as string[])
      .find((c) => c.startsWith('rowtally.session_token='))!
      .split(';')[0]!;
    const me = await request(t.app).get('/api/me').set('Cookie', cookie);
    expect(me.body).toMatchObject({ email, name: 'Pim Okonkwo-Reyes', emailVerified: true });

    const seen = await request(t.app).get(`/api/trials/${trial.slug}`).set('Cookie', cookie);
    expect(seen.status).toBe(200);
    expect(seen.body.myRole).toBe('grower');
    expect(seen.body.permissions).toMatchObject({
      'records.write': true,
      'trial.edit': false,
      'members.manage': false,
    });
    const sites = await t.db
      .selectFrom('trial_member_sites')
      .select('site_id')
      .where('user_id', '=', me.body.id)
      .execute();
    expect(sites.map((s) => s.site_id)).toEqual([trial.sites[1]!.id]);

    // The link works once.
    const again = await send('post', '/api/invitations/sign-up', undefined, {
      token,
      name: 'Second Go',
      password: 'okra-rows-forever',
    });
    expect(again.status).toBe(409);
    expect(again.body.error.details).toEqual({ reason: 'accepted' });
    const lookup = await send('post', '/api/invitations/lookup', undefined, { token });
    expect(lookup.body.state).toBe('accepted');
  });

  it('lets someone with an account sign in and accept, only with the invited address', async () => {
    const trial = await trialWithLead();
    const invitee = await createUser(t.db, { email: uniqueEmail('known'), name: 'Known Grower' });
    const other = await createUser(t.db, { email: uniqueEmail('other') });
    const { token } = await invite(trial, { email: invitee.email, role: 'contributor' });
    expect(
      (await send('post', '/api/invitations/lookup', undefined, { token })).body.accountExists,
    ).toBe(true);

    expect((await send('post', '/api/invitations/accept', undefined, { token })).status).toBe(401);
    const wrong = await send('post', '/api/invitations/accept', await mintSessionCookie(t, other), {
      token,
    });
    expect(wrong.status).toBe(403);
    expect(wrong.body.error.details).toEqual({ reason: 'other_address' });

    const signUp = await send('post', '/api/invitations/sign-up', undefined, {
      token,
      name: 'Taker',
      password: 'takeover-attempt-1',
    });
    expect(signUp.status).toBe(409);
    expect(signUp.body.error.details).toEqual({ reason: 'account_exists' });

    const ok = await send('post', '/api/invitations/accept', await mintSessionCookie(t, invitee), {
      token,
    });
    expect(ok.status).toBe(200);
    expect(ok.body).toEqual({ trialSlug: trial.slug, role: 'contributor', alreadyMember: false });
    const role = await t.db
      .selectFrom('trial_members')
      .select('role')
      .where('trial_id', '=', trial.id)
      .where('user_id', '=', invitee.id)
      .executeTakeFirst();
    expect(role?.role).toBe('contributor');
  });

  it('never demotes someone already in the trial', async () => {
    const trial = await trialWithLead();
    const { token } = await invite(trial, { email: uniqueEmail('colead'), role: 'viewer' });
    // The invitation's address changes hands to the lead (e.g. an alias): accepting keeps them lead.
    await t.db
      .updateTable('invitations')
      .set({ email: trial.lead.email.toLowerCase() })
      .where('token_hash', '=', hashInvitationToken(token))
      .execute();
    const res = await send('post', '/api/invitations/accept', trial.leadCookie, { token });
    expect(res.body).toEqual({ trialSlug: trial.slug, role: 'viewer', alreadyMember: true });
    const role = await t.db
      .selectFrom('trial_members')
      .select('role')
      .where('user_id', '=', trial.lead.id)
      .executeTakeFirst();
    expect(role?.role).toBe('lead');
  });

  it('refuses an expired link, a withdrawn one, a replaced one and a made-up one', async () => {
    const trial = await trialWithLead();
    const expired = await invite(trial, { email: uniqueEmail('late'), role: 'viewer' });
    await t.db
      .updateTable('invitations')
      .set({
        expires_at: new Date(Date.now() - 1000),
        created_at: new Date(Date.now() - 8 * 86_400_000),
      })
      .where('id', '=', expired.invitation.id)
      .execute();
    const e = await send('post', '/api/invitations/sign-up', undefined, {
      token: expired.token,
      name: 'Late',
      password: 'late-but-keen-1',
    });
    expect(e.status).toBe(409);
    expect(e.body.error.details).toEqual({ reason: 'expired' });
    expect(e.body.error.message).toContain('7 days');

    const revoked = await invite(trial, { email: uniqueEmail('withdrawn'), role: 'viewer' });
    expect(
      (
        await send(
          'delete',
          `/api/trials/${trial.slug}/invitations/${revoked.invitation.id}`,
          trial.leadCookie,
        )
      ).status,
    ).toBe(204);
    const r = await send('post', '/api/invitations/sign-up', undefined, {
      token: revoked.token,
      name: 'Nope',
      password: 'withdrawn-link-1',
    });
    expect(r.status).toBe(409);
    expect(r.body.error.details).toEqual({ reason: 'revoked' });

    const replaced = await invite(trial, { email: uniqueEmail('resent'), role: 'viewer' });
    t.mailbox.clear();
    const resend = await send(
      'post',
      `/api/trials/${trial.slug}/invitations/${replaced.invitation.id}/resend`,
      trial.leadCookie,
    );
    expect(resend.status).toBe(200);
    expect(resend.body).toMatchObject({
      state: 'pending',
      sendAttempts: 2,
      mailStatus: 'pending',
    });
    const newMail = await t.mailbox.waitFor((m) => m.to.includes(replaced.invitation.email));
    const newToken = tokenIn(newMail.links);
    expect(newToken).not.toBe(replaced.token);
    expect(
      (await send('post', '/api/invitations/lookup', undefined, { token: replaced.token })).status,
    ).toBe(404);
    expect(
      (await send('post', '/api/invitations/lookup', undefined, { token: newToken })).body.state,
    ).toBe('pending');

    const madeUp = crypto.randomBytes(32).toString('base64url');
    expect(
      (await send('post', '/api/invitations/lookup', undefined, { token: madeUp })).status,
    ).toBe(404);
    const malformed = await send('post', '/api/invitations/lookup', undefined, { token: 'short' });
    expect(malformed.status).toBe(400);
    expect(malformed.body.error.details.fields[0].path).toBe('body.token');

    // Nobody joined through any of them.
    const members = await t.db
      .selectFrom('trial_members')
      .select('user_id')
      .where('trial_id', '=', trial.id)
      .execute();
    expect(members).toHaveLength(1);
  });

  it('lets one link be used once even when it is used twice at the same moment', async () => {
    const trial = await trialWithLead();
    const { token } = await invite(trial, { email: uniqueEmail('twice'), role: 'viewer' });
    const results = await Promise.all([
      send('post', '/api/invitations/sign-up', undefined, {
        token,
        name: 'First Tab',
        password: 'two-tabs-open-1',
      }),
      send('post', '/api/invitations/sign-up', undefined, {
        token,
        name: 'Second Tab',
        password: 'two-tabs-open-1',
      }),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual([201, 409]);
    const members = await t.db
      .selectFrom('trial_members')
      .select('user_id')
      .where('trial_id', '=', trial.id)
      .execute();
    expect(members).toHaveLength(2);
  });

  it('refuses an over-long name or short password on sign-up and creates nothing', async () => {
    const trial = await trialWithLead();
    const email = uniqueEmail('careful');
    const { token } = await invite(trial, { email, role: 'viewer' });
    const res = await send('post', '/api/invitations/sign-up', undefined, {
      token,
      name: 'n'.repeat(121),
      password: 'short',
    });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.map((f: { path: string }) => f.path).sort()).toEqual([
      'body.name',
      'body.password',
    ]);
    expect(
      await t.db.selectFrom('users').select('id').where('email', '=', email).execute(),
    ).toEqual([]);
    expect((await send('post', '/api/invitations/lookup', undefined, { token })).body.state).toBe(
      'pending',
    );
  });
});
