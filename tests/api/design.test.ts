import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { traitPresets } from '../../common/trait-presets';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
  type TestUser,
} from '../support/test-app';

let t: TestApp;
let lead: TestUser;
let other: TestUser;
let admin: TestUser;
const cookie: Record<string, string> = {};

beforeAll(async () => {
  t = await createTestApp();
  lead = await createUser(t.db, { name: 'Odile Fenwright', email: 'odile@fenwright.example' });
  other = await createUser(t.db, { name: 'Bram Tollerby', email: 'bram@tollerby.example' });
  admin = await createUser(t.db, { name: 'Isa Keeper', isAdmin: true });
  cookie.lead = await mintSessionCookie(t, lead);
  cookie.other = await mintSessionCookie(t, other);
  cookie.admin = await mintSessionCookie(t, admin);
});
afterAll(async () => {
  await t.close();
});

const as = (who: keyof typeof cookie) => ({
  get: (url: string) =>
    request(t.app).get(url).set('Origin', TEST_ORIGIN).set('Cookie', cookie[who]!),
  post: (url: string, body?: object) =>
    request(t.app).post(url).set('Origin', TEST_ORIGIN).set('Cookie', cookie[who]!).send(body),
  patch: (url: string, body: object) =>
    request(t.app).patch(url).set('Origin', TEST_ORIGIN).set('Cookie', cookie[who]!).send(body),
  put: (url: string, body: object) =>
    request(t.app).put(url).set('Origin', TEST_ORIGIN).set('Cookie', cookie[who]!).send(body),
  delete: (url: string) =>
    request(t.app).delete(url).set('Origin', TEST_ORIGIN).set('Cookie', cookie[who]!),
});

/** Five invented okra entries; the dwarf needs three times the spacing of the tall ones. */
const fiveEntries = [
  { code: 'AW', name: 'Ashwick Tall', entryType: 'heirloom', inRowSpacingMm: 300 },
  { code: 'BD', name: 'Brindle Dwarf', entryType: 'heirloom', inRowSpacingMm: 900 },
  { code: 'CG', name: 'Cobble Green', entryType: 'open_pollinated', inRowSpacingMm: 300 },
  { code: 'DR', name: 'Dunmere Red', entryType: 'heirloom', inRowSpacingMm: 450 },
  { code: 'EL', name: 'Elderfold Long', entryType: 'heirloom', inRowSpacingMm: 300 },
] as const;

async function trialWithEntries(title: string, design = 'rcbd', sites = ['Fenwright yard']) {
  const created = await as('lead').post('/api/trials', {
    title,
    crop: 'Okra',
    season: '2027',
    design,
    sowingDate: '2027-05-01',
  });
  expect(created.status).toBe(201);
  const slug = created.body.slug as string;
  for (const e of fiveEntries)
    expect((await as('lead').post(`/api/trials/${slug}/entries`, e)).status).toBe(201);
  for (const name of sites)
    expect(
      (
        await as('lead').post(`/api/trials/${slug}/sites`, {
          name,
          region: 'Fenwright, lower town',
          soilTexture: 'silt loam',
          irrigationMethod: 'drip',
        })
      ).status,
    ).toBe(201);
  return slug;
}

const design = async (slug: string) => {
  const res = await as('lead').get(`/api/trials/${slug}/design`);
  expect(res.status).toBe(200);
  return res.body as import('../../common/contracts/design').Design;
};

