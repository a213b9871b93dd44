/**
 * Next season in one step: copying a trial carries its entries, sites, traits and settings (the
 * results sheet's too) into a new trial with a new layout seed, and no records; the copy links
 * back to the trial it came from, but only for someone allowed to see that trial. The checks compare the copy with the
 * demo season's okra trial it is made from, and the new layout with the layout generator run
 * again on the seed the copy reports.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomizeLayout } from '../../common/layout';
import { type Actor, canGroup, groupActions } from '../../common/policy';
import type { GroupRole } from '../../common/contracts/varieties';
import { demoAccounts } from '../../db/seed/demo-season';
import { seedDemoIfEmpty } from '../../db/seed/seed';
import { groupAllows, groupForAction } from '../../server/trials/trials-service';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
  type TestUser,
} from '../support/test-app';

const SLUG = 'larkhaven-okra-2026';
let t: TestApp;

beforeAll(async () => {
  t = await createTestApp();
  await seedDemoIfEmpty(t.db);
}, 60_000);
afterAll(async () => {
  await t.close();
});

const cookieOf = (key: string) =>
  mintSessionCookie(
    t,
    demoAccounts.find((a) => a.key === key)!,
  );
const copy = async (key: string, body: object, slug = SLUG) =>
  request(t.app)
    .post(`/api/trials/${slug}/copy`)
    .set('Origin', TEST_ORIGIN)
    .set('Cookie', await cookieOf(key))
    .send(body);

/** A new user made a second lead of the source trial, copying it. */
async function copyAsNewLead(user: TestUser, title: string) {
  const source = await trialBySlug(SLUG);
  await t.db
    .insertInto('trial_members')
    .values({ trial_id: source.id, user_id: user.id, role: 'lead' })
    .execute();
  return request(t.app)
    .post(`/api/trials/${SLUG}/copy`)
    .set('Origin', TEST_ORIGIN)
    .set('Cookie', await mintSessionCookie(t, user))
    .send({ title, season: '2027' });
}

async function trialBySlug(slug: string) {
  return t.db.selectFrom('trials').selectAll().where('slug', '=', slug).executeTakeFirstOrThrow();
}
const withoutOwnColumns = <R extends Record<string, unknown>>(rows: R[]) =>
  rows.map(
    ({
      id: _i,
      trial_id: _t,
      created_at: _c,
      updated_at: _u,
      created_by: _cb,
      updated_by: _ub,
      ...rest
    }) => rest,
  );

async function parts(trialId: string) {
  const [entries, sites, traits] = await Promise.all([
    t.db
      .selectFrom('entries')
      .selectAll()
      .where('trial_id', '=', trialId)
      .orderBy('code')
      .execute(),
    t.db.selectFrom('sites').selectAll().where('trial_id', '=', trialId).orderBy('name').execute(),
    t.db.selectFrom('traits').selectAll().where('trial_id', '=', trialId).orderBy('key').execute(),
  ]);
  return {
    entries: withoutOwnColumns(entries),
    sites: withoutOwnColumns(sites),
    traits: withoutOwnColumns(traits),
  };
}

const count = async (
  table: 'harvests' | 'observations' | 'field_events' | 'photos' | 'plots' | 'trial_members',
  trialId: string,
) =>
  Number(
    (
      await t.db
        .selectFrom(table)
        .select((eb) => eb.fn.countAll().as('n'))
        .where('trial_id', '=', trialId)
        .executeTakeFirstOrThrow()
    ).n,
  );

