/**
 * The variety register above single trials: groups and their roles, the register, a variety's
 * record across trials, the cross-season table, and the migration that made registers from
 * existing entries. Each role is tried: group coordinator, trial lead (a group member),
 * grower, viewer, outsider and signed out.
 *
 * Figures are checked against the trial's own analysis API for the same trait (whose values
 * are checked against NIST StRD and R elsewhere) and against the plot values it reports; a rank
 * is 1 + the number of entries with a better mean in the trait's direction (common practice,
 * no source), checked for a higher-is-better and a lower-is-better trait.
 */
import { Kysely, PostgresDialect } from 'kysely';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DB } from '../../db/database';
import { migrations } from '../../db/migrations';
import type { Database } from '../../db/schema';
import { demoAccounts } from '../../db/seed/demo-season';
import { seedDemo } from '../../db/seed/seed';
import { compareVarieties } from '../../server/varieties/varieties-service';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
} from '../support/test-app';

const OKRA = 'larkhaven-okra-2026';
const BEAN = 'fennick-bush-beans-2026';
let t: TestApp;
const cookies: Record<string, string | null> = { signedOut: null };

beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.db);
  for (const a of demoAccounts) cookies[a.key] = await mintSessionCookie(t, a);
  // A trial lead who does not coordinate the group: the okra trial gets a second lead.
  const trialLead = await createUser(t.db, { name: 'Odile Fairbairn' });
  const okra = await trialId(OKRA);
  await t.db
    .insertInto('trial_members')
    .values({ trial_id: okra, user_id: trialLead.id, role: 'lead' })
    .execute();
  const group = await t.db.selectFrom('groups').select('id').executeTakeFirstOrThrow();
  await t.db
    .insertInto('group_members')
    .values({ group_id: group.id, user_id: trialLead.id, role: 'member' })
    .execute();
  cookies.trialLead = await mintSessionCookie(t, trialLead);
  cookies.outsider = await mintSessionCookie(t, await createUser(t.db, { name: 'Nell Outby' }));
}, 60_000);
afterAll(async () => {
  await t.close();
});

async function trialId(slug: string) {
  return (
    await t.db.selectFrom('trials').select('id').where('slug', '=', slug).executeTakeFirstOrThrow()
  ).id;
}
const as = (who: string) => {
  const cookie = cookies[who] ?? null;
  const withCookie = (r: request.Test) => (cookie ? r.set('Cookie', cookie) : r);
  return {
    get: (url: string) => withCookie(request(t.app).get(url)),
    send: (method: 'post' | 'patch', url: string, body: object) =>
      withCookie(request(t.app)[method](url).set('Origin', TEST_ORIGIN)).send(body),
  };
};
const groupId = async () =>
  (await t.db.selectFrom('groups').select('id').executeTakeFirstOrThrow()).id;

describe('the demo season', () => {
  it('links every entry of every demo trial to a register variety of its name', async () => {
    const rows = await t.db
      .selectFrom('entries as e')
      .leftJoin('varieties as v', 'v.id', 'e.variety_id')
      .innerJoin('trials as t', 't.id', 'e.trial_id')
      .select(['e.name', 'v.name as variety', 'v.group_id', 't.group_id as trial_group'])
      .execute();
    expect(rows.length).toBe(11);
    for (const r of rows) {
      expect(r.variety).toBe(r.name);
      expect(r.group_id).toBe(r.trial_group);
    }
  });
});

