// Per-trait ranks follow the trait's direction in every output: the analysis API, the ranking
// API, the published sheet, its PDF and means.csv. Demo season (db/seed/demo-season.ts): plant
// height is "lower is better", marketable yield "higher is better"; pod count is switched to
// "no preferred direction" here. The expected order is worked out by hand from the plot values
// the API reports (plain arithmetic means, sorted), and ranks are standard competition ranks
// ("1224": tied values share the best rank; from memory, the usual definition).
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import { seedDemo } from '../../db/seed/seed';
import { createTestApp, mintSessionCookie, TEST_ORIGIN, type TestApp } from '../support/test-app';

const SLUG = 'larkhaven-okra-2026';
let t: TestApp;
let lead: string;

const get = (url: string) => request(t.app).get(url).set('Cookie', lead);
const send = (method: 'post' | 'put' | 'patch', url: string, body: object) =>
  request(t.app)[method](url).set('Origin', TEST_ORIGIN).set('Cookie', lead).send(body);

type Means = { variety: string; mean: number; rank: number | null }[];
type PlotValues = { entry: string; value: number }[];

/** Entry means by hand from the plot values, best first in `direction`. */
function handOrder(values: PlotValues, direction: 'higher' | 'lower'): string[] {
  const sums = new Map<string, { s: number; n: number }>();
  for (const v of values) {
    const c = sums.get(v.entry) ?? { s: 0, n: 0 };
    c.s += v.value;
    c.n += 1;
    sums.set(v.entry, c);
  }
  const means = [...sums].map(([entry, c]) => ({ entry, mean: c.s / c.n }));
  means.sort((a, b) => (direction === 'higher' ? b.mean - a.mean : a.mean - b.mean));
  return means.map((m) => m.entry);
}

const asBytes = (r: request.Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  r.on('data', (c: Buffer) => chunks.push(c));
  r.on('end', () => cb(null, Buffer.concat(chunks)));
};

const expected: Record<string, string[]> = {};

beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.db);
  lead = await mintSessionCookie(
    t,
    demoAccounts.find((a) => a.key === 'lead')!,
  );
  const podCount = await t.db
    .selectFrom('traits as tr')
    .innerJoin('trials as t', 't.id', 'tr.trial_id')
    .select('tr.id')
    .where('t.slug', '=', SLUG)
    .where('tr.key', '=', 'pod_count')
    .executeTakeFirstOrThrow();
  const patched = await send('patch', `/api/trials/${SLUG}/traits/${podCount.id}`, {
    direction: 'none',
  });
  expect(patched.status).toBe(200);
  for (const [key, direction] of [
    ['plant_height', 'lower'],
    ['marketable_yield', 'higher'],
  ] as const) {
    const r = await get(`/api/trials/${SLUG}/analysis?trait=${key}`);
    expected[key] = handOrder(r.body.plotValues as PlotValues, direction);
  }
}, 60_000);
afterAll(async () => {
  await t.close();
});