describe('creating a trial', () => {
  it('makes the creator its lead, with an address from the title', async () => {
    const res = await as('other').post('/api/trials', {
      title: 'Bean rows at Tollerby Green',
      crop: 'Bush bean',
      season: '2027',
      design: 'crd',
    });
    expect(res.status).toBe(201);
    // the title's words and a random tail, so the address says nothing about other trials
    expect(res.body.slug).toMatch(/^bean-rows-at-tollerby-green-[a-z2-9]{6}$/);
    const detail = await as('other').get(`/api/trials/${res.body.slug}`);
    expect(detail.status).toBe(200);
    expect(detail.body).toMatchObject({ myRole: 'lead', status: 'draft', design: 'crd' });
    expect(detail.body.permissions['trial.edit']).toBe(true);
    // the same title again gets another address of the same shape, never a numbered one
    const again = await as('other').post('/api/trials', {
      title: 'Bean rows at Tollerby Green',
      crop: 'Bush bean',
      season: '2028',
      design: 'crd',
    });
    expect(again.body.slug).toMatch(/^bean-rows-at-tollerby-green-[a-z2-9]{6}$/);
    expect(again.body.slug).not.toBe(res.body.slug);
    // a stranger does not see it
    expect((await as('lead').get(`/api/trials/${res.body.slug}`)).status).toBe(404);
  });

  it('gives an outsider no hint that a private trial of the same name exists', async () => {
    const create = (who: 'lead' | 'other', title: string) =>
      as(who).post('/api/trials', { title, crop: 'Okra', season: '2027', design: 'crd' });
    const hidden = await create('lead', 'Quiet okra at Fellmere');
    expect(hidden.status).toBe(201);
    const same = await create('other', 'Quiet okra at Fellmere');
    const fresh = await create('other', 'Loud okra at Fellmere');
    // The outsider's address has the same shape whether or not the name was taken.
    expect(same.body.slug).toMatch(/^quiet-okra-at-fellmere-[a-z2-9]{6}$/);
    expect(fresh.body.slug).toMatch(/^loud-okra-at-fellmere-[a-z2-9]{6}$/);
    expect(same.body.slug).not.toBe(hidden.body.slug);
    expect((await as('other').get(`/api/trials/${hidden.body.slug}`)).status).toBe(404);
  });

  it('lets an administrator create a trial for another account, and only an administrator', async () => {
    const res = await as('admin').post('/api/trials', {
      title: 'Pepper trial for Odile',
      crop: 'Pepper',
      season: '2027',
      design: 'rcbd',
      leadEmail: 'ODILE@fenwright.example',
    });
    expect(res.status).toBe(201);
    const members = await t.db
      .selectFrom('trial_members')
      .select(['user_id', 'role'])
      .where('trial_id', '=', res.body.id)
      .execute();
    expect(members).toEqual([{ user_id: lead.id, role: 'lead' }]);

    const refused = await as('other').post('/api/trials', {
      title: 'Not mine to give',
      crop: 'Okra',
      season: '2027',
      design: 'rcbd',
      leadEmail: 'odile@fenwright.example',
    });
    expect(refused.status).toBe(403);
    const unknown = await as('admin').post('/api/trials', {
      title: 'Nobody leads this',
      crop: 'Okra',
      season: '2027',
      design: 'rcbd',
      leadEmail: 'nobody@nowhere.example',
    });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details.fields).toEqual([
      { path: 'body.leadEmail', message: 'No account uses this e-mail address.' },
    ]);
    const left = await t.db
      .selectFrom('trials')
      .select('slug')
      .where('title', 'in', ['Not mine to give', 'Nobody leads this'])
      .execute();
    expect(left).toEqual([]);
  });

  it('refuses a bad form field by field, writing nothing', async () => {
    const before = await t.db
      .selectFrom('trials')
      .select((eb) => eb.fn.countAll().as('n'))
      .executeTakeFirstOrThrow();
    const res = await as('lead').post('/api/trials', {
      title: '  ',
      crop: 'Okra',
      season: '2027',
      design: 'latin-square',
      sowingDate: '2027-06-01',
      transplantDate: '2027-05-01',
    });
    expect(res.status).toBe(400);
    const paths = res.body.error.details.fields.map((f: { path: string }) => f.path);
    expect(paths).toEqual(expect.arrayContaining(['body.title', 'body.design']));
    const after = await t.db
      .selectFrom('trials')
      .select((eb) => eb.fn.countAll().as('n'))
      .executeTakeFirstOrThrow();
    expect(after.n).toBe(before.n);
    expect(
      (
        await request(t.app)
          .post('/api/trials')
          .set('Origin', TEST_ORIGIN)
          .send({ title: 'x', crop: 'x', season: 'x', design: 'crd' })
      ).status,
    ).toBe(401);
  });
});

