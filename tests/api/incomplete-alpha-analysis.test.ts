// A single-site resolvable incomplete-block trial, laid out through the API by our own
// generator (12 entries, 4 replicates of 3 blocks of 4, seed 2718), with the invented pod
// yields of fixtures/analysis/mixed-incomplete-alpha.csv (two plots lost) recorded on its plots.
// The analysis the API gives it by default, the mixed model y ~ variety + (1|replicate) +
// (1|replicate:block), is checked against R 4.2.2 with lme4 1.1-31, lmerTest 3.1-3
// (Satterthwaite) and emmeans 1.8.4-1, refined REML optimum: the exact call and versions are in
// fixtures/analysis/mixed-incomplete-alpha.json, the script in fixtures/analysis/r/incomplete-alpha.R.
// Agreement: BLUEs and SEs to 6 significant digits, variance components to 5, Satterthwaite df
// to 4, p to 1e-6 absolute.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Design } from '../../common/contracts/design';
import { traitPresets } from '../../common/trait-presets';
import { analyzePlotRows } from '../../server/analysis/engine/analyze';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
} from '../support/test-app';

interface Ref {
  call: string;
  r: string;
  formula: string;
  varianceComponents: { source: string; variance: number }[];
  logLik: number;
  boundary: boolean;
  adjustedMeans: { variety: string; mean: number; se: number; df: number }[];
  fixedTest: { numDf: number; denDf: number; f: number; p: number; method: string };
  pairs: { a: string; b: string; difference: number; se: number; df: number; p: number }[];
}

const fixtureDir = 'fixtures/analysis';
const ref = JSON.parse(
  readFileSync(path.join(fixtureDir, 'mixed-incomplete-alpha.json'), 'utf8'),
) as Ref;
const plots = readFileSync(path.join(fixtureDir, 'mixed-incomplete-alpha.csv'), 'utf8')
  .trim()
  .split('\n')
  .slice(1)
  .map((line) => {
    const [plot, replicate, block, code, variety, value] = line.split(',');
    return {
      plot: Number(plot),
      replicate: Number(replicate),
      block: Number(block),
      code: code!,
      variety: variety!,
      value: Number(value),
    };
  });
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

let t: TestApp;
let cookie: string;
let leadId: string;
beforeAll(async () => {
  t = await createTestApp();
  const lead = await createUser(t.db, { name: 'Morwen Tregar', email: 'morwen@tregar.example' });
  leadId = lead.id;
  cookie = await mintSessionCookie(t, lead);
}, 120_000);
afterAll(async () => {
  await t.close();
});

const send = (method: 'get' | 'post', url: string, body?: object) =>
  request(t.app)[method](url).set('Origin', TEST_ORIGIN).set('Cookie', cookie).send(body);