describe('GET /api/varieties', () => {
  it('lists the register of the caller’s groups with trial and season counts', async () => {
    for (const who of ['lead', 'trialLead', 'grower', 'viewer']) {
      const res = await as(who).get('/api/varieties');
      expect(res.status).toBe(200);
      expect(res.body.varieties).toHaveLength(11);
      const velvet = res.body.varieties.find((v: { name: string }) => v.name === 'Velvet Lantern');
      expect(velvet).toMatchObject({
        slug: 'velvet-lantern',
        crop: 'Okra',
        trialCount: 1,
        seasonCount: 1,
      });
      // The promised shape: each variety carries at least these, typed as addresses rely on.
      for (const v of res.body.varieties) {
        expect(v).toEqual(
          expect.objectContaining({
            id: expect.stringMatching(/^[0-9a-f-]{36}$/),
            slug: expect.stringMatching(/^[a-z0-9]+(-[a-z0-9]+)*$/),
            name: expect.any(String),
            crop: expect.any(String),
            trialCount: expect.any(Number),
            seasonCount: expect.any(Number),
          }),
        );
      }
    }
  });

  it('shows an outsider an empty register and refuses the signed out', async () => {
    const out = await as('outsider').get('/api/varieties');
    expect(out.status).toBe(200);
    expect(out.body.varieties).toEqual([]);
    expect((await as('signedOut').get('/api/varieties')).status).toBe(401);
  });

  it('names each caller’s groups and role', async () => {
    expect((await as('lead').get('/api/groups')).body.groups).toEqual([
      expect.objectContaining({ name: 'Larkhaven Seed Library', myRole: 'coordinator' }),
    ]);
    expect((await as('grower').get('/api/groups')).body.groups[0].myRole).toBe('member');
    expect((await as('outsider').get('/api/groups')).body.groups).toEqual([]);
    expect((await as('signedOut').get('/api/groups')).status).toBe(401);
  });
});

describe('GET /api/varieties/:slug', () => {
  it('gives members the live figures equal to the trial’s analysis, ranked in each trait’s direction', async () => {
    const res = await as('grower').get('/api/varieties/velvet-lantern');
    expect(res.status).toBe(200);
    expect(res.body.variety).toMatchObject({ name: 'Velvet Lantern', crop: 'Okra' });
    expect(res.body.canEdit).toBe(false);
    expect(res.body.trials).toHaveLength(1);
    const trial = res.body.trials[0];
    expect(trial).toMatchObject({ slug: OKRA, season: '2026', view: 'trial', version: null });
    expect(trial.sites).toHaveLength(3);
    for (const key of ['marketable_yield', 'plant_height']) {
      const analysis = (
        await as('grower').get(`/api/trials/${OKRA}/analysis?trait=${key}&alpha=0.05&letters=hsd`)
      ).body;
      const own = analysis.means.find((m: { variety: string }) => m.variety === 'Velvet Lantern');
      const mine = trial.traits.find((x: { key: string }) => x.key === key);
      expect(mine).toMatchObject({
        direction: key === 'plant_height' ? 'lower' : 'higher',
        mean: own.mean,
        rank: own.rank,
        group: own.group,
        entryCount: 6,
      });
      // Rank: 1 + entries with a better mean in the trait's direction.
      const better = analysis.means.filter((m: { mean: number }) =>
        mine.direction === 'higher' ? m.mean > own.mean : m.mean < own.mean,
      ).length;
      expect(mine.rank).toBe(better + 1);
      // Site means: the arithmetic mean of the entry's plot values at each site.
      for (const s of mine.sites) {
        const values = analysis.plotValues
          .filter(
            (p: { entry: string; site: string }) =>
              p.entry === 'Velvet Lantern' && p.site === s.site,
          )
          .map((p: { value: number }) => p.value);
        expect(s.n).toBe(values.length);
        expect(s.mean).toBeCloseTo(
          values.reduce((a: number, b: number) => a + b, 0) / values.length,
          9,
        );
      }
    }
  }, 60_000);

  it('lets the coordinator edit, and hides an unpublished variety from outsiders and the signed out', async () => {
    expect((await as('lead').get('/api/varieties/velvet-lantern')).body.canEdit).toBe(true);
    expect((await as('trialLead').get('/api/varieties/velvet-lantern')).body.canEdit).toBe(false);
    expect((await as('viewer').get('/api/varieties/velvet-lantern')).status).toBe(200);
    expect((await as('outsider').get('/api/varieties/velvet-lantern')).status).toBe(404);
    expect((await as('signedOut').get('/api/varieties/velvet-lantern')).status).toBe(404);
    expect((await as('lead').get('/api/varieties/no-such-variety')).status).toBe(404);
    expect((await as('lead').get('/api/varieties/Not_An_Address')).status).toBe(400);
  }, 60_000);

  it('shows outsiders and the signed out only what the published version shows', async () => {
    const lead = as('lead');
    const sheet = {
      summary: 'Published for the register test.',
      methods: null,
      traits: [{ key: 'marketable_yield', basis: 'plot', weight: 1 }],
      entryNotes: {},
      coverPhotos: {},
      alpha: 0.05,
      letters: 'hsd',
      license: 'CC-BY-4.0',
    };
    const put = await request(t.app)
      .put(`/api/trials/${OKRA}/results-sheet`)
      .set('Origin', TEST_ORIGIN)
      .set('Cookie', cookies.lead!)
      .send(sheet);
    expect(put.status).toBe(200);
    expect(
      (await lead.send('post', `/api/trials/${OKRA}/results-sheet/publish`, { changeNote: '' }))
        .status,
    ).toBe(201);
    const published = (await as('signedOut').get(`/api/results/${OKRA}`)).body;
    const publishedMean = published.traits[0].means.find(
      (m: { variety: string }) => m.variety === 'Velvet Lantern',
    );
    for (const who of ['signedOut', 'outsider']) {
      const res = await as(who).get('/api/varieties/velvet-lantern');
      expect(res.status).toBe(200);
      expect(res.body.canEdit).toBe(false);
      const trial = res.body.trials[0];
      expect(trial).toMatchObject({ slug: OKRA, view: 'sheet', version: 1 });
      // Only the published trait, with the published figures.
      expect(trial.traits.map((x: { key: string }) => x.key)).toEqual(['marketable_yield']);
      // The sheet's own figure: the model's estimated mean where it gives one (BLUE / LS mean).
      expect(trial.traits[0]).toMatchObject({
        mean: publishedMean.adjustedMean ?? publishedMean.mean,
        rank: publishedMean.rank,
        group: publishedMean.group,
      });
    }
    // The bean trial is unpublished: its varieties stay hidden from them.
    expect((await as('signedOut').get('/api/varieties/pennywhistle-wax')).status).toBe(404);
    // Members still see live figures of every trait.
    const member = await as('grower').get('/api/varieties/velvet-lantern');
    expect(member.body.trials[0].view).toBe('trial');
    expect(member.body.trials[0].traits.length).toBeGreaterThan(1);
    await lead.send('post', `/api/trials/${OKRA}/results-sheet/unpublish`, {});
  }, 60_000);
});

