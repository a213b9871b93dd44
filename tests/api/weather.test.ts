// Daily weather per site (typed in, CSV import) and the season summary: degree days, hot days
// and water against harvest dates, on a small fictional trial.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, createUser, mintSessionCookie, type TestApp } from '../support/test-app';

let t: TestApp;
let lead: string;
let grower: string;
let trialId: string;
let siteA: string;
let siteB: string;
let plotA: string;
const SLUG = 'weather-test-okra';

beforeAll(async () => {
  t = await createTestApp();
  const leadUser = await createUser(t.db, { name: 'Wren Lowmoor' });
  const growerUser = await createUser(t.db, { name: 'Oren Fallowby' });
  lead = await mintSessionCookie(t, leadUser);
  grower = await mintSessionCookie(t, growerUser);
  const trial = await t.db
    .insertInto('trials')
    .values({
      slug: SLUG,
      title: 'Weather test okra',
      crop: 'Okra',
      season: '2026',
      design: 'rcbd',
      status: 'active',
      sowing_date: '2026-06-01',
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  trialId = trial.id;
  const ids = await Promise.all(
    ['Hollow Field', 'Upper Terrace'].map(
      async (name) =>
        (
          await t.db
            .insertInto('sites')
            .values({ trial_id: trialId, name })
            .returning('id')
            .executeTakeFirstOrThrow()
        ).id,
    ),
  );
  siteA = ids[0]!;
  siteB = ids[1]!;
  const entry = await t.db
    .insertInto('entries')
    .values({ trial_id: trialId, name: 'Pebble Green', code: 'PG', entry_type: 'heirloom' })
    .returning('id')
    .executeTakeFirstOrThrow();
  plotA = (
    await t.db
      .insertInto('plots')
      .values({
        trial_id: trialId,
        site_id: siteA!,
        entry_id: entry.id,
        block: 1,
        position: 1,
        plot_number: 1,
      })
      .returning('id')
      .executeTakeFirstOrThrow()
  ).id;
  await t.db
    .insertInto('trial_members')
    .values([
      { trial_id: trialId, user_id: leadUser.id, role: 'lead' },
      { trial_id: trialId, user_id: growerUser.id, role: 'grower' },
    ])
    .execute();
  await t.db
    .insertInto('trial_member_sites')
    .values({ trial_id: trialId, user_id: growerUser.id, site_id: siteB! })
    .execute();
}, 60_000);
afterAll(async () => {
  await t.close();
});

const put = (siteId: string, date: string, body: object, cookie = lead) =>
  request(t.app)
    .put(`/api/trials/${SLUG}/weather/${siteId}/${date}`)
    .set('Cookie', cookie)
    .send(body);
const importCsv = (body: object, cookie = lead) =>
  request(t.app).post(`/api/trials/${SLUG}/weather/import`).set('Cookie', cookie).send(body);
const countRows = async (siteId: string) =>
  Number(
    (
      await t.db
        .selectFrom('daily_weather')
        .select((eb) => eb.fn.countAll<number>().as('n'))
        .where('site_id', '=', siteId)
        .executeTakeFirstOrThrow()
    ).n,
  );

describe('weather typed in by hand', () => {
  it('stores a day, replaces it on a second save, and lists it', async () => {
    expect((await put(siteB!, '2026-05-20', { tminC: 9, tmaxC: 21, rainMm: 0 })).status).toBe(200);
    const again = await put(siteB!, '2026-05-20', { tminC: 10.5, tmaxC: 22, rainMm: 1.2 });
    expect(again.status).toBe(200);
    const list = await request(t.app)
      .get(`/api/trials/${SLUG}/weather?siteId=${siteB}`)
      .set('Cookie', lead);
    expect(list.body.days).toEqual([
      { siteId: siteB, date: '2026-05-20', tminC: 10.5, tmaxC: 22, rainMm: 1.2, source: 'manual' },
    ]);
  });

  it('refuses a low above the high, an impossible date, another trial’s site, and other growers', async () => {
    const swapped = await put(siteB!, '2026-05-21', { tminC: 25, tmaxC: 12 });
    expect(swapped.status).toBe(400);
    expect(swapped.body.error.details.fields).toEqual([
      { path: 'body.tminC', message: 'The low is above the high: swap them?' },
    ]);
    const badDate = await put(siteB!, '2026-02-30', { tmaxC: 12 });
    expect(badDate.status).toBe(400);
    expect(badDate.body.error.details.fields[0].path).toBe('params.date');
    const foreign = await put('00000000-0000-4000-8000-000000000000', '2026-05-21', { tmaxC: 12 });
    expect(foreign.status).toBe(404);
    // The grower is limited to Upper Terrace (site B).
    expect((await put(siteA!, '2026-05-21', { tmaxC: 12 }, grower)).status).toBe(403);
    expect((await put(siteB!, '2026-05-21', { tmaxC: 12 }, grower)).status).toBe(200);
  });
});

describe('weather CSV import: preview, per-row errors, all or nothing', () => {
  const messy = [
    'Date,Low,High,Rain',
    '2026-06-01,8,20,0',
    '2026-06-02,25,15,0', // low above high
    '2026-06-31,10,20,0', // no such date
    '2026-06-04,ten,20,0', // not a number
    '2026-06-01,9,21,2', // duplicate of line 2
    '2026-06-06,10,20,-3', // negative rain
  ].join('\n');

  it('the preview lists each problem with its line and column, and writes nothing', async () => {
    const before = await countRows(siteA!);
    const r = await importCsv({ siteId: siteA, csv: messy, dryRun: true });
    expect(r.status).toBe(200);
    expect(r.body.columns).toEqual({ date: 'Date', tmin: 'Low', tmax: 'High', rain: 'Rain' });
    expect(r.body.errors).toEqual([
      { row: 3, column: 'Low', message: 'The low (25) is above the high (15).' },
      { row: 4, column: 'Date', message: '"2026-06-31" is not a date like 2026-06-01.' },
      { row: 5, column: 'Low', message: '"ten" is not a number.' },
      { row: 6, column: 'Date', message: '2026-06-01 already appears on line 2.' },
      { row: 7, column: 'Rain', message: "-3 is not a day's rain (0 to 1000 mm)." },
    ]);
    expect(r.body.rows).toHaveLength(1);
    expect(r.body.written).toBe(0);
    expect(await countRows(siteA!)).toBe(before);
  });

  it('committing a file with errors is a 400 naming the lines; nothing is written', async () => {
    const before = await countRows(siteA!);
    const r = await importCsv({ siteId: siteA, csv: messy, dryRun: false });
    expect(r.status).toBe(400);
    expect(r.body.error.message).toMatch(/^5 line\(s\) of the file have problems \(first: line 3/);
    expect(r.body.error.message).toMatch(/nothing was written\.$/);
    expect(r.body.error.details.rows).toHaveLength(5);
    expect(await countRows(siteA!)).toBe(before);
  });

  it('converts °F and inches exactly (NIST: °C = (°F − 32) × 5/9, 1 in = 25.4 mm)', async () => {
    const r = await importCsv({
      siteId: siteB,
      csv: 'date,tmin,tmax,rain\n2026-04-01,50,86,1\n2026-04-02,32,68.9,0.25\n',
      temperatureUnit: 'F',
      rainUnit: 'in',
      dryRun: false,
    });
    expect(r.status).toBe(201);
    expect(r.body.written).toBe(2);
    const rows = await t.db
      .selectFrom('daily_weather')
      .select(['observed_on', 'tmin_c', 'tmax_c', 'rain_mm', 'source'])
      .where('site_id', '=', siteB!)
      .where('observed_on', '<', '2026-05-01')
      .orderBy('observed_on')
      .execute();
    expect(rows[0]).toEqual({
      observed_on: '2026-04-01',
      tmin_c: 10,
      tmax_c: 30,
      rain_mm: 25.4,
      source: 'import',
    });
    expect(rows[1]!.tmin_c).toBe(0);
    expect(rows[1]!.tmax_c).toBeCloseTo(20.5, 12);
    expect(rows[1]!.rain_mm).toBeCloseTo(6.35, 12);
  });

  it('a file without a date column is refused at line 1', async () => {
    const r = await importCsv({ siteId: siteA, csv: 'when,tmin\nx,1\n', dryRun: true });
    expect(r.body.errors[0]).toEqual({
      row: 1,
      column: null,
      message: 'No date column: name one "date" (values like 2026-06-01).',
    });
  });
});

describe('season summary', () => {
  it('degree days by the horizontal-cutoff daily average, hot days and water against harvests', async () => {
    // Four days at Hollow Field (site A); okra thresholds 10 °C base, 30 °C cutoff.
    // Hand computation of the horizontal-cutoff daily-average method (from memory of the
    // method as extension degree-day guides describe it: raise Tmin to the base, cap Tmax at
    // the cutoff, GDD = mean − base, never below 0):
    //   06-01 (8, 20):  Tmin′ 10, Tmax′ 20 → 15 − 10 = 5
    //   06-02 (15, 34): Tmin′ 15, Tmax′ 30 → 22.5 − 10 = 12.5
    //   06-03 (22, 33): Tmin′ 22, Tmax′ 30 → 26 − 10 = 16
    //   06-04 (2, 9):   both raised to 10 → 0
    // Total 33.5; highs of 32 °C or more on 06-02 and 06-03 → 2 hot days.
    const csv =
      'date,tmin,tmax,rain\n2026-06-01,8,20,0\n2026-06-02,15,34,4\n2026-06-03,22,33,0\n2026-06-04,2,9,11.5\n';
    expect((await importCsv({ siteId: siteA, csv, dryRun: false })).status).toBe(201);
    // An irrigation of 12 mm on 06-03 and a harvest on 06-03 and on 06-04.
    await t.db
      .insertInto('field_events')
      .values({
        trial_id: trialId,
        site_id: siteA!,
        kind: 'irrigation',
        occurred_on: '2026-06-03',
        irrigation_method: 'drip',
        run_time_min: 120,
        water_depth_mm: 12,
      })
      .execute();
    // A rainfall event too: ignored while the station has rain, so no shower counts twice.
    await t.db
      .insertInto('field_events')
      .values({
        trial_id: trialId,
        site_id: siteA!,
        kind: 'rainfall',
        occurred_on: '2026-06-02',
        rain_mm: 4,
      })
      .execute();
    await t.db
      .insertInto('harvests')
      .values([
        {
          trial_id: trialId,
          plot_id: plotA,
          harvested_on: '2026-06-03',
          fruit_count: 5,
          mass_g: 70,
          grade: 'marketable',
        },
        {
          trial_id: trialId,
          plot_id: plotA,
          harvested_on: '2026-06-04',
          fruit_count: 2,
          mass_g: 30,
          grade: 'cull',
        },
      ])
      .execute();

    const r = await request(t.app).get(`/api/trials/${SLUG}/season`).set('Cookie', lead);
    expect(r.status).toBe(200);
    expect(r.body.thresholds).toEqual({
      baseC: 10,
      upperC: 30,
      source: 'common practice (no source): 10 °C (50 °F) base, 30 °C (86 °F) cutoff',
    });
    expect(r.body.method).toMatch(/horizontal cutoff/);
    expect(r.body.startsFrom).toBe('2026-06-01');
    expect(r.body.cautions.some((c: string) => c.includes('backflow'))).toBe(true);
    const a = r.body.sites.find((s: { siteName: string }) => s.siteName === 'Hollow Field');
    expect(a.degreeDays).toBeCloseTo(33.5, 12);
    expect(a.hotDays).toBe(2);
    expect(a.rainSource).toBe('weather');
    expect(a.water).toEqual({ rainMm: 15.5, irrigationMm: 12, totalMm: 27.5 });
    expect(a.harvests).toEqual([
      {
        date: '2026-06-03',
        daysFromStart: 2,
        plotsHarvested: 1,
        marketableMassG: 70,
        cumulativeMm: 16,
        sinceLastHarvestMm: 16,
        degreeDays: 33.5,
      },
      {
        date: '2026-06-04',
        daysFromStart: 3,
        plotsHarvested: 1,
        marketableMassG: 0,
        cumulativeMm: 27.5,
        sinceLastHarvestMm: 11.5,
        degreeDays: 33.5,
      },
    ]);
    // 2026-06-01 is a Monday: one week holds all four days.
    expect(a.weeks).toHaveLength(1);
    expect(a.weeks[0]).toMatchObject({
      weekStart: '2026-06-01',
      degreeDays: 33.5,
      hotDays: 2,
      totalMm: 27.5,
    });
  });

  it('without station rain, rain comes from rainfall field events; reader thresholds are labelled', async () => {
    await t.db
      .insertInto('field_events')
      .values({
        trial_id: trialId,
        site_id: siteB!,
        kind: 'rainfall',
        occurred_on: '2026-06-05',
        rain_mm: 7.5,
      })
      .execute();
    await t.db
      .updateTable('daily_weather')
      .set({ rain_mm: null })
      .where('site_id', '=', siteB!)
      .where('tmax_c', 'is not', null)
      .execute();
    const r = await request(t.app)
      .get(`/api/trials/${SLUG}/season?baseC=8&upperC=29`)
      .set('Cookie', lead);
    expect(r.status).toBe(200);
    expect(r.body.thresholds).toEqual({
      baseC: 8,
      upperC: 29,
      source: 'set for this view by the reader',
    });
    const b = r.body.sites.find((s: { siteName: string }) => s.siteName === 'Upper Terrace');
    expect(b.rainSource).toBe('field events');
    expect(b.water.rainMm).toBe(7.5);
    const bad = await request(t.app)
      .get(`/api/trials/${SLUG}/season?baseC=20&upperC=15`)
      .set('Cookie', lead);
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fields[0].path).toBe('query.upperC');
  });
});