describe('a lead lays out 5 entries × 3 blocks', () => {
  let slug: string;
  beforeAll(async () => {
    slug = await trialWithEntries('Fenwright okra, five entries');
  });

  it('generates every block with each entry exactly once, numbered field style', async () => {
    const res = await as('lead').post(`/api/trials/${slug}/layout`, {
      replicates: 3,
      seed: 4242,
      rowLengthMm: 3000,
      rowSpacingMm: 900,
    });
    expect(res.status).toBe(201);
    expect(res.body).toEqual({ seed: 4242, plots: 15 });
    const d = await design(slug);
    expect(d.layout).toMatchObject({ seed: 4242, replicates: 3, rowLengthMm: 3000, locked: false });
    expect(d.plots).toHaveLength(15);
    for (const block of [1, 2, 3]) {
      const ids = d.plots
        .filter((p) => p.block === block)
        .map((p) => p.entryId)
        .sort();
      expect(ids).toEqual(d.entries.map((e) => e.id).sort());
    }
    expect(d.plots.map((p) => p.plotNumber).sort((a, b) => a - b)).toEqual([
      101, 102, 103, 104, 105, 201, 202, 203, 204, 205, 301, 302, 303, 304, 305,
    ]);
    // plants per plot, floor(row length / spacing), common practice (no source)
    const planned = (code: string) => {
      const id = d.entries.find((e) => e.code === code)!.id;
      return [...new Set(d.plots.filter((p) => p.entryId === id).map((p) => p.plannedPlants))];
    };
    expect(planned('AW')).toEqual([10]);
    expect(planned('BD')).toEqual([3]);
    expect(planned('DR')).toEqual([6]);
  });

  it('gives the same layout again for the same seed, here and in another trial', async () => {
    const first = await design(slug);
    const order = (d: typeof first) =>
      d.plots.map((p) => `${p.plotNumber}:${d.entries.find((e) => e.id === p.entryId)!.code}`);
    await as('lead').post(`/api/trials/${slug}/layout`, {
      replicates: 3,
      seed: 4242,
      rowLengthMm: 3000,
      rowSpacingMm: 900,
    });
    expect(order(await design(slug))).toEqual(order(first));

    const twin = await trialWithEntries('Fenwright okra, the twin');
    await as('lead').post(`/api/trials/${twin}/layout`, {
      replicates: 3,
      seed: 4242,
      rowLengthMm: 3000,
      rowSpacingMm: 900,
    });
    expect(order(await design(twin))).toEqual(order(first));

    const fresh = await as('lead').post(`/api/trials/${slug}/layout`, {
      replicates: 3,
      rowLengthMm: 3000,
      rowSpacingMm: 900,
    });
    expect(fresh.status).toBe(201);
    expect(fresh.body.seed).toBeGreaterThanOrEqual(0);
    expect((await design(slug)).layout.seed).toBe(fresh.body.seed);
  });

  it('refuses to add or remove entries while a layout stands', async () => {
    const res = await as('lead').post(`/api/trials/${slug}/entries`, {
      code: 'FX',
      name: 'Foxhollow',
      entryType: 'heirloom',
    });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/Clear the layout/);
  });

  it('records what was planted, all or nothing', async () => {
    const d = await design(slug);
    const [a, b] = d.plots;
    const ok = await as('lead').put(`/api/trials/${slug}/layout/planting`, {
      plots: [
        { plotId: a!.id, plantsSet: 10, plantsSurviving: 9, gaps: 1, note: 'One lost to cutworm.' },
        { plotId: b!.id, plantsSet: 3, plantsSurviving: 3, gaps: 0 },
      ],
    });
    expect(ok.status).toBe(200);
    expect(ok.body).toEqual({ updated: 2 });

    const bad = await as('lead').put(`/api/trials/${slug}/layout/planting`, {
      plots: [
        { plotId: a!.id, plantsSet: 8, plantsSurviving: 8, gaps: 0 },
        { plotId: b!.id, plantsSet: 3, plantsSurviving: 4, gaps: 0 },
      ],
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fields[0].path).toBe('body.plots.1.plantsSurviving');

    const foreign = await t.db
      .selectFrom('plots')
      .select('id')
      .where('trial_id', '!=', d.id)
      .executeTakeFirstOrThrow();
    const notOurs = await as('lead').put(`/api/trials/${slug}/layout/planting`, {
      plots: [
        { plotId: a!.id, plantsSet: 8, plantsSurviving: 8, gaps: 0 },
        { plotId: foreign.id, plantsSet: 3, plantsSurviving: 3, gaps: 0 },
      ],
    });
    expect(notOurs.status).toBe(400);
    expect(notOurs.body.error.details.fields[0].path).toBe('body.plots.1.plotId');
    const after = (await design(slug)).plots.find((p) => p.id === a!.id)!;
    expect(after).toMatchObject({
      plantsSet: 10,
      plantsSurviving: 9,
      gaps: 1,
      plantedNote: 'One lost to cutworm.',
    });
  });

  it('locks the layout once a harvest exists: re-randomize and clear are refused with 409', async () => {
    const d = await design(slug);
    const before = d.plots.map((p) => p.id);
    await t.db
      .insertInto('harvests')
      .values({
        trial_id: d.id,
        plot_id: d.plots[0]!.id,
        harvested_on: '2027-07-10',
        fruit_count: 12,
        mass_g: 180,
        grade: 'marketable',
      })
      .execute();
    const again = await as('lead').post(`/api/trials/${slug}/layout`, {
      replicates: 3,
      seed: 1,
      rowLengthMm: 3000,
      rowSpacingMm: 900,
    });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toBe(
      'The layout is locked: 1 harvest already refer to its plots, so it can no longer be re-randomized or cleared.',
    );
    expect((await as('lead').delete(`/api/trials/${slug}/layout`)).status).toBe(409);
    const locked = await design(slug);
    expect(locked.layout.locked).toBe(true);
    expect(locked.plots.map((p) => p.id)).toEqual(before);
    const change = await as('lead').patch(`/api/trials/${slug}`, { design: 'crd' });
    expect(change.status).toBe(409);
  });
});

