/**
 * Stability of a crop's register varieties across environments (trial × site), on the demo's two
 * okra seasons and its tomato trial.
 *
 * Each environment mean is checked against the trial's own analysis API (the arithmetic mean of
 * the entry's plot values at the site); the figures against the stability engine on those means
 * (the engine equals R's lm() to 9 significant digits, fixtures/analysis/r/stability.R). Sums
 * that follow from the definitions are checked too: the environment indices sum to zero, the
 * Finlay–Wilkinson slopes of a balanced subset average exactly 1 (Σ_i b_i = g, algebra of the
 * slope's definition) and the ecovalence shares sum to 1. Roles: group coordinator, trial lead
 * and grower (group members), outsider, signed out.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import { seedDemo, seedEarlierSeasons } from '../../db/seed/seed';
import { stabilityAnalysis } from '../../server/analysis/engine/stability';
import { createTestApp, createUser, mintSessionCookie, type TestApp } from '../support/test-app';

let t: TestApp;
const cookies: Record<string, string | null> = { signedOut: null };
let groupId = '';

beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.db);
  await seedEarlierSeasons(t.db);
  for (const a of demoAccounts) cookies[a.key] = await mintSessionCookie(t, a);
  cookies.outsider = await mintSessionCookie(t, await createUser(t.db, { name: 'Nell Outby' }));
  groupId = (await t.db.selectFrom('groups').select('id').executeTakeFirstOrThrow()).id;
}, 120_000);
afterAll(async () => {
  await t.close();
});

const get = (who: string, url: string) => {
  const r = request(t.app).get(url);
  return cookies[who] ? r.set('Cookie', cookies[who]!) : r;
};
const stability = (who: string, crop: string, trait?: string) =>
  get(
    who,
    `/api/varieties/stability?group=${groupId}&crop=${encodeURIComponent(crop)}${trait ? `&trait=${trait}` : ''}`,
  );

interface Env {
  trialSlug: string;
  site: string;
  used: boolean;
  reason: string | null;
  mean: number | null;
  index: number | null;
}
interface Row {
  slug: string;
  name: string;
  environmentCount: number;
  used: boolean;
  reason: string | null;
  figures: Record<string, number> | null;
}

/** The entry's arithmetic mean at each site, from the trial's own analysis API. */
async function plotMeans(trialSlug: string, trait: string) {
  const res = await get('lead', `/api/trials/${trialSlug}/analysis?trait=${trait}`);
  expect(res.status).toBe(200);
  const sums = new Map<string, { sum: number; n: number }>();
  for (const p of res.body.plotValues as { entry: string; site: string; value: number }[]) {
    const key = `${p.entry}\u0000${p.site}`;
    const s = sums.get(key) ?? { sum: 0, n: 0 };
    s.sum += p.value;
    s.n += 1;
    sums.set(key, s);
  }
  return new Map([...sums].map(([k, s]) => [k, s.sum / s.n]));
}

