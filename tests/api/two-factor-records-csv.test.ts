/**
 * Harvest and observation files of the demo fertilizer × variety split plot: each record carries
 * its plot's level of the treatment under the treatment's name, and the file goes back in through
 * the import (which leaves that column alone). The level a plot should carry is the one the
 * trial's stored layout gave it (the plots table), not anything the export works out.
 */
import crypto from 'node:crypto';
import { parse } from 'csv-parse/sync';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeCsv } from '../../common/csv';
import { demoAccounts } from '../../db/seed/demo-season';
import { SPLIT_PLOT_SLUG, seedSplitPlotTrial } from '../../db/seed/demo-split-plot';
import { seedDemo } from '../../db/seed/seed';
import { createTestApp, mintSessionCookie, TEST_ORIGIN, type TestApp } from '../support/test-app';

let t: TestApp;
let lead: string;
let trialId: string;
/** `site#plot number` -> the level the stored layout gives that plot */
let levelOf: Map<string, string | null>;
let plotIdOf: Map<string, string>;

const get = (url: string) => request(t.app).get(url).set('Cookie', lead);
const post = (url: string, body: object) =>
  request(t.app).post(url).set('Origin', TEST_ORIGIN).set('Cookie', lead).send(body);
const rowsOf = (text: string) => parse(text) as string[][];

beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.db);
  await seedSplitPlotTrial(t.db);
  lead = await mintSessionCookie(
    t,
    demoAccounts.find((a) => a.key === 'lead')!,
  );
  const plots = await t.db
    .selectFrom('plots as p')
    .innerJoin('trials as tr', 'tr.id', 'p.trial_id')
    .innerJoin('sites as s', 's.id', 'p.site_id')
    .select(['p.id', 'p.trial_id', 'p.plot_number', 'p.treatment', 's.name'])
    .where('tr.slug', '=', SPLIT_PLOT_SLUG)
    .execute();
  trialId = plots[0]!.trial_id;
  levelOf = new Map(plots.map((p) => [`${p.name}#${p.plot_number}`, p.treatment]));
  plotIdOf = new Map(plots.map((p) => [`${p.name}#${p.plot_number}`, p.id]));
  // Two harvests, so the harvest file has rows at plots of both levels.
  const [noneAt, prePlantAt] = ['none', 'pre-plant'].map(
    (level) => [...levelOf].find(([, l]) => l === level)![0],
  );
  for (const [at, massG] of [
    [noneAt!, 412.5],
    [prePlantAt!, 388],
  ] as const) {
    const r = await post(`/api/trials/${SPLIT_PLOT_SLUG}/harvests`, {
      id: crypto.randomUUID(),
      plotId: plotIdOf.get(at),
      harvestedOn: '2026-08-01',
      fruitCount: 30,
      massG,
      grade: 'marketable',
      note: '',
    });
    expect(r.status).toBe(201);
  }
}, 90_000);
afterAll(async () => {
  await t.close();
});

describe('a two-factor trial’s record files', () => {
  it('carry each record’s plot level under the treatment’s name, after the entry code', async () => {
    const harvests = rowsOf(
      (await get(`/api/trials/${SPLIT_PLOT_SLUG}/records/export/harvests`)).text,
    );
    expect(harvests[0]).toEqual([
      'record_id',
      'site',
      'plot_number',
      'entry_code',
      'Fertilizer',
      'harvested_on',
      'fruit_count',
      'mass_g',
      'grade',
      'note',
    ]);
    expect(
      harvests
        .slice(1)
        .map((r) => r[4])
        .sort(),
    ).toEqual(['none', 'pre-plant']);
    for (const r of harvests.slice(1)) expect(r[4]).toBe(levelOf.get(`${r[1]}#${r[2]}`));

    const observations = rowsOf(
      (await get(`/api/trials/${SPLIT_PLOT_SLUG}/records/export/observations`)).text,
    );
    expect(observations[0]!.slice(0, 6)).toEqual([
      'record_id',
      'site',
      'plot_number',
      'entry_code',
      'Fertilizer',
      'trait_key',
    ]);
    // One reading per plot: 2 levels × 4 varieties × 4 blocks.
    expect(observations).toHaveLength(1 + 32);
    for (const r of observations.slice(1)) expect(r[4]).toBe(levelOf.get(`${r[1]}#${r[2]}`));
    expect(observations.filter((r) => r[4] === 'none')).toHaveLength(16);
  });

  it('go back in through the import: already recorded with their ids, new records without', async () => {
    for (const kind of ['harvests', 'observations'] as const) {
      const exported = (await get(`/api/trials/${SPLIT_PLOT_SLUG}/records/export/${kind}`)).text;
      const n = rowsOf(exported).length - 1;
      const preview = await post(`/api/trials/${SPLIT_PLOT_SLUG}/records/import/preview`, {
        kind,
        csv: exported,
      });
      expect(preview.status).toBe(200);
      expect(preview.body.errors).toEqual([]);
      expect(preview.body.columns).toContain('fertilizer');
      expect(preview.body.alreadyRecordedCount).toBe(n);
      const again = await post(`/api/trials/${SPLIT_PLOT_SLUG}/records/import`, {
        kind,
        csv: exported,
      });
      expect(again.status).toBe(201);
      expect(again.body).toEqual({ created: 0, alreadyRecorded: n });

      // Without the ids, every row is a new record at the same plot with the same values;
      // the treatment cell is not read (a wrong level changes nothing: the plot number decides).
      const rows = rowsOf(exported);
      const fresh = [
        rows[0]!,
        ...rows
          .slice(1)
          .map((r, i) => ['', ...r.slice(1, 4), i === 0 ? 'nonsense' : r[4]!, ...r.slice(5)]),
      ];
      const csv = writeCsv(fresh[0]!, fresh.slice(1));
      const created = await post(`/api/trials/${SPLIT_PLOT_SLUG}/records/import`, { kind, csv });
      expect(created.status).toBe(201);
      expect(created.body).toEqual({ created: n, alreadyRecorded: 0 });
      const back = rowsOf(
        (await get(`/api/trials/${SPLIT_PLOT_SLUG}/records/export/${kind}`)).text,
      );
      const withoutIds = (rs: string[][]) => rs.map((r) => r.slice(1).join('|')).sort();
      expect(withoutIds(back.slice(1))).toEqual(withoutIds([...rows.slice(1), ...rows.slice(1)]));
    }
    const stored = await t.db
      .selectFrom('observations')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('trial_id', '=', trialId)
      .executeTakeFirstOrThrow();
    expect(Number(stored.n)).toBe(64);
  });

  it('still refuses a column it does not know', async () => {
    const res = await post(`/api/trials/${SPLIT_PLOT_SLUG}/records/import/preview`, {
      kind: 'observations',
      csv: 'site,plot_number,Irrigation,trait_key,observed_on,value\nWendle,1,wet,days_to_first_pods,2026-07-10,52',
    });
    expect(res.status).toBe(200);
    expect(res.body.errors).toEqual([
      { row: 1, column: 'irrigation', message: 'Unknown column "irrigation".' },
    ]);
  });
});