describe('blocks at several sites', () => {
  it('lays out entries × blocks plots at each site', async () => {
    const slug = await trialWithEntries('Three gardens, okra', 'multisite', [
      'Gorse Lane',
      'Hob Meadow',
      'Inkpen Yard',
    ]);
    const res = await as('lead').post(`/api/trials/${slug}/layout`, {
      replicates: 3,
      seed: 77,
      rowLengthMm: 4000,
      rowSpacingMm: 1000,
      rowsPerPlot: 2,
    });
    expect(res.status).toBe(201);
    const d = await design(slug);
    for (const site of d.sites) {
      const here = d.plots.filter((p) => p.siteId === site.id);
      expect(here).toHaveLength(5 * 3);
      for (const block of [1, 2, 3])
        expect(new Set(here.filter((p) => p.block === block).map((p) => p.entryId)).size).toBe(5);
    }
    // two rows of 4 m at 30 cm: 2 × floor(4000 / 300) = 26
    const aw = d.entries.find((e) => e.code === 'AW')!.id;
    expect(d.plots.find((p) => p.entryId === aw)!.plannedPlants).toBe(26);
  });

  it('refuses one-site designs at several sites, and entries without a spacing', async () => {
    const slug = await trialWithEntries('Two sites, wrong design', 'rcbd', [
      'Jay Hill',
      'Kestrel Bank',
    ]);
    const res = await as('lead').post(`/api/trials/${slug}/layout`, {
      replicates: 3,
      rowLengthMm: 3000,
      rowSpacingMm: 900,
    });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/several sites/);
    await as('lead').patch(`/api/trials/${slug}`, { design: 'multisite' });
    const entry = await as('lead').post(`/api/trials/${slug}/entries`, {
      code: 'NS',
      name: 'No Spacing Yet',
      entryType: 'hybrid',
    });
    expect(entry.status).toBe(201);
    const unspaced = await as('lead').post(`/api/trials/${slug}/layout`, {
      replicates: 2,
      rowLengthMm: 3000,
      rowSpacingMm: 900,
    });
    expect(unspaced.status).toBe(400);
    expect(unspaced.body.error.details.fields[0]).toEqual({
      path: 'body.inRowSpacingMm',
      message: 'Give an in-row spacing for the entries without their own (NS).',
    });
    expect((await design(slug)).plots).toEqual([]);
  });
});

