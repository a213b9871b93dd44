/**
 * The paper recording sheet typed back in: the columns the sheet prints are read into harvests
 * and observations in stored units; a file with any bad row is refused whole with row, column
 * and message, and nothing is written; the same sheet imported twice is recorded once; a grower
 * kept to one site cannot import another site's rows.
 */
import type { Insertable } from 'kysely';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
} from '../support/test-app';
import type { Database } from '../../db/schema';

let t: TestApp;
let cookie: string;
let growerCookie: string;
let trial: {
  id: string;
  slug: string;
  plots: Record<string, string>;
  traits: Record<string, string>;
};
const today = new Date().toISOString().slice(0, 10);

/**
 * Two sites (Quillfield, Marram End), entries QB (Quillback) and SW (Saltwick) at plots 101–102,
 * and traits of every kind a sheet carries: a per-plant length, a plot score where lower is
 * better, a plot count, a plot date and a per-harvest mass (which the harvest columns cover).
 */
async function makeTrial(leadId: string, growerId: string) {
  const { id } = await t.db
    .insertInto('trials')
    .values({
      slug: 'sheet-trial',
      title: 'Runner bean sheet trial',
      crop: 'Runner bean',
      season: '2026',
      design: 'rcbd',
      status: 'active',
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  const sites = await t.db
    .insertInto('sites')
    .values([
      { trial_id: id, name: 'Quillfield' },
      { trial_id: id, name: 'Marram End' },
    ])
    .returning(['id', 'name'])
    .execute();
  await t.db
    .insertInto('trial_members')
    .values([
      { trial_id: id, user_id: leadId, role: 'lead' },
      { trial_id: id, user_id: growerId, role: 'grower' },
    ])
    .execute();
  await t.db
    .insertInto('trial_member_sites')
    .values({ trial_id: id, user_id: growerId, site_id: sites[0]!.id })
    .execute();
  const entries = await t.db
    .insertInto('entries')
    .values([
      { trial_id: id, name: 'Quillback', code: 'QB', entry_type: 'heirloom' },
      { trial_id: id, name: 'Saltwick', code: 'SW', entry_type: 'heirloom' },
    ])
    .returning('id')
    .execute();
  const plots: Record<string, string> = {};
  for (const site of sites)
    for (const [i, entry] of entries.entries()) {
      const p = await t.db
        .insertInto('plots')
        .values({
          trial_id: id,
          site_id: site.id,
          entry_id: entry.id,
          block: 1,
          position: i + 1,
          plot_number: 101 + i,
        })
        .returning('id')
        .executeTakeFirstOrThrow();
      plots[`${site.name}#${101 + i}`] = p.id;
    }
  const traits = await t.db
    .insertInto('traits')
    .values(
      (
        [
          {
            key: 'plant_height',
            label: 'Plant height',
            quantity_kind: 'length',
            basis: 'plant',
            direction: 'none',
          },
          {
            key: 'disease',
            label: 'Disease',
            quantity_kind: 'score',
            basis: 'plot',
            direction: 'lower',
            scale_min: 0,
            scale_max: 5,
          },
          {
            key: 'pods_set',
            label: 'Pods set',
            quantity_kind: 'count',
            basis: 'plot',
            direction: 'higher',
          },
          {
            key: 'first_flower',
            label: 'First flower',
            quantity_kind: 'date',
            basis: 'plot',
            direction: 'lower',
          },
          {
            key: 'marketable_yield',
            label: 'Marketable yield',
            quantity_kind: 'mass',
            basis: 'harvest',
            direction: 'higher',
          },
        ] satisfies Omit<Insertable<Database['traits']>, 'trial_id'>[]
      ).map((tr, i) => ({ ...tr, trial_id: id, sort_order: i })),
    )
    .returning(['id', 'key'])
    .execute();
  return {
    id,
    slug: 'sheet-trial',
    plots,
    traits: Object.fromEntries(traits.map((x) => [x.key, x.id])),
  };
}

const post = (url: string, body: object, who = cookie) =>
  request(t.app).post(url).set('Origin', TEST_ORIGIN).set('Cookie', who).send(body);
const counts = async () => {
  const n = async (table: 'harvests' | 'observations' | 'audit_log') =>
    Number(
      (
        await t.db
          .selectFrom(table)
          .select((eb) => eb.fn.countAll().as('n'))
          .where('trial_id', '=', trial.id)
          .executeTakeFirstOrThrow()
      ).n,
    );
  return {
    harvests: await n('harvests'),
    observations: await n('observations'),
    audit: await n('audit_log'),
  };
};
const csvOf = (rows: (string | number)[][]) => rows.map((r) => r.join(',')).join('\n');

beforeAll(async () => {
  t = await createTestApp();
  const lead = await createUser(t.db, { name: 'Ebba Larkspur' });
  const grower = await createUser(t.db, { name: 'Tobin Ashgrove' });
  cookie = await mintSessionCookie(t, lead);
  growerCookie = await mintSessionCookie(t, grower);
  trial = await makeTrial(lead.id, grower.id);
}, 60_000);
afterAll(async () => {
  await t.close();
});

const metricHeader = [
  'site',
  'plot_number',
  'entry_code',
  'recorded_on',
  'marketable_count',
  'marketable_mass_kg',
  'cull_count',
  'cull_mass_kg',
  'plant_height_cm_p1',
  'plant_height_cm_p2',
  'disease',
  'pods_set',
  'first_flower',
  'note',
];

describe('a sheet with bad rows', () => {
  const sheet = csvOf([
    metricHeader,
    ['Quillfield', 101, 'QB', today, 12, '"1,8"', '', '', 41, 39.5, 2, 30, '', ''],
    ['Quillfield', 102, 'QB', today, 9, 1.1, '', '', '', '', '', '', '', 'wrong entry code'],
    ['Marram End', 101, 'QB', today, 7, '', '', '', '', '', '', '', '', 'count without mass'],
    [
      'Marram End',
      102,
      'SW',
      '',
      '',
      '',
      '',
      '',
      50,
      '',
      6,
      '',
      '',
      'no date, score off the scale',
    ],
    ['Marram End', 103, '', today, 4, 0.5, '', '', '', '', '', '2.5', '', 'no such plot'],
  ]);

  it('is previewed with the row, column and message of each problem', async () => {
    const res = await post(`/api/trials/${trial.slug}/records/import/preview`, {
      kind: 'sheet',
      csv: sheet,
    });
    expect(res.status).toBe(200);
    expect(res.body.errors).toEqual([
      {
        row: 3,
        column: 'entry_code',
        message: 'Plot 102 at Quillfield holds entry SW, not QB: check the plot number.',
      },
      { row: 4, column: 'marketable_mass_kg', message: 'Enter the mass of these fruit too.' },
      { row: 5, column: 'recorded_on', message: 'Enter the date the plot was recorded.' },
      { row: 5, column: 'disease', message: 'Disease is scored from 0 to 5.' },
      { row: 6, column: 'plot_number', message: 'No plot 103 at Marram End.' },
      { row: 6, column: 'pods_set', message: 'Pods set is a count: a whole number, 0 or more.' },
    ]);
    // Row 2 is good: one harvest and four observations, the decimal comma read as a point.
    expect(res.body.newCount).toBe(5);
    // What each would record, in stored units (g, mm): the reader's units are the client's.
    const seen = (
      traitKey: string,
      traitLabel: string,
      plantNumber: number | null,
      value: number,
    ) => ({
      kind: 'observation',
      date: today,
      traitKey,
      traitLabel,
      plantNumber,
      value,
      valueDate: null,
    });
    expect(res.body.rows.map((r: { record: unknown }) => r.record)).toEqual([
      { kind: 'harvest', date: today, fruitCount: 12, massG: 1800, grade: 'marketable' },
      seen('plant_height', 'Plant height', 1, 410),
      seen('plant_height', 'Plant height', 2, 395),
      seen('disease', 'Disease', null, 2),
      seen('pods_set', 'Pods set', null, 30),
    ]);
  });

  it('is refused whole, and nothing is written', async () => {
    const before = await counts();
    const res = await post(`/api/trials/${trial.slug}/records/import`, {
      kind: 'sheet',
      csv: sheet,
    });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.message).toBe('Rows 3, 4, 5, 6 have problems; nothing was imported.');
    expect(await counts()).toEqual(before);
    expect(before).toEqual({ harvests: 0, observations: 0, audit: 0 });
  });

  it('names a header it cannot read', async () => {
    const res = await post(`/api/trials/${trial.slug}/records/import/preview`, {
      kind: 'sheet',
      csv: 'plot_number,recorded_on,plant_height_cm,plant_height_p1,disease_p1,marketable_mass,leaf_colour\n101,2026-07-01,1,2,3,4,5\n',
    });
    expect(res.status).toBe(200);
    expect(res.body.errors).toEqual([
      {
        row: 1,
        column: 'plant_height_cm',
        message: 'Plant height is recorded per plant: name the plant, as in plant_height_cm_p1.',
      },
      {
        row: 1,
        column: 'plant_height_p1',
        message: 'Plant height is typed in mm, cm, in: name the unit, as in plant_height_cm.',
      },
      {
        row: 1,
        column: 'disease_p1',
        message: 'Disease is recorded once per plot: drop the plant number.',
      },
      {
        row: 1,
        column: 'marketable_mass',
        message: 'Name the mass unit as the sheet does: marketable_mass_g, _kg, _oz or _lb.',
      },
      { row: 1, column: 'leaf_colour', message: 'Unknown column "leaf_colour".' },
    ]);
  });
});

describe('a good sheet', () => {
  it('is read in stored units; plots left blank are skipped; a second import doubles nothing', async () => {
    const sheet = csvOf([
      metricHeader,
      ['Quillfield', 101, 'QB', today, 12, 1.8, 2, 0.25, 41, 39.5, 2, 30, today, 'first pick'],
      ['Quillfield', 102, 'SW', today, '', '', '', '', '', '', '', '', '', ''],
      ['Marram End', 101, 'QB', today, 0, 0, '', '', '', '', 0, '', '', ''],
      ['Marram End', 102, '', today, '', '', 3, '0.4', '', 62, '', '', '', ''],
    ]);
    const res = await post(`/api/trials/${trial.slug}/records/import`, {
      kind: 'sheet',
      csv: sheet,
    });
    expect(res.status).toBe(201);
    expect(res.body).toEqual({ created: 11, alreadyRecorded: 0 });
    const harvests = await t.db
      .selectFrom('harvests')
      .select(['plot_id', 'fruit_count', 'mass_g', 'grade', 'note', 'harvested_on'])
      .where('trial_id', '=', trial.id)
      .orderBy('mass_g')
      .execute();
    // 1 kg = 1000 g (SI, by definition).
    expect(harvests.map((h) => [h.plot_id, h.fruit_count, h.mass_g, h.grade])).toEqual([
      [trial.plots['Marram End#101'], 0, 0, 'marketable'],
      [trial.plots['Quillfield#101'], 2, 250, 'cull'],
      [trial.plots['Marram End#102'], 3, 400, 'cull'],
      [trial.plots['Quillfield#101'], 12, 1800, 'marketable'],
    ]);
    expect(harvests.find((h) => h.mass_g === 1800)!.note).toBe('first pick');
    const observations = await t.db
      .selectFrom('observations')
      .select(['plot_id', 'trait_id', 'plant_number', 'value', 'value_date'])
      .where('trial_id', '=', trial.id)
      .execute();
    const seen = observations
      .map((o) => [o.plot_id, o.trait_id, o.plant_number, o.value, o.value_date])
      .sort((a, b) => String(a).localeCompare(String(b)));
    // 1 cm = 10 mm (SI prefixes).
    expect(seen).toEqual(
      [
        [trial.plots['Quillfield#101'], trial.traits.plant_height, 1, 410, null],
        [trial.plots['Quillfield#101'], trial.traits.plant_height, 2, 395, null],
        [trial.plots['Quillfield#101'], trial.traits.disease, null, 2, null],
        [trial.plots['Quillfield#101'], trial.traits.pods_set, null, 30, null],
        [trial.plots['Quillfield#101'], trial.traits.first_flower, null, null, today],
        [trial.plots['Marram End#101'], trial.traits.disease, null, 0, null],
        [trial.plots['Marram End#102'], trial.traits.plant_height, 2, 620, null],
      ].sort((a, b) => String(a).localeCompare(String(b))),
    );

    const again = await post(`/api/trials/${trial.slug}/records/import`, {
      kind: 'sheet',
      csv: sheet,
    });
    expect(again.status).toBe(201);
    expect(again.body).toEqual({ created: 0, alreadyRecorded: 11 });
    expect(await counts()).toMatchObject({ harvests: 4, observations: 7 });
  });

  it('reads a sheet printed in US customary units with the NIST exact factors', async () => {
    // NIST Handbook 44, Appendix C: 1 lb = 453.59237 g and 1 in = 25.4 mm, exactly.
    const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
    const res = await post(`/api/trials/${trial.slug}/records/import`, {
      kind: 'sheet',
      csv: csvOf([
        [
          'plot_number',
          'site',
          'recorded_on',
          'marketable_count',
          'marketable_mass_lb',
          'plant_height_in_p1',
        ],
        [102, 'Quillfield', yesterday, 5, 2.2, 10.1],
      ]),
    });
    expect(res.status).toBe(201);
    expect(res.body).toEqual({ created: 2, alreadyRecorded: 0 });
    const h = await t.db
      .selectFrom('harvests')
      .select('mass_g')
      .where('plot_id', '=', trial.plots['Quillfield#102']!)
      .executeTakeFirstOrThrow();
    // 2.2 × 453.59237 = 997.903214 exactly, stored without binary noise (not 997.9032140000002).
    expect(h.mass_g).toBe(997.903214);
    const o = await t.db
      .selectFrom('observations')
      .select(['value', 'plant_number'])
      .where('plot_id', '=', trial.plots['Quillfield#102']!)
      .executeTakeFirstOrThrow();
    // 10.1 × 25.4 = 256.54 exactly (not 256.53999999999996).
    expect(o).toEqual({ value: 256.54, plant_number: 1 });
  });

  it('refuses a plot written twice for one date', async () => {
    const res = await post(`/api/trials/${trial.slug}/records/import/preview`, {
      kind: 'sheet',
      csv: csvOf([
        ['site', 'plot_number', 'recorded_on', 'disease'],
        ['Quillfield', 101, today, 1],
        ['Quillfield', 101, today, 3],
      ]),
    });
    expect(res.body.errors).toEqual([
      {
        row: 3,
        column: 'plot_number',
        message: `Row 2 already records this plot on ${today}: join the two rows.`,
      },
    ]);
  });
});

describe('a grower kept to one site', () => {
  it('cannot import rows for another site, and nothing is written', async () => {
    const before = await counts();
    const res = await post(
      `/api/trials/${trial.slug}/records/import`,
      {
        kind: 'sheet',
        csv: csvOf([
          ['site', 'plot_number', 'recorded_on', 'pods_set'],
          ['Quillfield', 102, today, 14],
          ['Marram End', 102, today, 11],
        ]),
      },
      growerCookie,
    );
    expect(res.status).toBe(403);
    expect(res.body.error.message).toBe(
      'Row 3 is at a site where you may not record; nothing was imported.',
    );
    expect(await counts()).toEqual(before);
  });
});