describe('copying a trial to next season', () => {
  it('carries entries, sites, traits and settings, no records, and lays out plots from a new seed', async () => {
    const source = await trialBySlug(SLUG);
    expect(await count('harvests', source.id)).toBeGreaterThan(0);
    const res = await copy('lead', { title: 'Larkhaven okra 2027', season: '2027' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const made = await trialBySlug(res.body.slug);

    expect(made).toMatchObject({
      title: 'Larkhaven okra 2027',
      season: '2027',
      crop: source.crop,
      design: source.design,
      description: source.description,
      fertilizer_policy: source.fertilizer_policy,
      fertilizer_notes: source.fertilizer_notes,
      replicates: source.replicates,
      rows_per_plot: source.rows_per_plot,
      row_length_mm: source.row_length_mm,
      row_spacing_mm: source.row_spacing_mm,
      status: 'draft',
      copied_from_trial_id: source.id,
      sowing_date: null,
      transplant_date: null,
    });
    expect(await parts(made.id)).toEqual(await parts(source.id));

    // No records, photos or members come along: the one who copied leads the new trial.
    for (const table of ['harvests', 'observations', 'field_events', 'photos'] as const)
      expect(await count(table, made.id)).toBe(0);
    const members = await t.db
      .selectFrom('trial_members')
      .select(['user_id', 'role'])
      .where('trial_id', '=', made.id)
      .execute();
    const lead = demoAccounts.find((a) => a.key === 'lead')!;
    const leadUser = await t.db
      .selectFrom('users')
      .select('id')
      .where('email', '=', lead.email)
      .executeTakeFirstOrThrow();
    expect(members).toEqual([{ user_id: leadUser.id, role: 'lead' }]);

    // A layout of the same shape from a different seed, exactly as the generator makes it.
    expect(res.body.seed).toBe(made.layout_seed);
    expect(made.layout_seed).not.toBe(source.layout_seed);
    expect(await count('plots', made.id)).toBe(await count('plots', source.id));
    const [entries, sites, plots] = await Promise.all([
      t.db
        .selectFrom('entries')
        .select(['id', 'code', 'name'])
        .where('trial_id', '=', made.id)
        .orderBy('code')
        .orderBy('name')
        .execute(),
      t.db
        .selectFrom('sites')
        .select(['id', 'name'])
        .where('trial_id', '=', made.id)
        .orderBy('name')
        .orderBy('id')
        .execute(),
      t.db
        .selectFrom('plots')
        .select(['site_id', 'entry_id', 'block', 'position', 'plot_number'])
        .where('trial_id', '=', made.id)
        .execute(),
    ]);
    const expected = randomizeLayout({
      design: made.design,
      entryIds: entries.map((e) => e.id),
      siteIds: sites.map((s) => s.id),
      replicates: made.replicates!,
      seed: made.layout_seed!,
    });
    const key = (p: {
      site_id?: string;
      siteId?: string;
      plot_number?: number;
      plotNumber?: number;
    }) => `${p.site_id ?? p.siteId}#${p.plot_number ?? p.plotNumber}`;
    const stored = new Map(plots.map((p) => [key(p), p.entry_id]));
    expect(stored.size).toBe(expected.length);
    for (const p of expected) expect(stored.get(key(p))).toBe(p.entryId);

    // The okra trial has no saved sheet, so neither has its copy (it starts from the default).
    expect(
      await t.db
        .selectFrom('results_sheets')
        .select('trial_id')
        .where('trial_id', 'in', [source.id, made.id])
        .execute(),
    ).toEqual([]);

    // The new trial links back to the old one.
    const detail = await request(t.app)
      .get(`/api/trials/${made.slug}`)
      .set('Cookie', await cookieOf('lead'));
    expect(detail.status).toBe(200);
    expect(detail.body.copiedFrom).toEqual({
      slug: SLUG,
      title: source.title,
      season: source.season,
      view: 'trial',
    });
  });

  it('carries the results-sheet settings, not last season’s words, notes or photos', async () => {
    const lead = await cookieOf('lead');
    const source = await trialBySlug(SLUG);
    const anEntry = await t.db
      .selectFrom('entries')
      .select('id')
      .where('trial_id', '=', source.id)
      .executeTakeFirstOrThrow();
    const settings = {
      traits: [
        { key: 'plant_height', basis: 'plot', weight: 2 },
        { key: 'marketable_yield', basis: 'm2', weight: 1 },
      ],
      alpha: 0.01,
      letters: 'lsd',
      license: 'CC-BY-SA-4.0',
    };
    const saved = await request(t.app)
      .put(`/api/trials/${SLUG}/results-sheet`)
      .set('Origin', TEST_ORIGIN)
      .set('Cookie', lead)
      .send({
        ...settings,
        summary: 'Tallow Creek Green led this year.',
        methods: 'Sown 4 May in the cold frame.',
        entryNotes: { [anEntry.id]: 'Tough after three days.' },
        coverPhotos: {},
      });
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);

    const res = await copy('lead', { title: 'Larkhaven okra with its sheet', season: '2027' });
    expect(res.status).toBe(201);
    const draft = await request(t.app)
      .get(`/api/trials/${res.body.slug}/results-sheet`)
      .set('Cookie', lead);
    expect(draft.status).toBe(200);
    expect(draft.body).toMatchObject({
      ...settings,
      summary: '',
      methods: null,
      entryNotes: {},
      coverPhotos: {},
      publishedVersion: null,
      isPublic: false,
    });
    // The chosen traits are the copy's own: its preview analyses them.
    const preview = await request(t.app)
      .get(`/api/trials/${res.body.slug}/results-sheet/preview`)
      .set('Cookie', lead);
    expect(preview.status, JSON.stringify(preview.body)).toBe(200);
  });

  it('copies a published sheet’s settings as a draft of the new trial, unpublished', async () => {
    const lead = await cookieOf('lead');
    const beans = 'fennick-bush-beans-2026';
    const old = await request(t.app).get(`/api/trials/${beans}/results-sheet`).set('Cookie', lead);
    expect(old.body.publishedVersion).toBe(1);
    const res = await copy('lead', { title: 'Fennick beans again', season: '2027' }, beans);
    expect(res.status).toBe(201);
    const draft = await request(t.app)
      .get(`/api/trials/${res.body.slug}/results-sheet`)
      .set('Cookie', lead);
    expect(draft.body).toMatchObject({
      traits: old.body.traits,
      alpha: old.body.alpha,
      letters: old.body.letters,
      license: old.body.license,
      summary: '',
      publishedVersion: null,
      isPublic: false,
    });
    expect((await request(t.app).get(`/api/results/${res.body.slug}`)).status).toBe(404);
  });

  it('names the old trial only to someone who may see it', async () => {
    const res = await copy('lead', { title: 'Larkhaven okra, second copy', season: '2027' });
    const made = await trialBySlug(res.body.slug);
    const outsider = await createUser(t.db);
    await t.db
      .insertInto('trial_members')
      .values({ trial_id: made.id, user_id: outsider.id, role: 'viewer' })
      .execute();
    const detail = await request(t.app)
      .get(`/api/trials/${made.slug}`)
      .set('Cookie', await mintSessionCookie(t, outsider));
    expect(detail.status).toBe(200);
    expect(detail.body.copiedFrom).toBeNull();
  });

  it('is for the lead, and a bad body is refused by field with nothing written', async () => {
    const before = await t.db.selectFrom('trials').select('id').execute();
    const byViewer = await copy('viewer', { title: 'Not mine', season: '2027' });
    expect(byViewer.status).toBe(403);
    const bad = await copy('lead', { title: '   ', season: '' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('validation_failed');
    expect(bad.body.error.details.fields.map((f: { path: string }) => f.path).sort()).toEqual([
      'body.season',
      'body.title',
    ]);
    expect(await t.db.selectFrom('trials').select('id').execute()).toHaveLength(before.length);
  });

  it('stays in the group only for someone who may start trials there; else goes to the copier’s own group', async () => {
    const source = await trialBySlug(SLUG);
    const byCoordinator = await copy('lead', { title: 'Larkhaven okra, kept', season: '2027' });
    expect(byCoordinator.status).toBe(201);
    expect(byCoordinator.body.sameGroup).toBe(true);
    expect((await trialBySlug(byCoordinator.body.slug)).group_id).toBe(source.group_id);

    // A second lead of the trial who is only a member of its group.
    const member = await createUser(t.db);
    await t.db
      .insertInto('group_members')
      .values({ group_id: source.group_id!, user_id: member.id, role: 'member' })
      .execute();
    const res = await copyAsNewLead(member, 'Larkhaven okra, elsewhere');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.sameGroup).toBe(false);
    const made = await trialBySlug(res.body.slug);
    expect(made.group_id).not.toBe(source.group_id);
    const roleIn = async (groupId: string) =>
      (
        await t.db
          .selectFrom('group_members')
          .select('role')
          .where('group_id', '=', groupId)
          .where('user_id', '=', member.id)
          .executeTakeFirstOrThrow()
      ).role;
    expect(await roleIn(made.group_id!)).toBe('coordinator');
    // The copier stays a member of the source's group, no more.
    expect(await roleIn(source.group_id!)).toBe('member');
    // Each entry names a variety of the copy's own group's register, of the entry's name.
    const linked = await t.db
      .selectFrom('entries as e')
      .innerJoin('varieties as v', 'v.id', 'e.variety_id')
      .select(['e.name', 'v.name as variety', 'v.group_id'])
      .where('e.trial_id', '=', made.id)
      .execute();
    const entries = await t.db
      .selectFrom('entries')
      .select('name')
      .where('trial_id', '=', source.id)
      .execute();
    expect(linked).toHaveLength(entries.length);
    for (const l of linked) {
      expect(l.group_id).toBe(made.group_id);
      expect(l.variety).toBe(l.name);
    }
  });

  it('goes to the copier’s own group for a lead outside the source’s group, and stays for an administrator', async () => {
    const source = await trialBySlug(SLUG);
    const res = await copyAsNewLead(await createUser(t.db), 'Larkhaven okra, outside');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.sameGroup).toBe(false);
    expect((await trialBySlug(res.body.slug)).group_id).not.toBe(source.group_id);

    const byAdmin = await copy('admin', { title: 'Larkhaven okra, kept by admin', season: '2027' });
    expect(byAdmin.status, JSON.stringify(byAdmin.body)).toBe(201);
    expect(byAdmin.body.sameGroup).toBe(true);
    expect((await trialBySlug(byAdmin.body.slug)).group_id).toBe(source.group_id);
  });
});

/**
 * The group entry point asked without refusing answers as the refusing form does, for every
 * group action and every kind of reader: the policy table (common/policy.ts) is the expectation.
 */
describe('asking a group action without refusing', () => {
  it('allows exactly what groupForAction lets through, and nothing in a group that does not exist', async () => {
    const source = await trialBySlug(SLUG);
    const groupId = source.group_id!;
    const member = await createUser(t.db);
    await t.db
      .insertInto('group_members')
      .values({ group_id: groupId, user_id: member.id, role: 'member' })
      .execute();
    const outsider = await createUser(t.db);
    const admin = await createUser(t.db, { isAdmin: true });
    const lead = demoAccounts.find((a) => a.key === 'lead')!;
    const leadId = (
      await t.db
        .selectFrom('users')
        .select('id')
        .where('email', '=', lead.email)
        .executeTakeFirstOrThrow()
    ).id;
    const readers: { who: string; actor: Actor | null; role: GroupRole | null }[] = [
      { who: 'coordinator', actor: { userId: leadId, isAdmin: false }, role: 'coordinator' },
      { who: 'member', actor: { userId: member.id, isAdmin: false }, role: 'member' },
      { who: 'outsider', actor: { userId: outsider.id, isAdmin: false }, role: null },
      { who: 'administrator', actor: { userId: admin.id, isAdmin: true }, role: null },
      { who: 'signed out', actor: null, role: null },
    ];
    for (const { who, actor, role } of readers)
      for (const action of groupActions) {
        const allowed = await groupAllows(t.db, groupId, actor, action);
        const passes = await groupForAction(t.db, groupId, actor, action).then(
          () => true,
          () => false,
        );
        expect(allowed, `${who} ${action}`).toBe(canGroup(actor, action, role));
        expect(passes, `${who} ${action}`).toBe(allowed);
        expect(
          await groupAllows(t.db, crypto.randomUUID(), actor, action),
          `${who} ${action} in no group`,
        ).toBe(false);
      }
    // What copying rests on: the coordinator may start trials in the group, the member may not.
    expect(await groupAllows(t.db, groupId, readers[0]!.actor, 'group.trial.create')).toBe(true);
    expect(await groupAllows(t.db, groupId, readers[1]!.actor, 'group.trial.create')).toBe(false);
  });
});