describe('a second factor: fertilizer × variety', () => {
  const fertilizer = { factorName: 'Fertilizer', factorLevels: ['none', 'pre-plant'] };
  const lay = (slug: string, extra: object) =>
    as('lead').post(`/api/trials/${slug}/layout`, {
      replicates: 3,
      seed: 77,
      rowLengthMm: 3000,
      rowSpacingMm: 900,
      ...extra,
    });

  it('lays out a split plot: each block one main plot per level, every entry on its subplots', async () => {
    const slug = await trialWithEntries('Fenwright okra, fertilizer split plot');
    const res = await lay(slug, { ...fertilizer, factorArrangement: 'split_plot' });
    expect(res.status).toBe(201);
    expect(res.body).toEqual({ seed: 77, plots: 30 });
    const d = await design(slug);
    expect(d.factor).toEqual({
      name: 'Fertilizer',
      levels: ['none', 'pre-plant'],
      arrangement: 'split_plot',
    });
    const ids = d.entries.map((e) => e.id).sort();
    for (const block of [1, 2, 3]) {
      const inBlock = d.plots
        .filter((p) => p.block === block)
        .sort((a, b) => a.position - b.position);
      // positions 1–5 one main plot, 6–10 the other
      for (const half of [inBlock.slice(0, 5), inBlock.slice(5)]) {
        expect(new Set(half.map((p) => p.treatment)).size).toBe(1);
        expect(half.map((p) => p.entryId).sort()).toEqual(ids);
      }
      expect(new Set(inBlock.map((p) => p.treatment))).toEqual(new Set(['none', 'pre-plant']));
    }
  });

  it('lays out a factorial and drops the factor again when the name and levels are blank', async () => {
    const slug = await trialWithEntries('Fenwright okra, fertilizer factorial');
    expect((await lay(slug, { ...fertilizer, factorArrangement: 'factorial' })).status).toBe(201);
    let d = await design(slug);
    expect(d.plots).toHaveLength(30);
    for (const block of [1, 2, 3])
      expect(
        d.plots
          .filter((p) => p.block === block)
          .map((p) => `${p.treatment}/${p.entryId}`)
          .sort(),
      ).toEqual(['none', 'pre-plant'].flatMap((t) => d.entries.map((e) => `${t}/${e.id}`)).sort());
    expect((await lay(slug, {})).status).toBe(201);
    d = await design(slug);
    expect(d.factor).toBeNull();
    expect(d.plots).toHaveLength(15);
    expect(d.plots.every((p) => p.treatment === null)).toBe(true);
  });

  it('refuses one level, repeated levels, levels without a name, and a completely randomized trial', async () => {
    const slug = await trialWithEntries('Fenwright okra, refused factors');
    const one = await lay(slug, { factorName: 'Fertilizer', factorLevels: ['none'] });
    expect(one.status).toBe(400);
    expect(one.body.error.details.fields).toContainEqual({
      path: 'body.factorLevels',
      message: 'Name the treatment and give it at least two levels, or leave both blank.',
    });
    const twice = await lay(slug, { factorName: 'Fertilizer', factorLevels: ['none', 'None'] });
    expect(twice.status).toBe(400);
    expect(twice.body.error.details.fields[0].message).toBe(
      'Give each treatment level its own name.',
    );
    expect((await lay(slug, { factorLevels: ['none', 'pre-plant'] })).status).toBe(400);
    const crd = await trialWithEntries('Fenwright okra, completely randomized', 'crd');
    const refused = await lay(crd, { ...fertilizer, factorArrangement: 'split_plot' });
    expect(refused.status).toBe(400);
    expect(refused.body.error.details.fields[0].path).toBe('body.factorName');
    expect((await design(crd)).plots).toEqual([]);
    expect((await design(slug)).factor).toBeNull();
  });
});

