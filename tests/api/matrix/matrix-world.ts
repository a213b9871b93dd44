/**
 * The world every matrix row runs in: one unpublished rcbd trial with two sites (A and B),
 * two entries, a plot at each site, a trait, and one member per role. The in-site grower is
 * limited to site A, the other-site grower to site B.
 */
import crypto from 'node:crypto';
import type { TestApp, TestUser } from '../../support/test-app';
import { createUser, mintSessionCookie } from '../../support/test-app';
import type { Caller, ExtraCaller } from './matrix-types';

export interface MatrixWorld {
  t: TestApp;
  trial: { id: string; slug: string };
  siteA: string;
  siteB: string;
  entries: [string, string];
  plotA: string;
  plotB: string;
  traitId: string;
  users: Record<Exclude<Caller, 'anonymous'>, TestUser>;
  cookies: Partial<Record<Caller | ExtraCaller, string>>;
  /** The group owning the trial: `coordinator` coordinates it, the trial's people are members. */
  groupId: string;
  /** Register varieties of the trial's two entries. */
  varieties: [string, string];
}

export async function buildMatrixWorld(t: TestApp): Promise<MatrixWorld> {
  const db = t.db;
  const users = {
    viewer: await createUser(db, { name: 'Vera Viewer' }),
    contributor: await createUser(db, { name: 'Cato Contributor' }),
    growerInSite: await createUser(db, { name: 'Gil In-site' }),
    growerOtherSite: await createUser(db, { name: 'Gwen Other-site' }),
    lead: await createUser(db, { name: 'Lena Lead' }),
    admin: await createUser(db, { name: 'Ari Admin', isAdmin: true }),
  };
  const trial = await db
    .insertInto('trials')
    .values({
      slug: 'matrix-trial',
      title: 'Matrix trial',
      crop: 'Okra',
      season: '2026',
      design: 'multisite',
      status: 'active',
      sowing_date: '2026-05-01',
      created_by: users.lead.id,
    })
    .returning(['id', 'slug'])
    .executeTakeFirstOrThrow();
  const [siteA, siteB] = await Promise.all(
    ['Site A', 'Site B'].map(
      async (name) =>
        (
          await db
            .insertInto('sites')
            .values({ trial_id: trial.id, name })
            .returning('id')
            .executeTakeFirstOrThrow()
        ).id,
    ),
  );
  const entries = (
    await db
      .insertInto('entries')
      .values([
        { trial_id: trial.id, name: 'Matrix Green', code: 'MG', entry_type: 'heirloom' },
        { trial_id: trial.id, name: 'Matrix Red', code: 'MR', entry_type: 'heirloom' },
      ])
      .returning('id')
      .execute()
  ).map((r) => r.id) as [string, string];
  const plotA = (
    await db
      .insertInto('plots')
      .values({
        trial_id: trial.id,
        site_id: siteA!,
        entry_id: entries[0],
        block: 1,
        position: 1,
        plot_number: 101,
      })
      .returning('id')
      .executeTakeFirstOrThrow()
  ).id;
  const plotB = (
    await db
      .insertInto('plots')
      .values({
        trial_id: trial.id,
        site_id: siteB!,
        entry_id: entries[1],
        block: 1,
        position: 1,
        plot_number: 101,
      })
      .returning('id')
      .executeTakeFirstOrThrow()
  ).id;
  const traitId = (
    await db
      .insertInto('traits')
      .values({
        trial_id: trial.id,
        key: 'plant_height',
        label: 'Plant height',
        quantity_kind: 'length',
        basis: 'plant',
        direction: 'lower',
      })
      .returning('id')
      .executeTakeFirstOrThrow()
  ).id;
  const roles = {
    viewer: 'viewer',
    contributor: 'contributor',
    growerInSite: 'grower',
    growerOtherSite: 'grower',
    lead: 'lead',
  } as const;
  for (const [caller, role] of Object.entries(roles) as [
    keyof typeof roles,
    (typeof roles)[keyof typeof roles],
  ][]) {
    await db
      .insertInto('trial_members')
      .values({ trial_id: trial.id, user_id: users[caller].id, role })
      .execute();
  }
  await db
    .insertInto('trial_member_sites')
    .values([
      { trial_id: trial.id, user_id: users.growerInSite.id, site_id: siteA! },
      { trial_id: trial.id, user_id: users.growerOtherSite.id, site_id: siteB! },
    ])
    .execute();
  const cookies: MatrixWorld['cookies'] = {};
  for (const caller of Object.keys(users) as (keyof typeof users)[])
    cookies[caller] = await mintSessionCookie(t, users[caller]);
  const register = await buildMatrixRegister(t, trial.id, entries);
  return {
    t,
    trial,
    siteA: siteA!,
    siteB: siteB!,
    entries,
    plotA,
    plotB,
    traitId,
    users,
    cookies: { ...cookies, ...register.cookies },
    groupId: register.groupId,
    varieties: register.varieties,
  };
}

/** The trial's group and register, a coordinator in no trial, and an outsider in nothing. */
async function buildMatrixRegister(t: TestApp, trialId: string, entries: [string, string]) {
  const db = t.db;
  const coordinator = await createUser(db, { name: 'Cora Coordinator' });
  const outsider = await createUser(db, { name: 'Otto Outsider' });
  const group = await db
    .insertInto('groups')
    .values({ slug: 'matrix-group', name: 'Matrix group', created_by: null, updated_by: null })
    .returning('id')
    .executeTakeFirstOrThrow();
  await db.updateTable('trials').set({ group_id: group.id }).where('id', '=', trialId).execute();
  await db
    .insertInto('group_members')
    .values({ group_id: group.id, user_id: coordinator.id, role: 'coordinator', created_by: null })
    .execute();
  const members = await db
    .selectFrom('trial_members')
    .select('user_id')
    .where('trial_id', '=', trialId)
    .execute();
  await db
    .insertInto('group_members')
    .values(
      members.map((m) => ({
        group_id: group.id,
        user_id: m.user_id,
        role: 'member' as const,
        created_by: null,
      })),
    )
    .execute();
  const varieties: [string, string] = ['matrix-green', 'matrix-red'];
  for (const [i, slug] of varieties.entries()) {
    const v = await db
      .insertInto('varieties')
      .values({
        group_id: group.id,
        slug,
        name: i === 0 ? 'Matrix Green' : 'Matrix Red',
        crop: 'Okra',
        created_by: null,
        updated_by: null,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    await db
      .updateTable('entries')
      .set({ variety_id: v.id })
      .where('id', '=', entries[i]!)
      .execute();
  }
  return {
    groupId: group.id,
    varieties,
    cookies: {
      coordinator: await mintSessionCookie(t, coordinator),
      outsider: await mintSessionCookie(t, outsider),
    },
  };
}

/**
 * A new trial with the world's members in the same roles, for rows whose request would change
 * the shared trial (publishing, deleting, a new layout). Its slug starts with `prefix`.
 */
export async function trialWithWorldMembers(
  w: MatrixWorld,
  prefix: string,
  values: {
    title?: string;
    design?: 'crd' | 'rcbd' | 'multisite';
    status?: 'active' | 'published';
  } = {},
): Promise<{ id: string; slug: string }> {
  const slug = `${prefix}-${crypto.randomBytes(4).toString('hex')}`;
  const trial = await w.t.db
    .insertInto('trials')
    .values({
      slug,
      title: values.title ?? 'Matrix copy',
      crop: 'Okra',
      season: '2026',
      design: values.design ?? 'rcbd',
      status: values.status ?? 'active',
    })
    .returning(['id', 'slug'])
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
  return trial;
}
