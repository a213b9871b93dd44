/**
 * CSV import and export of field records: a file with bad rows is refused whole with each
 * row, column and message, and nothing is written; exporting then importing gives the same
 * records back; units in the header are converted with the exact NIST definitions.
 */
import crypto from 'node:crypto';
import { parse } from 'csv-parse/sync';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
} from '../support/test-app';

let t: TestApp;
let cookie: string;
let leadId: string;
const today = new Date().toISOString().slice(0, 10);

/** A small trial: two sites, two entries, plots 101–102 at each, a length and a score trait. */
async function makeTrial(slug: string) {
  const trial = await t.db
    .insertInto('trials')
    .values({
      slug,
      title: `Trial ${slug}`,
      crop: 'Bush bean',
      season: '2026',
      design: 'rcbd',
      status: 'active',
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  await t.db
    .insertInto('trial_members')
    .values({ trial_id: trial.id, user_id: leadId, role: 'lead' })
    .execute();
  const sites = await t.db
    .insertInto('sites')
    .values([
      { trial_id: trial.id, name: 'Hollyoak Bed' },
      { trial_id: trial.id, name: 'Tansy Row' },
    ])
    .returning(['id', 'name'])
    .execute();
  const entries = await t.db
    .insertInto('entries')
    .values([
      { trial_id: trial.id, name: 'Brindle Pod', code: 'BP', entry_type: 'heirloom' },
      { trial_id: trial.id, name: 'Lantern Wax', code: 'LW', entry_type: 'heirloom' },
    ])
    .returning('id')
    .execute();
  const plots: Record<string, string> = {};
  for (const site of sites) {
    for (const [i, entry] of entries.entries()) {
      const p = await t.db
        .insertInto('plots')
        .values({
          trial_id: trial.id,
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
  }
  const traits = await t.db
    .insertInto('traits')
    .values([
      {
        trial_id: trial.id,
        key: 'plant_height',
        label: 'Plant height',
        quantity_kind: 'length',
        basis: 'plant',
        direction: 'none',
        sort_order: 1,
      },
      {
        trial_id: trial.id,
        key: 'vigor',
        label: 'Vigor',
        quantity_kind: 'score',
        basis: 'plot',
        direction: 'higher',
        scale_min: 1,
        scale_max: 5,
        sort_order: 2,
      },
    ])
    .returning(['id', 'key'])
    .execute();
  return {
    id: trial.id,
    slug,
    plots,
    traits: Object.fromEntries(traits.map((x) => [x.key, x.id])),
  };
}

const post = (url: string, body: object) =>
  request(t.app).post(url).set('Origin', TEST_ORIGIN).set('Cookie', cookie).send(body);
const get = (url: string) =>
  request(t.app).get(url).set('Origin', TEST_ORIGIN).set('Cookie', cookie);
const countOf = async (table: 'harvests' | 'observations', trialId: string) =>
  Number(
    (
      await t.db
        .selectFrom(table)
        .select((eb) => eb.fn.countAll().as('n'))
        .where('trial_id', '=', trialId)
        .executeTakeFirstOrThrow()
    ).n,
  );

let one: Awaited<ReturnType<typeof makeTrial>>;
let two: Awaited<ReturnType<typeof makeTrial>>;

beforeAll(async () => {
  t = await createTestApp();
  const lead = await createUser(t.db, { name: 'Orla Fenwick' });
  leadId = lead.id;
  cookie = await mintSessionCookie(t, lead);
  one = await makeTrial('csv-one');
  two = await makeTrial('csv-two');
}, 60_000);
afterAll(async () => {
  await t.close();
});

describe('a file with bad rows', () => {
  const csv = [
    'site,plot_number,entry_code,harvested_on,fruit_count,mass_g,grade,note',
    `Hollyoak Bed,999,,${today},4,50,marketable,unknown plot`,
    `Hollyoak Bed,101,BP,${today},4,-12,marketable,negative mass`,
    `Hollyoak Bed,102,LW,2099-08-01,4,50,cull,a date in the future`,
    `Tansy Row,101,BP,${today},lots,50,marketable,a non-number`,
    `Tansy Row,102,LW,${today},3,41.5,marketable,a good row`,
  ].join('\n');

  it('is previewed with row, column and message for each problem', async () => {
    const res = await post(`/api/trials/${one.slug}/records/import/preview`, {
      kind: 'harvests',
      csv,
    });
    expect(res.status).toBe(200);
    expect(res.body.errors).toEqual([
      { row: 2, column: 'plot_number', message: 'No plot 999 at Hollyoak Bed.' },
      { row: 3, column: 'mass_g', message: 'The mass cannot be negative.' },
      { row: 4, column: 'harvested_on', message: 'The date is in the future.' },
      { row: 5, column: 'fruit_count', message: 'Enter a whole number.' },
    ]);
    expect(res.body.newCount).toBe(1);
    expect(res.body.rows).toEqual([
      {
        row: 6,
        status: 'new',
        plotLabel: 'Tansy Row plot 102 (LW)',
        record: { kind: 'harvest', date: today, fruitCount: 3, massG: 41.5, grade: 'marketable' },
      },
    ]);
  });

  it('is refused whole with the row numbers, and nothing is written', async () => {
    const before = await countOf('harvests', one.id);
    const res = await post(`/api/trials/${one.slug}/records/import`, { kind: 'harvests', csv });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe('Rows 2, 3, 4, 5 have problems; nothing was imported.');
    expect(res.body.error.details.rows.map((r: { row: number }) => r.row)).toEqual([2, 3, 4, 5]);
    expect(await countOf('harvests', one.id)).toBe(before);
    const audit = await t.db
      .selectFrom('audit_log')
      .select('id')
      .where('trial_id', '=', one.id)
      .execute();
    expect(audit).toEqual([]);
  });

  it('names a wrong entry code, an unknown trait, a score off the scale and a missing column', async () => {
    const obs = [
      'site,plot_number,entry_code,trait_key,observed_on,plant_number,value,unit',
      `Hollyoak Bed,101,LW,plant_height,${today},1,400,mm`,
      `Hollyoak Bed,101,BP,pod_colour,${today},,2,`,
      `Hollyoak Bed,101,BP,vigor,${today},,9,`,
      `Hollyoak Bed,101,BP,plant_height,${today},1,40,furlong`,
    ].join('\n');
    const res = await post(`/api/trials/${one.slug}/records/import`, {
      kind: 'observations',
      csv: obs,
    });
    expect(res.status).toBe(400);
    expect(res.body.error.details.rows).toEqual([
      {
        row: 2,
        column: 'entry_code',
        message: 'Plot 101 at Hollyoak Bed holds entry BP, not LW: check the plot number.',
      },
      { row: 3, column: 'trait_key', message: 'No trait "pod_colour" in this trial.' },
      { row: 4, column: 'value', message: 'Vigor is scored from 1 to 5.' },
      { row: 5, column: 'unit', message: 'Plant height is recorded in mm, cm, m, in, ft.' },
    ]);
    const noMass = await post(`/api/trials/${one.slug}/records/import`, {
      kind: 'harvests',
      csv: 'site,plot_number,harvested_on,fruit_count,grade\nHollyoak Bed,101,2026-07-01,1,cull\n',
    });
    expect(noMass.status).toBe(400);
    expect(noMass.body.error.details.rows[0]).toMatchObject({ row: 1, column: 'mass_g' });
    expect(await countOf('observations', one.id)).toBe(0);
  });
});

describe('units in the header', () => {
  it('converts pounds and inches with the NIST exact factors', async () => {
    // NIST Handbook 44, Appendix C: 1 lb = 453.59237 g exactly; 1 in = 25.4 mm exactly.
    const res = await post(`/api/trials/${two.slug}/records/import`, {
      kind: 'harvests',
      csv: `site,plot_number,harvested_on,fruit_count,mass_lb,grade\nHollyoak Bed,101,${today},9,2.2,marketable\n`,
    });
    expect(res.status).toBe(201);
    const h = await t.db
      .selectFrom('harvests')
      .select('mass_g')
      .where('trial_id', '=', two.id)
      .executeTakeFirstOrThrow();
    // 2.2 × 453.59237 = 997.903214 exactly, stored without binary noise (not 997.9032140000002).
    expect(h.mass_g).toBe(997.903214);
    const obs = await post(`/api/trials/${two.slug}/records/import`, {
      kind: 'observations',
      csv: `site,plot_number,trait_key,observed_on,plant_number,value,unit\nHollyoak Bed,101,plant_height,${today},1,10.1,in\n`,
    });
    expect(obs.status).toBe(201);
    const o = await t.db
      .selectFrom('observations')
      .select('value')
      .where('trial_id', '=', two.id)
      .executeTakeFirstOrThrow();
    // 10.1 × 25.4 = 256.54 exactly (not 256.53999999999996).
    expect(o.value).toBe(256.54);
    // clear trial two for the round trip below
    await t.db.deleteFrom('harvests').where('trial_id', '=', two.id).execute();
    await t.db.deleteFrom('observations').where('trial_id', '=', two.id).execute();
  });
});

describe('export then import', () => {
  it('round-trips harvests and observations, and a second import doubles nothing', async () => {
    const harvests = [
      ['Hollyoak Bed#101', 12, 180.25, 'marketable', 'first pick'],
      ['Hollyoak Bed#101', 2, 31, 'cull', 'curled, "hooked" tips'],
      ['Tansy Row#102', 8, 96.5, 'marketable', ''],
    ] as const;
    for (const [plot, fruitCount, massG, grade, note] of harvests) {
      const r = await post(`/api/trials/${one.slug}/harvests`, {
        id: crypto.randomUUID(),
        plotId: one.plots[plot],
        harvestedOn: today,
        fruitCount,
        massG,
        grade,
        note,
      });
      expect(r.status).toBe(201);
    }
    for (const [plant, value] of [
      [1, 412],
      [2, 398.5],
      [3, 440],
    ] as const) {
      await post(`/api/trials/${one.slug}/observations`, {
        id: crypto.randomUUID(),
        plotId: one.plots['Tansy Row#101'],
        traitId: one.traits.plant_height,
        observedOn: today,
        plantNumber: plant,
        value,
      });
    }
    await post(`/api/trials/${one.slug}/observations`, {
      id: crypto.randomUUID(),
      plotId: one.plots['Tansy Row#101'],
      traitId: one.traits.vigor,
      observedOn: today,
      value: 4,
    });

    const exported = {
      harvests: (await get(`/api/trials/${one.slug}/records/export/harvests`)).text,
      observations: (await get(`/api/trials/${one.slug}/records/export/observations`)).text,
    };
    const header = exported.harvests.split('\n')[0];
    expect(header).toBe(
      'record_id,site,plot_number,entry_code,harvested_on,fruit_count,mass_g,grade,note',
    );
    expect(exported.observations.split('\n')[0]).toBe(
      'record_id,site,plot_number,entry_code,trait_key,observed_on,plant_number,value,unit,value_date,note',
    );

    // Into a trial of the same design: the same records, with ids of its own.
    for (const kind of ['harvests', 'observations'] as const) {
      const r = await post(`/api/trials/${two.slug}/records/import`, { kind, csv: exported[kind] });
      expect(r.status).toBe(201);
      expect(r.body).toEqual({ created: kind === 'harvests' ? 3 : 4, alreadyRecorded: 0 });
    }
    const withoutIds = (text: string) =>
      (parse(text) as string[][])
        .slice(1)
        .map((row) => row.slice(1))
        .sort();
    for (const dataset of ['harvests', 'observations'] as const) {
      const back = (await get(`/api/trials/${two.slug}/records/export/${dataset}`)).text;
      expect(withoutIds(back)).toEqual(withoutIds(exported[dataset]));
    }

    // Back into the trial it came from: every row is already recorded.
    const again = await post(`/api/trials/${one.slug}/records/import`, {
      kind: 'harvests',
      csv: exported.harvests,
    });
    expect(again.status).toBe(201);
    expect(again.body).toEqual({ created: 0, alreadyRecorded: 3 });
    expect(await countOf('harvests', one.id)).toBe(3);
  });

  it('exports plot totals with units in the header', async () => {
    const res = await get(`/api/trials/${one.slug}/records/export/plot-totals`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toBe(
      'attachment; filename="csv-one-plot-totals.csv"',
    );
    const [head, ...rows] = parse(res.text) as string[][];
    expect(head).toEqual([
      'site',
      'plot_number',
      'block',
      'entry_code',
      'entry_name',
      'plants_set',
      'plants_surviving',
      'harvests',
      'fruit_count_marketable',
      'fruit_count_cull',
      'mass_marketable_g',
      'mass_cull_g',
      'mass_total_g',
      'plant_height_mean_mm',
      'plant_height_n',
      'vigor_mean_score',
      'vigor_n',
    ]);
    const byPlot = Object.fromEntries(rows.map((r) => [`${r[0]}#${r[1]}`, r]));
    // Hollyoak 101: 12 + 2 fruit, 180.25 g marketable + 31 g cull.
    expect(byPlot['Hollyoak Bed#101']!.slice(7, 13)).toEqual([
      '2',
      '12',
      '2',
      '180.25',
      '31',
      '211.25',
    ]);
    // Tansy 101: heights 412, 398.5, 440 → mean 416.8333…
    // Shown to the recorded decimals (1) plus one for a mean (common/precision.ts).
    expect(byPlot['Tansy Row#101']![13]).toBe('416.83');
    expect(byPlot['Tansy Row#101']!.slice(14)).toEqual(['3', '4', '1']);
  });
});