describe('entries, sites and traits', () => {
  let slug: string;
  beforeAll(async () => {
    const res = await as('lead').post('/api/trials', {
      title: 'Lumber Hollow peppers',
      crop: 'Pepper',
      season: '2027',
      design: 'rcbd',
    });
    slug = res.body.slug;
  });

  it('edits an entry and refuses a code already in use', async () => {
    const a = await as('lead').post(`/api/trials/${slug}/entries`, {
      code: 'MH',
      name: 'Marrowby Hot',
      entryType: 'heirloom',
      seedSource: 'Lumber Hollow swap table',
      seedLot: 'LH-26-04',
      daysToMaturityClaimed: 75,
    });
    expect(a.status).toBe(201);
    const dup = await as('lead').post(`/api/trials/${slug}/entries`, {
      code: 'MH',
      name: 'Another',
      entryType: 'heirloom',
    });
    expect(dup.status).toBe(409);
    expect(dup.body.error.details.fields[0].path).toBe('body.code');
    const edit = await as('lead').patch(`/api/trials/${slug}/entries/${a.body.id}`, {
      notes: 'Thin walls.',
      inRowSpacingMm: 450,
    });
    expect(edit.status).toBe(204);
    const d = await design(slug);
    expect(d.entries[0]).toMatchObject({
      code: 'MH',
      seedLot: 'LH-26-04',
      inRowSpacingMm: 450,
      notes: 'Thin walls.',
    });
    const bad = await as('lead').patch(`/api/trials/${slug}/entries/${a.body.id}`, {
      daysToMaturityClaimed: 0,
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fields[0].path).toBe('body.daysToMaturityClaimed');
    expect((await as('lead').delete(`/api/trials/${slug}/entries/${a.body.id}`)).status).toBe(204);
    expect((await as('lead').delete(`/api/trials/${slug}/entries/${a.body.id}`)).status).toBe(404);
  });

  it('keeps exact coordinates out of sites', async () => {
    const res = await as('lead').post(`/api/trials/${slug}/sites`, {
      name: 'Back field',
      region: '45.5231, -122.6765',
    });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields[0]).toEqual({
      path: 'body.region',
      message: 'Give a town or region, not map coordinates.',
    });
    const soil = await as('lead').post(`/api/trials/${slug}/sites`, {
      name: 'Back field',
      soilTexture: 'gravel',
    });
    expect(soil.status).toBe(400);
    const ok = await as('lead').post(`/api/trials/${slug}/sites`, {
      name: 'Back field',
      region: 'Lumber Hollow',
      soilTexture: 'sandy clay loam',
      irrigationMethod: 'overhead',
      notes: 'Compost in spring.',
    });
    expect(ok.status).toBe(201);
  });

  it('adds every preset (the database agrees with each), and a custom score needs a scale', async () => {
    for (const p of traitPresets) {
      const res = await as('lead').post(`/api/trials/${slug}/traits`, p);
      expect(res.status, p.key).toBe(201);
    }
    const d = await design(slug);
    expect(d.traits.map((tr) => tr.key)).toEqual(traitPresets.map((p) => p.key));
    expect(d.traits.map((tr) => tr.sortOrder)).toEqual(traitPresets.map((_, i) => i));
    const noScale = await as('lead').post(`/api/trials/${slug}/traits`, {
      key: 'leaf_curl',
      label: 'Leaf curl',
      quantityKind: 'score',
      basis: 'plot',
      direction: 'lower',
    });
    expect(noScale.status).toBe(400);
    expect(noScale.body.error.details.fields[0].path).toBe('body.scaleMax');
    const again = await as('lead').post(`/api/trials/${slug}/traits`, traitPresets[0]);
    expect(again.status).toBe(409);
  });

  it('protects a trait that measurements use', async () => {
    const d = await design(slug);
    const trait = d.traits.find((tr) => tr.key === 'plant_height')!;
    const entry = await as('lead').post(`/api/trials/${slug}/entries`, {
      code: 'QS',
      name: 'Quillsby',
      entryType: 'heirloom',
    });
    const site = d.sites[0]!;
    const plot = await t.db
      .insertInto('plots')
      .values({
        trial_id: d.id,
        site_id: site.id,
        entry_id: entry.body.id,
        block: 1,
        position: 1,
        plot_number: 101,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    await t.db
      .insertInto('observations')
      .values({
        trial_id: d.id,
        plot_id: plot.id,
        trait_id: trait.id,
        observed_on: '2027-08-01',
        value: 640,
      })
      .execute();
    expect((await as('lead').delete(`/api/trials/${slug}/traits/${trait.id}`)).status).toBe(409);
    expect(
      (await as('lead').patch(`/api/trials/${slug}/traits/${trait.id}`, { quantityKind: 'count' }))
        .status,
    ).toBe(409);
    expect(
      (
        await as('lead').patch(`/api/trials/${slug}/traits/${trait.id}`, {
          label: 'Height at first flower',
        })
      ).status,
    ).toBe(200);
  });

  it('edits the settings and the planned fertilizer policy', async () => {
    const res = await as('lead').patch(`/api/trials/${slug}`, {
      status: 'active',
      fertilizerPolicy: 'none_applied',
      fertilizerNotes: 'Compost only, before planting.',
      sowingDate: '2027-04-10',
      transplantDate: '2027-05-20',
    });
    expect(res.status).toBe(204);
    const d = await design(slug);
    expect(d).toMatchObject({
      status: 'active',
      fertilizerPolicy: 'none_applied',
      sowingDate: '2027-04-10',
      transplantDate: '2027-05-20',
    });
    const backwards = await as('lead').patch(`/api/trials/${slug}`, {
      transplantDate: '2027-03-01',
    });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.details.fields[0].path).toBe('body.transplantDate');
    expect((await as('lead').patch(`/api/trials/${slug}`, { status: 'published' })).status).toBe(
      400,
    );
  });
});

describe('starting a trial in a chosen group', () => {
  const body = { crop: 'Okra', season: '2027', design: 'rcbd' };
  const groupOf = async (slug: string) =>
    (
      await t.db
        .selectFrom('trials')
        .select('group_id')
        .where('slug', '=', slug)
        .executeTakeFirstOrThrow()
    ).group_id;

  it('lets a coordinator choose among their groups, keeps the default without a choice, and refuses others by field', async () => {
    const first = await as('lead').post('/api/trials', {
      ...body,
      title: 'Fenwright, default group',
    });
    expect(first.status).toBe(201);
    const ownGroup = await groupOf(first.body.slug);
    const second = await t.db
      .insertInto('groups')
      .values({
        slug: 'fenwright-second',
        name: 'Fenwright second plot',
        created_by: null,
        updated_by: null,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    await t.db
      .insertInto('group_members')
      .values({ group_id: second.id, user_id: lead.id, role: 'coordinator', created_by: null })
      .execute();

    const chosen = await as('lead').post('/api/trials', {
      ...body,
      title: 'Fenwright, second group',
      groupId: second.id,
    });
    expect(chosen.status, JSON.stringify(chosen.body)).toBe(201);
    expect(await groupOf(chosen.body.slug)).toBe(second.id);
    const again = await as('lead').post('/api/trials', { ...body, title: 'Fenwright, no choice' });
    expect(await groupOf(again.body.slug)).toBe(ownGroup);

    const before = await t.db.selectFrom('trials').select('id').execute();
    const outside = await as('other').post('/api/trials', {
      ...body,
      title: 'Not my group',
      groupId: second.id,
    });
    expect(outside.status).toBe(404);
    expect(outside.body.error.details.fields[0].path).toBe('body.groupId');
    await t.db
      .insertInto('group_members')
      .values({ group_id: second.id, user_id: other.id, role: 'member', created_by: null })
      .execute();
    const member = await as('other').post('/api/trials', {
      ...body,
      title: 'Member only',
      groupId: second.id,
    });
    expect(member.status).toBe(403);
    expect(member.body.error.details.fields[0].path).toBe('body.groupId');
    expect(await t.db.selectFrom('trials').select('id').execute()).toHaveLength(before.length);
  });
});
