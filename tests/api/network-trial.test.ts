// The demo's volunteer network (db/seed/demo-network.ts): an incomplete-block trial where each
// of twenty gardens grows four of twelve entries, three gardens dropped out and two plots were
// lost. Its analysis through the API is checked against R (lme4 1.1-31 + lmerTest 3.1-3 +
// emmeans 1.8.4-1, refined REML optimum) in fixtures/analysis/mixed-demo-network.json; the
// exact call and versions are stored there and the data beside it.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Design } from '../../common/contracts/design';
import { describePlan } from '../../common/incomplete-blocks';
import {
  NETWORK_SLUG,
  networkCsv,
  networkEntries,
  networkLayout,
} from '../../db/seed/demo-network';
import { demoAccounts } from '../../db/seed/demo-season';
import { seedDemoIfEmpty } from '../../db/seed/seed';
import { createTestApp, mintSessionCookie, type TestApp } from '../support/test-app';

let t: TestApp;
let lead: string;
beforeAll(async () => {
  t = await createTestApp();
  await seedDemoIfEmpty(t.db);
  lead = await mintSessionCookie(
    t,
    demoAccounts.find((a) => a.key === 'lead')!,
  );
}, 120_000);
afterAll(async () => {
  await t.close();
});

const get = (url: string) => request(t.app).get(url).set('Cookie', lead);
const fixtureDir = 'fixtures/analysis';
const ref = JSON.parse(readFileSync(path.join(fixtureDir, 'mixed-demo-network.json'), 'utf8')) as {
  call: string;
  varianceComponents: { source: string; variance: number }[];
  adjustedMeans: { variety: string; mean: number; se: number }[];
  fixedTest: { numDf: number; denDf: number; f: number; p: number };
  logLik: number;
};
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('the volunteer network demo', () => {
  it('is the data the R reference was computed from', () => {
    // Written by the one CSV writer, byte for byte the file R read.
    expect(networkCsv()).toBe(
      readFileSync(path.join(fixtureDir, 'mixed-demo-network.csv'), 'utf8'),
    );
    expect(ref.call).toContain('lmer(value ~ variety + (1 | site)');
  });

  it('has the plan the stored seed gives, and the design reports its pair concurrences', async () => {
    const res = await get(`/api/trials/${NETWORK_SLUG}/design`);
    expect(res.status).toBe(200);
    const d = res.body as Design;
    expect(d.design).toBe('network');
    expect(d.layout).toMatchObject({ blockSize: 4, replicates: 6, seed: expect.any(Number) });
    const siteName = new Map(d.sites.map((s) => [s.id, s.name]));
    const entryCode = new Map(d.entries.map((e) => [e.id, e.code]));
    const stored = d.plots
      .map(
        (p) =>
          `${siteName.get(p.siteId)}:${p.plotNumber}:${entryCode.get(p.entryId)}:${p.replicate}`,
      )
      .sort();
    const planned = networkLayout()
      .map((p) => `${p.siteId}:${p.plotNumber}:${p.entryId}:${p.replicate}`)
      .sort();
    expect(stored).toEqual(planned);
    const expected = describePlan(
      networkLayout().map((p) => ({ block: p.siteId, entry: p.entryId, replicate: p.replicate! })),
      networkEntries.map((e) => e.code).sort(),
    );
    expect(d.layout.blocks).toEqual(expected);
    expect(d.layout.blocks).toMatchObject({ blocks: 20, fullReplicates: 6 });
  });

  it('is analysed by the mixed model without asking, equal to lme4/lmerTest/emmeans', async () => {
    const res = await get(`/api/trials/${NETWORK_SLUG}/analysis?trait=pod_yield`);
    expect(res.status).toBe(200);
    const r = res.body;
    expect(r.model).toBe('mixed');
    expect(r.n).toBe(66);
    // Variance components to 5 significant digits, df to 4, means and SEs to 6, p to 1e-6.
    for (const c of ref.varianceComponents) {
      const mine = r.varianceComponents.find((v: { source: string }) => v.source === c.source);
      expect(rel(mine.variance, c.variance)).toBeLessThan(5e-5);
    }
    expect(r.varianceComponents.map((v: { source: string }) => v.source).sort()).toEqual([
      'residual',
      'site',
    ]);
    expect(r.fixedTest.numDf).toBe(ref.fixedTest.numDf);
    expect(rel(r.fixedTest.denDf, ref.fixedTest.denDf)).toBeLessThan(5e-4);
    expect(rel(r.fixedTest.f, ref.fixedTest.f)).toBeLessThan(1e-5);
    expect(Math.abs(r.fixedTest.p - ref.fixedTest.p)).toBeLessThan(1e-6);
    expect(rel(r.logLik, ref.logLik)).toBeLessThan(1e-7);
    for (const m of ref.adjustedMeans) {
      const mine = r.adjustedMeans.find((a: { variety: string }) => a.variety === m.variety);
      expect(rel(mine.mean, m.mean)).toBeLessThan(1e-6);
      expect(rel(mine.se, m.se)).toBeLessThan(1e-6);
    }
    // Ranks follow the BLUEs (fresh pod yield: higher is better).
    const best = [...ref.adjustedMeans].sort((a, b) => b.mean - a.mean)[0]!.variety;
    expect(r.means.find((m: { rank: number }) => m.rank === 1).variety).toBe(best);
    expect(r.varianceSummary).toMatch(/gardens \(sites\) \d+ %/);
  });

  it('the classical analysis stays on offer: gardens fitted as fixed blocks before varieties', async () => {
    const res = await get(`/api/trials/${NETWORK_SLUG}/analysis?trait=pod_yield&model=anova`);
    expect(res.status).toBe(200);
    expect(res.body.model).toBe('anova');
    expect(res.body.varianceComponents).toBeUndefined();
    // 17 gardens with records: 16 df for gardens, 11 for varieties, 66 − 1 − 16 − 11 left.
    const df = Object.fromEntries(
      res.body.anova.map((l: { source: string; df: number }) => [l.source, l.df]),
    );
    expect(df).toMatchObject({ block: 16, variety: 11, residual: 38 });
  });
});