describe('POST and PATCH /api/varieties', () => {
  const body = async (name: string) => ({
    groupId: await groupId(),
    name,
    crop: 'Okra',
    type: 'heirloom',
    origin: 'Kept by a Larkhaven family since the 1950s',
    seedSource: 'Larkhaven Seed Library',
    description: 'Short, stocky plants.',
    expectedTraits: ['dwarf habit', 'spineless', 'dwarf habit'],
    aliases: ['Little Lantern'],
  });

  it('lets only the group’s coordinator add a variety', async () => {
    const who = { grower: 403, viewer: 403, trialLead: 403, outsider: 404, signedOut: 404 };
    for (const [caller, status] of Object.entries(who))
      expect(
        (await as(caller).send('post', '/api/varieties', await body('Ember Thimble'))).status,
      ).toBe(status);
    const ok = await as('lead').send('post', '/api/varieties', await body('Ember Thimble'));
    expect(ok.status).toBe(201);
    expect(ok.body.slug).toMatch(/^ember-thimble-[a-z2-9]{6}$/);
    const record = (await as('grower').get(`/api/varieties/${ok.body.slug}`)).body;
    expect(record.variety).toMatchObject({
      name: 'Ember Thimble',
      type: 'heirloom',
      expectedTraits: ['dwarf habit', 'spineless'],
      aliases: ['Little Lantern'],
    });
    expect(record.trials).toEqual([]);
  });

  it('refuses a name already in the register and a type outside the list', async () => {
    const dup = await as('lead').send('post', '/api/varieties', await body('Velvet Lantern'));
    expect(dup.status).toBe(409);
    expect(dup.body.error.details.fields[0].path).toBe('body.name');
    const bad = await as('lead').send('post', '/api/varieties', {
      ...(await body('Odd One')),
      type: 'landrace',
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fields[0].path).toBe('body.type');
  });

  it('lets the coordinator edit a variety and keeps its address', async () => {
    const res = await as('lead').send('patch', '/api/varieties/copperbell-dwarf', {
      description: 'Compact; the first to flower.',
      aliases: ['Bell Dwarf'],
    });
    expect(res.status).toBe(204);
    const record = (await as('lead').get('/api/varieties/copperbell-dwarf')).body;
    expect(record.variety).toMatchObject({
      description: 'Compact; the first to flower.',
      aliases: ['Bell Dwarf'],
    });
    expect(
      (await as('grower').send('patch', '/api/varieties/copperbell-dwarf', { origin: 'x' })).status,
    ).toBe(403);
    expect(
      (await as('outsider').send('patch', '/api/varieties/copperbell-dwarf', { origin: 'x' }))
        .status,
    ).toBe(404);
  }, 30_000);
});

describe('entries link to the register', () => {
  it('picks a register variety, or finds or makes one of the entry’s name in the same step', async () => {
    const created = await as('lead').send('post', '/api/trials', {
      title: 'Okra second sowing',
      crop: 'Okra',
      season: '2027',
      design: 'rcbd',
    });
    expect(created.status).toBe(201);
    const slug = created.body.slug as string;
    const trial = await t.db
      .selectFrom('trials')
      .select('group_id')
      .where('slug', '=', slug)
      .executeTakeFirstOrThrow();
    expect(trial.group_id).toBe(await groupId());
    const velvet = await t.db
      .selectFrom('varieties')
      .select('id')
      .where('slug', '=', 'velvet-lantern')
      .executeTakeFirstOrThrow();
    const entry = (b: object) => as('lead').send('post', `/api/trials/${slug}/entries`, b);
    const base = { entryType: 'heirloom' };
    expect(
      (
        await entry({
          ...base,
          name: 'Velvet Lantern (2027 seed)',
          code: 'VL',
          varietyId: velvet.id,
        })
      ).status,
    ).toBe(201);
    expect((await entry({ ...base, name: 'Mossbank Long', code: 'ML' })).status).toBe(201);
    expect((await entry({ ...base, name: 'Quillon Green', code: 'QG' })).status).toBe(201);
    const other = await entry({
      ...base,
      name: 'Stray',
      code: 'ST',
      varietyId: '00000000-0000-4000-8000-000000000000',
    });
    expect(other.status).toBe(400);
    expect(other.body.error.details.fields[0].path).toBe('body.varietyId');

    const design = (await as('lead').get(`/api/trials/${slug}/design`)).body;
    const byCode = Object.fromEntries(
      design.entries.map((e: { code: string; variety: { slug: string; name: string } }) => [
        e.code,
        e.variety,
      ]),
    );
    expect(byCode.VL.slug).toBe('velvet-lantern');
    expect(byCode.ML.slug).toBe('mossbank-long');
    expect(byCode.QG.name).toBe('Quillon Green');
    const list = (await as('lead').get('/api/varieties')).body.varieties;
    const velvetRow = list.find((v: { slug: string }) => v.slug === 'velvet-lantern');
    expect(velvetRow).toMatchObject({ trialCount: 2, seasonCount: 2 });
    // Nothing half-written: the refused entry made no variety.
    expect(list.some((v: { name: string }) => v.name === 'Stray')).toBe(false);
  }, 30_000);
});

describe('GET /api/varieties/compare', () => {
  it('compares over shared trials and marks a pair that shared none', async () => {
    const q =
      '/api/varieties/compare?varieties=velvet-lantern,mossbank-long,pennywhistle-wax&trait=marketable_yield';
    // A group member outside the bean trial sees the register, not that trial's figures.
    const grower = (await as('grower').get(q)).body;
    expect(grower.columns.map((x: { trialSlug: string }) => x.trialSlug)).toEqual([
      OKRA,
      OKRA,
      OKRA,
    ]);
    const res = await as('lead').get(q);
    expect(res.status).toBe(200);
    const c = res.body;
    expect(c.trait).toMatchObject({ key: 'marketable_yield', direction: 'higher' });
    // Okra at three sites and the bean trial's one site.
    expect(c.columns.map((x: { trialSlug: string }) => x.trialSlug).sort()).toEqual(
      [OKRA, OKRA, OKRA, BEAN].sort(),
    );
    const pair = (a: string, b: string) =>
      c.pairs.find((p: { a: string; b: string }) => p.a === a && p.b === b);
    // Both are entries of the okra trial and of the 2027 trial made above (which has no
    // records yet): two shared trials, compared over the okra trial's three sites only.
    expect(pair('velvet-lantern', 'mossbank-long')).toMatchObject({
      sharedTrials: 2,
      sharedEnvironments: 3,
    });
    const [vl, ml] = c.rows;
    // Each okra cell: the arithmetic mean of the variety's plot values at that site, as the
    // trial's own analysis reports them.
    const okra = (
      await as('lead').get(
        `/api/trials/${OKRA}/analysis?trait=marketable_yield&alpha=0.05&letters=hsd`,
      )
    ).body;
    c.columns.forEach((col: { trialSlug: string; site: string }, i: number) => {
      if (col.trialSlug !== OKRA) return;
      for (const [row, name] of [
        [vl, 'Velvet Lantern'],
        [ml, 'Mossbank Long'],
      ] as const) {
        const values = okra.plotValues
          .filter((p: { entry: string; site: string }) => p.entry === name && p.site === col.site)
          .map((p: { value: number }) => p.value);
        expect(values.length).toBeGreaterThan(0);
        expect(row.means[i]).toBeCloseTo(
          values.reduce((a: number, b: number) => a + b, 0) / values.length,
          9,
        );
      }
    });
    // The pair's difference: the mean of its differences over the environments both were
    // grown in (common practice, no source).
    const diffs = vl.means
      .map((m: number | null, i: number) =>
        m !== null && ml.means[i] !== null ? m - ml.means[i] : null,
      )
      .filter((d: number | null) => d !== null);
    expect(pair('velvet-lantern', 'mossbank-long').difference).toBeCloseTo(
      diffs.reduce((a: number, b: number) => a + b, 0) / diffs.length,
      9,
    );
    expect(pair('velvet-lantern', 'pennywhistle-wax')).toEqual({
      a: 'velvet-lantern',
      b: 'pennywhistle-wax',
      sharedTrials: 0,
      sharedEnvironments: 0,
      difference: null,
    });
  }, 60_000);

  it('reads each trial once: its traits listed and the chosen one analysed from that reading', async () => {
    // Every statement the comparison sends, through a second Kysely on the same pool.
    const sent: { sql: string; parameters: readonly unknown[] }[] = [];
    const logged: DB = new Kysely<Database>({
      dialect: new PostgresDialect({ pool: t.database.pool }),
      log: (e) => {
        if (e.level === 'query') sent.push({ sql: e.query.sql, parameters: e.query.parameters });
      },
    });
    const lead = demoAccounts.find((a) => a.key === 'lead')!;
    const { id: userId } = await t.db
      .selectFrom('users')
      .select('id')
      .where('email', '=', lead.email)
      .executeTakeFirstOrThrow();
    const c = await compareVarieties(
      logged,
      { userId, isAdmin: false },
      {
        varieties: ['velvet-lantern', 'mossbank-long', 'pennywhistle-wax'],
        trait: 'marketable_yield',
      },
    );
    expect(c.columns.length).toBeGreaterThan(0);
    // The trial's trait list, as the reading asks it: once per trial, not again for the analysis.
    const traitLists = sent.filter((q) => q.sql.startsWith('select "key", "label" from "traits"'));
    const perTrial = new Map<unknown, number>();
    for (const q of traitLists)
      perTrial.set(q.parameters[0], (perTrial.get(q.parameters[0]) ?? 0) + 1);
    expect(perTrial.size).toBeGreaterThanOrEqual(2);
    expect([...perTrial.values()]).toEqual([...perTrial.values()].map(() => 1));
  }, 60_000);

  it('keeps hidden varieties hidden and checks its input', async () => {
    const q =
      '/api/varieties/compare?varieties=velvet-lantern,mossbank-long&trait=marketable_yield';
    expect((await as('outsider').get(q)).status).toBe(404);
    expect((await as('signedOut').get(q)).status).toBe(404);
    expect((await as('viewer').get(q)).status).toBe(200);
    expect((await as('lead').get('/api/varieties/compare?varieties=velvet-lantern')).status).toBe(
      400,
    );
    const noTrait = await as('lead').get(
      '/api/varieties/compare?varieties=velvet-lantern,mossbank-long&trait=no_such_trait',
    );
    expect(noTrait.status).toBe(400);
    expect(noTrait.body.error.details.fields[0].path).toBe('query.trait');
  }, 60_000);
});

describe('the register migration', () => {
  it('makes a group per trial owner and one variety per exact name within a group, and goes down', async () => {
    const d = await createTestApp();
    try {
      const db = d.db;
      const migration = migrations['2026-12-02T3500-variety-register']!;
      // Seed lots hang on the register: taken down first, put back after.
      const seedLots = migrations['2026-12-02T4400-seed-lots']!;
      await seedLots.down!(db);
      await migration.down!(db);
      const owner = await createUser(db, { name: 'Hester Vane' });
      const other = await createUser(db, { name: 'Ivo Brandt' });
      const made = async (slug: string, by: string | null) =>
        (
          await db
            .insertInto('trials')
            .values({
              slug,
              title: slug,
              crop: 'Okra',
              season: '2025',
              design: 'crd',
              created_by: by,
            } as never)
            .returning('id')
            .executeTakeFirstOrThrow()
        ).id;
      const a = await made('mig-a', owner.id);
      const b = await made('mig-b', owner.id);
      const c = await made('mig-c', null);
      await db
        .insertInto('trial_members')
        .values([
          { trial_id: c, user_id: other.id, role: 'lead' },
          { trial_id: a, user_id: other.id, role: 'grower' },
        ])
        .execute();
      const entry = (trial: string, name: string, code: string) => ({
        trial_id: trial,
        name,
        code,
        entry_type: 'heirloom' as const,
      });
      await db
        .insertInto('entries')
        .values([
          entry(a, 'Cinder Pod', 'CP'),
          entry(a, 'Wren Finger', 'WF'),
          entry(b, 'Cinder Pod', 'CP'),
          entry(b, 'cinder pod', 'CQ'),
          entry(c, 'Cinder Pod', 'CP'),
        ] as never)
        .execute();
      await migration.up(db);

      const groups = await db.selectFrom('groups').select(['id', 'name']).orderBy('name').execute();
      expect(groups.map((g) => g.name)).toEqual(["Hester Vane's trials", "Ivo Brandt's trials"]);
      const trials = await db.selectFrom('trials').select(['slug', 'group_id']).execute();
      const groupOf = Object.fromEntries(trials.map((x) => [x.slug, x.group_id]));
      expect(groupOf['mig-a']).toBe(groupOf['mig-b']);
      expect(groupOf['mig-c']).not.toBe(groupOf['mig-a']);
      const members = await db
        .selectFrom('group_members')
        .select(['group_id', 'user_id', 'role'])
        .execute();
      expect(members).toEqual(
        expect.arrayContaining([
          { group_id: groupOf['mig-a'], user_id: owner.id, role: 'coordinator' },
          { group_id: groupOf['mig-a'], user_id: other.id, role: 'member' },
          { group_id: groupOf['mig-c'], user_id: other.id, role: 'coordinator' },
        ]),
      );
      expect(members).toHaveLength(3);
      // Exact duplicates merge within a group; a different spelling or another group does not.
      const varieties = await db
        .selectFrom('varieties')
        .select(['id', 'name', 'group_id', 'slug'])
        .execute();
      expect(varieties.map((v) => [v.name, v.group_id])).toHaveLength(4);
      expect(varieties.map((v) => [v.name, v.group_id])).toEqual(
        expect.arrayContaining([
          ['Cinder Pod', groupOf['mig-a']],
          ['Cinder Pod', groupOf['mig-c']],
          ['Wren Finger', groupOf['mig-a']],
          ['cinder pod', groupOf['mig-a']],
        ]),
      );
      const trialSlug = new Map([
        [a, 'mig-a'],
        [b, 'mig-b'],
        [c, 'mig-c'],
      ]);
      const linked = await db
        .selectFrom('entries')
        .select(['name', 'variety_id', 'trial_id'])
        .execute();
      for (const e of linked) {
        const v = varieties.find((x) => x.id === e.variety_id)!;
        expect(v.name).toBe(e.name);
        expect(v.group_id).toBe(groupOf[trialSlug.get(e.trial_id)!]);
      }
      await migration.down!(db);
      const left = await db.introspection.getTables();
      expect(left.map((x) => x.name)).not.toContain('varieties');
      await migration.up(db);
      await seedLots.up(db);
    } finally {
      await d.close();
    }
  }, 60_000);
});