describe('a single-site incomplete-block trial analysed through the API', () => {
  let slug: string;

  it('is laid out by our generator as the fixture says, and its yields are recorded', async () => {
    const created = await send('post', '/api/trials', {
      title: 'Runner bean alpha trial',
      crop: 'Runner bean',
      season: '2027',
      design: 'incomplete',
    });
    expect(created.status).toBe(201);
    slug = created.body.slug as string;
    const entries = [...new Map(plots.map((p) => [p.code, p.variety]))].sort(([a], [b]) =>
      a < b ? -1 : 1,
    );
    expect(entries).toHaveLength(12);
    for (const [code, name] of entries) {
      const res = await send('post', `/api/trials/${slug}/entries`, {
        code,
        name,
        entryType: 'heirloom',
        inRowSpacingMm: 150,
      });
      expect(res.status).toBe(201);
    }
    expect(
      (await send('post', `/api/trials/${slug}/sites`, { name: 'Tregar home field' })).status,
    ).toBe(201);
    const laid = await send('post', `/api/trials/${slug}/layout`, {
      replicates: 4,
      blockSize: 4,
      seed: 2718,
      rowLengthMm: 3000,
      rowSpacingMm: 600,
    });
    expect(laid.status).toBe(201);
    const trait = traitPresets.find((p) => p.key === 'marketable_yield')!;
    expect((await send('post', `/api/trials/${slug}/traits`, trait)).status).toBe(201);

    const d = (await send('get', `/api/trials/${slug}/design`)).body as Design;
    expect(d.plots).toHaveLength(48);
    const codeOf = new Map(d.entries.map((e) => [e.id, e.code]));
    const byNumber = new Map(d.plots.map((p) => [p.plotNumber, p]));
    // The recorded plots are where the stored plan put them.
    for (const p of plots) {
      const stored = byNumber.get(p.plot)!;
      expect(codeOf.get(stored.entryId)).toBe(p.code);
      expect(stored).toMatchObject({ block: p.block, replicate: p.replicate });
    }
    const traitId = d.traits.find((tr) => tr.key === 'marketable_yield')!.id;
    const trial = await t.db
      .selectFrom('trials')
      .select('id')
      .where('slug', '=', slug)
      .executeTakeFirstOrThrow();
    await t.db
      .insertInto('observations')
      .values(
        plots.map((p) => ({
          trial_id: trial.id,
          plot_id: byNumber.get(p.plot)!.id,
          trait_id: traitId,
          observed_on: '2027-08-20',
          value: p.value,
          value_date: null,
          plant_number: null,
          created_by: leadId,
          updated_by: leadId,
        })),
      )
      .execute();
  });

  it('gets the mixed model by default, equal to lme4 / lmerTest / emmeans', async () => {
    const res = await send('get', `/api/trials/${slug}/analysis?trait=marketable_yield`);
    expect(res.status).toBe(200);
    const r = res.body;
    expect(r.model).toBe('mixed');
    expect(r.n).toBe(46);
    expect(ref.formula).toBe('value ~ variety + (1 | replicate) + (1 | replicate:block)');
    expect(r.varianceComponents.map((v: { source: string }) => v.source).sort()).toEqual(
      ref.varianceComponents.map((c) => c.source).sort(),
    );
    for (const c of ref.varianceComponents) {
      const mine = r.varianceComponents.find((v: { source: string }) => v.source === c.source);
      expect(rel(mine.variance, c.variance)).toBeLessThan(1e-5);
    }
    expect(r.boundary).toBe(ref.boundary);
    expect(rel(r.logLik, ref.logLik)).toBeLessThan(1e-8);
    expect(r.fixedTest.method).toBe(ref.fixedTest.method);
    expect(r.fixedTest.numDf).toBe(ref.fixedTest.numDf);
    expect(rel(r.fixedTest.denDf, ref.fixedTest.denDf)).toBeLessThan(1e-4);
    expect(rel(r.fixedTest.f, ref.fixedTest.f)).toBeLessThan(1e-6);
    expect(Math.abs(r.fixedTest.p - ref.fixedTest.p)).toBeLessThan(1e-6);
    for (const m of ref.adjustedMeans) {
      const mine = r.adjustedMeans.find((a: { variety: string }) => a.variety === m.variety);
      expect(rel(mine.mean, m.mean)).toBeLessThan(1e-6);
      expect(rel(mine.se, m.se)).toBeLessThan(1e-6);
    }
    // Ranks follow the BLUEs (marketable yield: higher is better).
    const order = [...ref.adjustedMeans].sort((a, b) => b.mean - a.mean).map((m) => m.variety);
    expect(r.adjustedMeans.map((a: { variety: string }) => a.variety)).toEqual(order);
    expect(r.means.find((m: { rank: number }) => m.rank === 1).variety).toBe(order[0]);
  });

  it('pairwise differences (the engine on the rows the API builds): SE to 6 digits, p on each pair own Satterthwaite df', () => {
    // The service reads an incomplete-block trial as replicates (site column "Replicate N")
    // with blocks random within them; the API's answer leaves the pairs out, so they are
    // checked on the same rows and options here.
    const res = analyzePlotRows(
      plots.map((p) => ({
        variety: p.variety,
        site: `Replicate ${p.replicate}`,
        block: String(p.block),
        plot: String(p.plot),
        value: p.value,
      })),
      { design: 'rcbd', sitesAre: 'replicate', model: 'mixed', includePairs: true },
    );
    expect(res.model).toBe('mixed');
    expect(res.pairs).toHaveLength(ref.pairs.length);
    for (const pr of ref.pairs) {
      const got = res.pairs!.find(
        (x) => (x.a === pr.a && x.b === pr.b) || (x.a === pr.b && x.b === pr.a),
      )!;
      const sign = got.a === pr.a ? 1 : -1;
      expect(rel(sign * got.difference, pr.difference)).toBeLessThan(1e-6);
      expect(rel(got.se, pr.se)).toBeLessThan(1e-6);
      expect(Math.abs(got.p! - pr.p)).toBeLessThan(1e-6);
    }
  });
});