describe('GET /api/varieties/stability', () => {
  it.each([
    ['marketable_yield', 'higher'],
    ['plant_height', 'lower'],
  ])(
    'okra %s (%s is better): the balanced subset of two seasons, figures equal the engine on the trials’ own means',
    async (trait) => {
      const res = await stability('lead', 'Okra', trait);
      expect(res.status).toBe(200);
      const body = res.body as {
        crop: string;
        crops: string[];
        trait: { key: string };
        environments: Env[];
        varieties: Row[];
        grandMean: number;
        notice: string | null;
      };
      expect(body.crop).toBe('Okra');
      expect(body.crops).toEqual(['Bush bean', 'Okra', 'Tomato']);
      expect(body.trait.key).toBe(trait);
      expect(body.notice).toBeNull();
      // Two okra seasons at three gardens: six environments, every one in the subset.
      expect(body.environments).toHaveLength(6);
      expect(new Set(body.environments.map((e) => e.trialSlug))).toEqual(
        new Set(['larkhaven-okra-2025', 'larkhaven-okra-2026']),
      );
      expect(body.environments.every((e) => e.used)).toBe(true);
      // Unbalanced register: one variety grown only in 2025, one only in 2026, both left out.
      const left = body.varieties.filter((v) => !v.used);
      expect(left.map((v) => v.name).sort()).toEqual(['Hollin Pink Velvet', 'Tallow Creek Green']);
      for (const v of left) {
        expect(v.environmentCount).toBe(3);
        expect(v.reason).toBe('not grown in every environment of the balanced subset');
        expect(v.figures).toBeNull();
      }
      const used = body.varieties.filter((v) => v.used);
      expect(used).toHaveLength(5);

      // The same means, derived from each trial's own plot values.
      const cells = [];
      for (const slug of ['larkhaven-okra-2025', 'larkhaven-okra-2026']) {
        const means = await plotMeans(slug, trait);
        for (const v of used)
          for (const e of body.environments.filter((x) => x.trialSlug === slug))
            cells.push({
              variety: v.slug,
              environment: `${slug}/${e.site}`,
              mean: means.get(`${v.name}\u0000${e.site}`)!,
            });
      }
      const expected = stabilityAnalysis(cells);
      expect(body.grandMean).toBeCloseTo(expected.grandMean, 9);
      for (const e of body.environments) {
        const x = expected.environments.find((y) => y.environment === `${e.trialSlug}/${e.site}`)!;
        expect(e.mean).toBeCloseTo(x.mean, 9);
        expect(e.index).toBeCloseTo(x.index, 9);
      }
      for (const v of used) {
        const x = expected.varieties.find((y) => y.variety === v.slug)!;
        for (const k of [
          'mean',
          'slope',
          'slopeSe',
          'rSquared',
          'slopeVersusOneP',
          'deviationMs',
          'ecovalence',
          'ecovalenceShare',
        ] as const)
          expect(v.figures![k]).toBeCloseTo(x[k], 9);
        expect(v.figures!.deviationDf).toBe(4);
      }
      // Identities of the definitions on a balanced subset.
      const sum = (xs: number[]) => xs.reduce((a, b) => a + b, 0);
      expect(sum(body.environments.map((e) => e.index ?? NaN))).toBeCloseTo(0, 9);
      expect(sum(used.map((v) => v.figures!.slope ?? NaN)) / used.length).toBeCloseTo(1, 12);
      expect(sum(used.map((v) => v.figures!.ecovalenceShare ?? NaN))).toBeCloseTo(1, 12);
    },
    120_000,
  );

  it('says why there are no figures when a crop has too few environments, and names the crop’s traits', async () => {
    const res = await stability('grower2', 'Bush bean');
    expect(res.status).toBe(200);
    expect(res.body.notice).toMatch(/stability needs at least 2 varieties in 3 environments/);
    expect(res.body.varieties).toHaveLength(5);
    for (const v of res.body.varieties as Row[]) {
      expect(v.figures).toBeNull();
      expect(v.reason).toBe('grown in 1 environment; stability needs at least 3');
    }
    expect(res.body.traits.map((x: { key: string }) => x.key)).toContain('marketable_yield');
    // A group member outside the (unpublished) bean trial sees none of its figures.
    const outside = await stability('grower', 'Bush bean');
    expect(outside.status).toBe(200);
    expect(outside.body.traits).toEqual([]);
    expect(outside.body.environments).toEqual([]);
    expect(outside.body.varieties[0].reason).toBe(
      'not measured on this trait in any trial you may see',
    );
  }, 60_000);

  it('computes the tomato trial’s three gardens as three environments', async () => {
    const res = await stability('lead', 'tomato', 'marketable_yield');
    expect(res.status).toBe(200);
    expect(res.body.crop).toBe('Tomato');
    expect(res.body.environments).toHaveLength(3);
    expect(res.body.varieties.filter((v: Row) => v.used)).toHaveLength(5);
    expect(res.body.varieties[0].figures.deviationDf).toBe(1);
  }, 60_000);

  it('answers group members, hides the register from outsiders and the signed out, refuses bad input', async () => {
    for (const who of ['lead', 'grower', 'viewer'])
      expect((await stability(who, 'Okra', 'vigor')).status).toBe(200);
    expect((await stability('outsider', 'Okra')).status).toBe(404);
    expect((await stability('signedOut', 'Okra')).status).toBe(404);
    const noCrop = await stability('lead', 'Parsnip');
    expect(noCrop.status).toBe(400);
    expect(noCrop.body.error.details.fields[0].path).toBe('query.crop');
    const noTrait = await stability('lead', 'Okra', 'leaf_count');
    expect(noTrait.status).toBe(400);
    expect(noTrait.body.error.details.fields[0].path).toBe('query.trait');
    const badGroup = await get('lead', '/api/varieties/stability?group=nope&crop=Okra');
    expect(badGroup.status).toBe(400);
    expect((await get('lead', '/api/varieties/stability')).status).toBe(400);
  }, 60_000);
});
