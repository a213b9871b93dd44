/** Members of a trial: roles, grower sites, leaving, last-lead protection, administrators' recovery. */
import crypto from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
  type TestUser,
} from '../support/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t.close();
});

type Role = 'lead' | 'grower' | 'contributor' | 'viewer';

async function trialWith(members: Role[]) {
  const slug = `members-${crypto.randomUUID().slice(0, 8)}`;
  const trial = await t.db
    .insertInto('trials')
    .values({
      slug,
      title: 'Pod length, two gardens',
      crop: 'Okra',
      season: '2026',
      design: 'rcbd',
      status: 'active',
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  const sites = await t.db
    .insertInto('sites')
    .values([
      { trial_id: trial.id, name: 'Hollin Row' },
      { trial_id: trial.id, name: 'Beck Meadow' },
    ])
    .returning(['id', 'name'])
    .execute();
  const users: (TestUser & { role: Role; cookie: string })[] = [];
  for (const role of members) {
    const user = await createUser(t.db, { name: `Member ${role} ${users.length + 1}` });
    await t.db
      .insertInto('trial_members')
      .values({ trial_id: trial.id, user_id: user.id, role })
      .execute();
    users.push({ ...user, role, cookie: await mintSessionCookie(t, user) });
  }
  return { id: trial.id, slug, sites, users };
}

const as = (cookie: string | null) => ({
  get: (url: string) => {
    const r = request(t.app).get(url);
    return cookie ? r.set('Cookie', cookie) : r;
  },
  patch: (url: string, body: object) => {
    const r = request(t.app).patch(url).set('Origin', TEST_ORIGIN).send(body);
    return cookie ? r.set('Cookie', cookie) : r;
  },
  post: (url: string, body: object) => {
    const r = request(t.app).post(url).set('Origin', TEST_ORIGIN).send(body);
    return cookie ? r.set('Cookie', cookie) : r;
  },
  delete: (url: string) => {
    const r = request(t.app).delete(url).set('Origin', TEST_ORIGIN);
    return cookie ? r.set('Cookie', cookie) : r;
  },
});

const roleOf = async (trialId: string, userId: string) =>
  (
    await t.db
      .selectFrom('trial_members')
      .select('role')
      .where('trial_id', '=', trialId)
      .where('user_id', '=', userId)
      .executeTakeFirst()
  )?.role ?? null;

describe('the members list', () => {
  it('shows a lead every member with role, sites and the trial’s sites to choose from', async () => {
    const trial = await trialWith(['lead', 'grower', 'viewer']);
    const [lead, grower] = trial.users;
    await t.db
      .insertInto('trial_member_sites')
      .values({ trial_id: trial.id, user_id: grower!.id, site_id: trial.sites[0]!.id })
      .execute();
    const res = await as(lead!.cookie).get(`/api/trials/${trial.slug}/members`);
    expect(res.status).toBe(200);
    expect(res.body.leadCount).toBe(1);
    expect(res.body.sites.map((s: { name: string }) => s.name)).toEqual([
      'Beck Meadow',
      'Hollin Row',
    ]);
    expect(res.body.members.map((m: { role: string }) => m.role)).toEqual([
      'lead',
      'grower',
      'viewer',
    ]);
    expect(res.body.members[0]).toMatchObject({ userId: lead!.id, isYou: true, siteIds: [] });
    expect(res.body.members[1]).toMatchObject({
      userId: grower!.id,
      isYou: false,
      siteIds: [trial.sites[0]!.id],
    });
  });
});

describe('changing a member', () => {
  it('changes a role and limits a grower to chosen sites', async () => {
    const trial = await trialWith(['lead', 'viewer']);
    const [lead, viewer] = trial.users;
    const res = await as(lead!.cookie).patch(`/api/trials/${trial.slug}/members/${viewer!.id}`, {
      role: 'grower',
      siteIds: [trial.sites[1]!.id],
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ role: 'grower', siteIds: [trial.sites[1]!.id] });
    // The grower's own view of the trial says what they may do.
    const seen = await as(viewer!.cookie).get(`/api/trials/${trial.slug}`);
    expect(seen.body.myRole).toBe('grower');
    expect(seen.body.permissions).toMatchObject({ 'records.write': true, 'members.manage': false });
    // Back to viewer: the site limits go with the grower role.
    const back = await as(lead!.cookie).patch(`/api/trials/${trial.slug}/members/${viewer!.id}`, {
      role: 'viewer',
    });
    expect(back.body).toMatchObject({ role: 'viewer', siteIds: [] });
    const left = await t.db
      .selectFrom('trial_member_sites')
      .select('site_id')
      .where('user_id', '=', viewer!.id)
      .execute();
    expect(left).toEqual([]);
  });

  it('refuses sites for a non-grower, a site of another trial, and an unknown role, changing nothing', async () => {
    const trial = await trialWith(['lead', 'grower']);
    const other = await trialWith(['lead']);
    const [lead, grower] = trial.users;
    const url = `/api/trials/${trial.slug}/members/${grower!.id}`;
    const a = await as(lead!.cookie).patch(url, { role: 'viewer', siteIds: [trial.sites[0]!.id] });
    expect(a.status).toBe(400);
    expect(a.body.error.details.fields).toContainEqual({
      path: 'body.siteIds',
      message: 'Only growers are limited to sites; leave the sites empty for this role.',
    });
    const b = await as(lead!.cookie).patch(url, { role: 'grower', siteIds: [other.sites[0]!.id] });
    expect(b.status).toBe(400);
    expect(b.body.error.details.fields[0].path).toBe('body.siteIds');
    const c = await as(lead!.cookie).patch(url, { role: 'owner' });
    expect(c.status).toBe(400);
    expect(c.body.error.details.fields[0].path).toBe('body.role');
    expect(await roleOf(trial.id, grower!.id)).toBe('grower');
    const sites = await t.db
      .selectFrom('trial_member_sites')
      .select('site_id')
      .where('user_id', '=', grower!.id)
      .execute();
    expect(sites).toEqual([]);
  });

  it('answers 404 for someone who is not a member', async () => {
    const trial = await trialWith(['lead']);
    const stranger = await createUser(t.db);
    const res = await as(trial.users[0]!.cookie).patch(
      `/api/trials/${trial.slug}/members/${stranger.id}`,
      { role: 'viewer' },
    );
    expect(res.status).toBe(404);
  });
});

describe('a trial always keeps a lead', () => {
  it('refuses to demote or remove the only lead, and lets them go once there is another', async () => {
    const trial = await trialWith(['lead', 'viewer']);
    const [lead, viewer] = trial.users;
    const url = `/api/trials/${trial.slug}/members/${lead!.id}`;
    const demote = await as(lead!.cookie).patch(url, { role: 'grower' });
    expect(demote.status).toBe(409);
    expect(demote.body.error).toMatchObject({ code: 'conflict', details: { reason: 'last_lead' } });
    const leave = await as(lead!.cookie).delete(url);
    expect(leave.status).toBe(409);
    expect(await roleOf(trial.id, lead!.id)).toBe('lead');

    expect(
      (
        await as(lead!.cookie).patch(`/api/trials/${trial.slug}/members/${viewer!.id}`, {
          role: 'lead',
        })
      ).status,
    ).toBe(200);
    expect((await as(lead!.cookie).delete(url)).status).toBe(204);
    expect(await roleOf(trial.id, lead!.id)).toBeNull();
    expect(await roleOf(trial.id, viewer!.id)).toBe('lead');
  });

  it('holds when two leads demote each other at the same moment', async () => {
    // Repeated, since a race that is lost once in a while is still a race.
    for (let round = 0; round < 8; round++) {
      const trial = await trialWith(['lead', 'lead']);
      const [a, b] = trial.users;
      const results = await Promise.all([
        as(a!.cookie).patch(`/api/trials/${trial.slug}/members/${b!.id}`, { role: 'viewer' }),
        as(b!.cookie).patch(`/api/trials/${trial.slug}/members/${a!.id}`, { role: 'viewer' }),
      ]);
      const statuses = results.map((r) => r.status).sort();
      // One wins; the other is refused, either as the last lead or as no longer a lead.
      expect(statuses[0]).toBe(200);
      expect([403, 409]).toContain(statuses[1]);
      const leads = await t.db
        .selectFrom('trial_members')
        .select('user_id')
        .where('trial_id', '=', trial.id)
        .where('role', '=', 'lead')
        .execute();
      expect(leads).toHaveLength(1);
    }
  });

  it('holds when both leads leave at the same moment', async () => {
    for (let round = 0; round < 8; round++) {
      const trial = await trialWith(['lead', 'lead']);
      const [a, b] = trial.users;
      const results = await Promise.all([
        as(a!.cookie).delete(`/api/trials/${trial.slug}/members/${a!.id}`),
        as(b!.cookie).delete(`/api/trials/${trial.slug}/members/${b!.id}`),
      ]);
      expect(results.map((r) => r.status).sort()).toEqual([204, 409]);
      const leads = await t.db
        .selectFrom('trial_members')
        .select('user_id')
        .where('trial_id', '=', trial.id)
        .execute();
      expect(leads).toHaveLength(1);
    }
  });
});

describe('removing and leaving', () => {
  it('lets any member leave, but only a lead remove someone else', async () => {
    const trial = await trialWith(['lead', 'grower', 'contributor']);
    const [, grower, contributor] = trial.users;
    const refused = await as(grower!.cookie).delete(
      `/api/trials/${trial.slug}/members/${contributor!.id}`,
    );
    expect(refused.status).toBe(403);
    expect(await roleOf(trial.id, contributor!.id)).toBe('contributor');
    expect(
      (await as(contributor!.cookie).delete(`/api/trials/${trial.slug}/members/${contributor!.id}`))
        .status,
    ).toBe(204);
    expect(await roleOf(trial.id, contributor!.id)).toBeNull();
    // Gone from the trial: it is no longer visible to them.
    expect((await as(contributor!.cookie).get(`/api/trials/${trial.slug}`)).status).toBe(404);
  });
});

describe('administrators recover a trial', () => {
  it('make any account lead of a trial whose lead has left', async () => {
    const trial = await trialWith(['lead', 'grower']);
    const [lead, grower] = trial.users;
    // The lead's account is deleted (e.g. they left the project); the grower remains.
    await t.db.deleteFrom('users').where('id', '=', lead!.id).execute();
    const admin = await createUser(t.db, { isAdmin: true, name: 'Instance Keeper' });
    const adminCookie = await mintSessionCookie(t, admin);
    const res = await as(adminCookie).post(`/api/trials/${trial.slug}/members`, {
      email: grower!.email,
      role: 'lead',
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ userId: grower!.id, role: 'lead' });
    const newcomer = await createUser(t.db, { name: 'Fresh Lead' });
    const added = await as(adminCookie).post(`/api/trials/${trial.slug}/members`, {
      email: newcomer.email.toUpperCase(),
      role: 'lead',
    });
    expect(added.status).toBe(201);
    expect(await roleOf(trial.id, newcomer.id)).toBe('lead');
    // The administrator did not become a member.
    expect(await roleOf(trial.id, admin.id)).toBeNull();
  });

  it('refuses the direct add to leads (they invite) and names an unknown address', async () => {
    const trial = await trialWith(['lead']);
    const someone = await createUser(t.db);
    const byLead = await as(trial.users[0]!.cookie).post(`/api/trials/${trial.slug}/members`, {
      email: someone.email,
      role: 'viewer',
    });
    expect(byLead.status).toBe(403);
    const admin = await createUser(t.db, { isAdmin: true });
    const unknown = await as(await mintSessionCookie(t, admin)).post(
      `/api/trials/${trial.slug}/members`,
      {
        email: 'nobody-here@test.example',
        role: 'lead',
      },
    );
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.details.fields[0].path).toBe('body.email');
  });
});
