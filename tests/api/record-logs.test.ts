/**
 * The harvest and observation logs are read a page at a time, newest first, with site, date,
 * grade, trait and text filters and totals over every page. A season of 2,000 harvests answers
 * its first page with one page of rows only. Bad filters are refused with the field named;
 * strangers do not learn the trial exists. Real app and PostgreSQL.
 *
 * Expected values are worked out here from the rows this file inserts, with plain array
 * filtering and sorting (no call into the app's code).
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, createUser, mintSessionCookie, type TestApp } from '../support/test-app';
import type { Caller } from './matrix/matrix-types';
import { buildMatrixWorld, type MatrixWorld } from './matrix/matrix-world';

let t: TestApp;
let w: MatrixWorld;
let strangerCookie: string;

interface Seeded {
  plot: 'A' | 'B';
  date: string;
  mass: number;
  grade: 'marketable' | 'cull';
  note: string;
}
const HARVESTS = 2000;
const day = (i: number) => new Date(Date.UTC(2026, 4, 1) + (i % 120) * 86_400_000);
const seeded: Seeded[] = Array.from({ length: HARVESTS }, (_, i) => ({
  plot: i % 3 === 0 ? 'B' : 'A',
  date: day(i).toISOString().slice(0, 10),
  // whole grams, so the totals are exact
  mass: 100 + (i % 7),
  grade: i % 4 === 0 ? 'cull' : 'marketable',
  note: i % 250 === 0 ? `split skin ${i}` : '',
}));
const sumMass = (rows: Seeded[]) => rows.reduce((a, r) => a + r.mass, 0);

beforeAll(async () => {
  t = await createTestApp();
  w = await buildMatrixWorld(t);
  const stranger = await createUser(t.db, { name: 'Sol Stranger' });
  strangerCookie = await mintSessionCookie(t, stranger);
  const plotOf = { A: w.plotA, B: w.plotB };
  for (let i = 0; i < seeded.length; i += 500)
    await t.db
      .insertInto('harvests')
      .values(
        seeded.slice(i, i + 500).map((h, j) => ({
          trial_id: w.trial.id,
          plot_id: plotOf[h.plot],
          harvested_on: h.date,
          fruit_count: 1 + ((i + j) % 9),
          mass_g: h.mass,
          grade: h.grade,
          note: h.note,
          created_by: w.users.lead.id,
          updated_by: w.users.lead.id,
        })),
      )
      .execute();
  // 30 plant heights at site A on ten days, 12 at site B
  await t.db
    .insertInto('observations')
    .values(
      Array.from({ length: 42 }, (_, i) => ({
        trial_id: w.trial.id,
        plot_id: i < 30 ? w.plotA : w.plotB,
        trait_id: w.traitId,
        observed_on: day(i % 10)
          .toISOString()
          .slice(0, 10),
        value: 500 + i,
        plant_number: 1 + (i % 5),
        created_by: w.users.lead.id,
        updated_by: w.users.lead.id,
      })),
    )
    .execute();
}, 120_000);
afterAll(async () => {
  await t?.close();
});

const get = (url: string, caller: Caller | 'stranger' = 'viewer') => {
  const r = request(t.app).get(url);
  const cookie = caller === 'stranger' ? strangerCookie : w.cookies[caller];
  return cookie ? r.set('Cookie', cookie) : r;
};
const log = (path: 'harvests' | 'observations', query = '') =>
  `/api/trials/${w.trial.slug}/${path}${query ? `?${query}` : ''}`;

describe('the harvest log, a page at a time', () => {
  it("answers a 2,000-harvest season's first page with one page of rows and the season's totals", async () => {
    const res = await get(log('harvests'));
    expect(res.status).toBe(200);
    expect(res.body.harvests).toHaveLength(50);
    expect(res.body).toMatchObject({ page: 1, limit: 50, total: HARVESTS });
    expect(res.body.totalMassG).toBe(sumMass(seeded));
    // Newest first: the page holds the latest days of the season.
    const dates: string[] = res.body.harvests.map((h: { harvestedOn: string }) => h.harvestedOn);
    const newest = seeded.map((h) => h.date).sort((a, b) => b.localeCompare(a));
    expect(dates).toEqual(newest.slice(0, 50));
    // One page of rows is a few tens of kB, not the whole season.
    expect(JSON.stringify(res.body).length).toBeLessThan(40_000);
  });

  it('walks every page once: no row twice, none left out, the last page short', async () => {
    const seen = new Set<string>();
    const limit = 200;
    for (let page = 1; page <= HARVESTS / limit; page++) {
      const res = await get(log('harvests', `page=${page}&limit=${limit}`));
      expect(res.status).toBe(200);
      expect(res.body.harvests).toHaveLength(limit);
      for (const h of res.body.harvests) seen.add(h.id);
    }
    expect(seen.size).toBe(HARVESTS);
    const tail = await get(log('harvests', 'page=14&limit=150'));
    expect(tail.body.harvests).toHaveLength(HARVESTS - 13 * 150);
    const beyond = await get(log('harvests', 'page=99&limit=50'));
    expect(beyond.status).toBe(200);
    expect(beyond.body).toMatchObject({ harvests: [], total: HARVESTS, page: 99 });
  });

  it('filters by site, date range, grade and text, and the totals follow the filters', async () => {
    const from = '2026-06-01';
    const to = '2026-06-10';
    const want = seeded.filter(
      (h) => h.plot === 'B' && h.date >= from && h.date <= to && h.grade === 'cull',
    );
    expect(want.length).toBeGreaterThan(0);
    const res = await get(
      log('harvests', `siteId=${w.siteB}&from=${from}&to=${to}&grade=cull&limit=200`),
    );
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(want.length);
    expect(res.body.totalMassG).toBe(sumMass(want));
    expect(res.body.harvests).toHaveLength(want.length);
    for (const h of res.body.harvests) {
      expect(h.siteId).toBe(w.siteB);
      expect(h.grade).toBe('cull');
      expect(h.harvestedOn >= from && h.harvestedOn <= to).toBe(true);
    }
    // Text search reads the note (and entry, site, plot); % is a character, not a wildcard.
    const split = await get(log('harvests', 'q=SPLIT%20skin'));
    expect(split.body.total).toBe(seeded.filter((h) => h.note.startsWith('split skin')).length);
    const entry = await get(log('harvests', 'q=matrix%20red&limit=1'));
    expect(entry.body.total).toBe(seeded.filter((h) => h.plot === 'B').length);
    const percent = await get(log('harvests', 'q=%25'));
    expect(percent.body.total).toBe(0);
  });

  it('sorts every page by date, plot or entry, either way, before it pages', async () => {
    type Row = { harvestedOn: string; siteName: string; entryName: string; plotNumber: number };
    const pageOf = async (query: string) => {
      const res = await get(log('harvests', `${query}&limit=200`));
      expect(res.status, query).toBe(200);
      expect(res.body.total).toBe(HARVESTS);
      return res.body.harvests as Row[];
    };
    // Oldest first: the first 200 of the season's dates sorted up.
    const oldest = await pageOf('sort=date&order=asc');
    const dates = seeded.map((h) => h.date).sort();
    expect(oldest.map((h) => h.harvestedOn)).toEqual(dates.slice(0, 200));
    // Both plots are numbered 101 (one at each site): by plot, then site, then newest first.
    const site = { A: 'Site A', B: 'Site B' } as const;
    const byPlot = (desc: boolean) =>
      [...seeded]
        .sort(
          (a, b) =>
            (desc ? -1 : 1) * site[a.plot].localeCompare(site[b.plot]) ||
            b.date.localeCompare(a.date),
        )
        .map((h) => `${site[h.plot]} ${h.date}`);
    const plotKey = (h: Row) => `${h.siteName} ${h.harvestedOn}`;
    expect((await pageOf('sort=plot')).map(plotKey)).toEqual(byPlot(false).slice(0, 200));
    expect((await pageOf('sort=plot&order=desc')).map(plotKey)).toEqual(byPlot(true).slice(0, 200));
    // By entry: Matrix Green grows on plot A, Matrix Red on plot B; descending starts at Red.
    const reds = seeded.filter((h) => h.plot === 'B').length;
    const lastPage = Math.ceil(HARVESTS / 200);
    const red = await pageOf('sort=entry&order=desc');
    expect(new Set(red.map((h) => h.entryName))).toEqual(new Set(['Matrix Red']));
    const green = await get(log('harvests', `sort=entry&limit=200&page=${lastPage}`));
    // Ascending, the last page holds the last of the Red harvests, oldest last.
    const tail: Row[] = green.body.harvests;
    expect(tail.every((h) => h.entryName === 'Matrix Red')).toBe(true);
    expect(tail).toHaveLength(HARVESTS - (lastPage - 1) * 200);
    expect(tail.at(-1)!.harvestedOn).toBe(
      seeded
        .filter((h) => h.plot === 'B')
        .map((h) => h.date)
        .sort()[0],
    );
    expect(reds).toBeGreaterThan(200);
  });

  it('refuses bad filters with 400 naming the field', async () => {
    const cases: [string, string][] = [
      ['from=2026-02-30', 'query.from'],
      ['to=yesterday', 'query.to'],
      ['from=2026-07-01&to=2026-06-01', 'query.from'],
      ['siteId=site-a', 'query.siteId'],
      ['grade=seconds', 'query.grade'],
      ['page=0', 'query.page'],
      ['page=two', 'query.page'],
      ['limit=201', 'query.limit'],
      ['limit=0', 'query.limit'],
      ['sort=mass', 'query.sort'],
      ['sort=date&order=up', 'query.order'],
    ];
    for (const [query, path] of cases) {
      const res = await get(log('harvests', query));
      expect(res.status, query).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
      const fields: { path: string; message: string }[] = res.body.error.details.fields;
      expect(fields.map((f) => f.path)).toContain(path);
      expect(fields.find((f) => f.path === path)!.message.length).toBeGreaterThan(5);
    }
  });

  it('shows the log to members only; strangers and signed-out visitors get 404', async () => {
    for (const caller of ['viewer', 'contributor', 'growerOtherSite', 'lead'] as const)
      expect((await get(log('harvests', 'limit=1'), caller)).status).toBe(200);
    expect((await get(log('harvests'), 'stranger')).status).toBe(404);
    expect((await get(log('harvests'), 'anonymous')).status).toBe(404);
    expect((await get(log('observations'), 'stranger')).status).toBe(404);
  });
});

describe('the observation log, a page at a time', () => {
  it('pages newest first with a total, and filters by site, trait and dates', async () => {
    const first = await get(log('observations', 'limit=20'));
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({ page: 1, limit: 20, total: 42 });
    expect(first.body.observations).toHaveLength(20);
    const second = await get(log('observations', 'limit=20&page=3'));
    expect(second.body.observations).toHaveLength(2);
    const dates = first.body.observations.map((o: { observedOn: string }) => o.observedOn);
    expect([...dates].sort().reverse()).toEqual(dates);

    const siteA = await get(log('observations', `siteId=${w.siteA}&traitId=${w.traitId}`));
    expect(siteA.body.total).toBe(30);
    const fromDay = day(5).toISOString().slice(0, 10);
    const later = await get(log('observations', `from=${fromDay}`));
    // i % 10 >= 5 for half of the 42 observations' days 0..9: i in 5..9, 15..19, 25..29, 35..39
    expect(later.body.total).toBe(20);
    const bad = await get(log('observations', 'traitId=height'));
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fields[0].path).toBe('query.traitId');
  });
});