describe('ranks follow the trait’s direction', () => {
  it('analysis API: lower is better ranks the shortest plants 1; higher is better the largest yield', async () => {
    for (const key of ['plant_height', 'marketable_yield']) {
      const r = await get(`/api/trials/${SLUG}/analysis?trait=${key}`);
      expect(r.status).toBe(200);
      const means = r.body.means as Means;
      expect(means.map((m) => m.variety)).toEqual(expected[key]);
      expect(means.map((m) => m.rank)).toEqual([1, 2, 3, 4, 5, 6]);
    }
    const height = (await get(`/api/trials/${SLUG}/analysis?trait=plant_height`)).body
      .means as Means;
    expect(height[0]!.mean).toBeLessThan(height[5]!.mean);
  });

  it('analysis API: a trait with no preferred direction has no ranks (highest mean listed first)', async () => {
    const r = await get(`/api/trials/${SLUG}/analysis?trait=pod_count`);
    expect(r.status).toBe(200);
    const means = r.body.means as Means;
    expect(means.every((m) => m.rank === null)).toBe(true);
    const sorted = [...means].sort((a, b) => b.mean - a.mean);
    expect(means.map((m) => m.variety)).toEqual(sorted.map((m) => m.variety));
  });

  it('ranking API: per-trait ranks in the contributions agree with the analysis', async () => {
    const r = await get(
      `/api/trials/${SLUG}/ranking?traits=marketable_yield,plant_height&weights=1,1`,
    );
    expect(r.status).toBe(200);
    for (const [i, key] of ['marketable_yield', 'plant_height'].entries()) {
      const first = r.body.entries.find(
        (e: { entry: string }) => e.entry === expected[key]![0],
      ) as { contributions: { rank: number }[] };
      expect(first.contributions[i]!.rank).toBe(1);
    }
  });

  describe('the published sheet, its PDF and means.csv', () => {
    beforeAll(async () => {
      const saved = await send('put', `/api/trials/${SLUG}/results-sheet`, {
        summary: '',
        methods: null,
        traits: [
          { key: 'marketable_yield', basis: 'plot', weight: 1 },
          { key: 'plant_height', basis: 'plot', weight: 1 },
          { key: 'pod_count', basis: 'plot', weight: 1 },
        ],
        entryNotes: {},
        coverPhotos: {},
        alpha: 0.05,
        letters: 'hsd',
        license: 'CC-BY-4.0',
      });
      expect(saved.status).toBe(200);
      const pub = await send('post', `/api/trials/${SLUG}/results-sheet/publish`, {
        changeNote: '',
      });
      expect(pub.status).toBe(201);
    });

    it('sheet JSON: best first with rank 1, and no ranks for the undirected trait', async () => {
      const s = (await request(t.app).get(`/api/results/${SLUG}`)).body;
      const trait = (key: string) => s.traits.find((x: { key: string }) => x.key === key);
      for (const key of ['plant_height', 'marketable_yield']) {
        expect((trait(key).means as Means).map((m) => m.variety)).toEqual(expected[key]);
        expect((trait(key).means as Means).map((m) => m.rank)).toEqual([1, 2, 3, 4, 5, 6]);
      }
      expect((trait('pod_count').means as Means).every((m) => m.rank === null)).toBe(true);
    });

    it('means.csv: rank 1 on the best entry per direction, empty rank with no direction', async () => {
      const csv = (await request(t.app).get(`/api/results/${SLUG}/v/1/means.csv`)).text;
      const lines = csv.trim().split('\n');
      const header = lines[0]!.split(',');
      const col = (name: string) => header.indexOf(name);
      const rows = lines.slice(1).map((l) => l.split(','));
      for (const key of ['plant_height', 'marketable_yield']) {
        const mine = rows.filter((r) => r[col('trait')] === key);
        expect(mine.map((r) => r[col('variety')])).toEqual(expected[key]);
        expect(mine.map((r) => r[col('rank')])).toEqual(['1', '2', '3', '4', '5', '6']);
        expect(mine[0]![col('direction')]).toBe(key === 'plant_height' ? 'lower' : 'higher');
      }
      const counts = rows.filter((r) => r[col('trait')] === 'pod_count');
      expect(counts).toHaveLength(6);
      expect(counts.every((r) => r[col('rank')] === '')).toBe(true);
    });

    it('PDF: each trait lists "1." against its best entry and says which way is better', async () => {
      const res = await request(t.app)
        .get(`/api/results/${SLUG}/v/1/sheet.pdf`)
        .buffer(true)
        .parse(asBytes);
      expect(res.status).toBe(200);
      const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-pdf-')), 's.pdf');
      fs.writeFileSync(file, res.body as Buffer);
      // Debian's poppler-utils reads the text back.
      const text = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
      const section = (label: string) => {
        const from = text.indexOf(label);
        expect(from).toBeGreaterThan(0);
        return text.slice(from, from + 1200);
      };
      const height = section('Plant height');
      expect(height).toMatch(/lower is better/);
      expect(height).toContain(`1. ${expected.plant_height![0]}`);
      expect(height).toContain(`6. ${expected.plant_height![5]}`);
      const yieldText = section('Marketable yield (');
      expect(yieldText).toMatch(/higher is better/);
      expect(yieldText).toContain(`1. ${expected.marketable_yield![0]}`);
      const counts = section('Marketable pod count');
      expect(counts).toMatch(/not ranked/);
      expect(counts.split('Means followed')[0]).not.toMatch(/^\s*1\. /m);
    });
  });
});

// Float noise: 1700.4 + 242.2 is 1942.6000000000001 in IEEE 754 doubles (any JavaScript
// engine); the exports show what was recorded (common/precision.ts, common practice, no source).
describe('no float noise in the exports', () => {
  let plotNumber: number;
  let siteName: string;
  beforeAll(async () => {
    const plot = await t.db
      .selectFrom('plots as p')
      .innerJoin('trials as t', 't.id', 'p.trial_id')
      .innerJoin('sites as s', 's.id', 'p.site_id')
      .select(['p.id', 'p.trial_id', 'p.plot_number', 's.name'])
      .where('t.slug', '=', SLUG)
      .orderBy('p.plot_number')
      .executeTakeFirstOrThrow();
    plotNumber = plot.plot_number;
    siteName = plot.name;
    await t.db.deleteFrom('harvests').where('plot_id', '=', plot.id).execute();
    for (const mass_g of [1700.4, 242.2])
      await t.db
        .insertInto('harvests')
        .values({
          trial_id: plot.trial_id,
          plot_id: plot.id,
          harvested_on: '2026-08-14',
          fruit_count: 60,
          mass_g,
          grade: 'marketable',
        })
        .execute();
    const pub = await send('post', `/api/trials/${SLUG}/results-sheet/publish`, {
      changeNote: 'One plot re-weighed.',
    });
    expect(pub.status).toBe(201);
  });

  it('plot totals export the season total as recorded: 1942.6', async () => {
    const csv = (await get(`/api/trials/${SLUG}/records/export/plot-totals`)).text;
    const [head, ...rows] = csv.trim().split('\n');
    const cols = head!.split(',');
    const row = rows
      .map((r) => r.split(','))
      .find(
        (r) =>
          r[cols.indexOf('site')] === siteName &&
          r[cols.indexOf('plot_number')] === String(plotNumber),
      )!;
    expect(row[cols.indexOf('mass_marketable_g')]).toBe('1942.6');
    expect(csv).not.toMatch(/\d\.\d*0000000\d/);
  });

  it('plots.csv and means.csv carry no float noise', async () => {
    const plots = (
      await request(t.app).get(`/api/results/${SLUG}/v/2/plots.csv?trait=marketable_yield`)
    ).text;
    expect(plots).toContain(',1942.6\n');
    expect(plots).not.toMatch(/\d\.\d*0000000\d/);
    const means = (await request(t.app).get(`/api/results/${SLUG}/v/2/means.csv`)).text;
    expect(means).not.toMatch(/\d\.\d{7,}/);
  });
});
