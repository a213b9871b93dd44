// A split plot that lost a plot: the analysis API gives it the mixed model (REML) instead of
// refusing it, says so, and gives the same numbers as the analyze command on the same plots.
// The engine's numbers themselves are checked against R lme4/lmerTest/emmeans in
// tests/unit/analysis/split-plot-mixed.test.ts; here the API and the command must agree.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Ranking, TrialAnalysis } from '../../common/contracts/analysis';
import { interactionNote, type ResultSnapshot } from '../../common/contracts/results';
import { demoAccounts } from '../../db/seed/demo-season';
import { SPLIT_PLOT_SLUG } from '../../db/seed/demo-split-plot';
import { seedDemoIfEmpty } from '../../db/seed/seed';
import { localStorage } from '../../server/storage/local-storage';
import { createTestApp, mintSessionCookie, TEST_ORIGIN, type TestApp } from '../support/test-app';

let t: TestApp;
let cookie: string;
const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-split-plot-'));
const url = `/api/trials/${SPLIT_PLOT_SLUG}/analysis?trait=days_to_first_pods`;
beforeAll(async () => {
  t = await createTestApp();
  await seedDemoIfEmpty(t.db, localStorage(folder));
  cookie = await mintSessionCookie(
    t,
    demoAccounts.find((a) => a.key === 'lead')!,
  );
  // One plot's record of first pods is withdrawn: the split plot loses that plot.
  const trial = await t.db
    .selectFrom('trials')
    .select('id')
    .where('slug', '=', SPLIT_PLOT_SLUG)
    .executeTakeFirstOrThrow();
  const plot = await t.db
    .selectFrom('plots')
    .select('id')
    .where('trial_id', '=', trial.id)
    .orderBy('plot_number')
    .executeTakeFirstOrThrow();
  const gone = await t.db
    .updateTable('observations')
    .set({ deleted_at: new Date() })
    .where('plot_id', '=', plot.id)
    .where('deleted_at', 'is', null)
    .executeTakeFirst();
  expect(Number(gone.numUpdatedRows)).toBeGreaterThan(0);
}, 120_000);
afterAll(async () => {
  await t.close();
  fs.rmSync(folder, { recursive: true, force: true });
});

/** The lead saves the sheet of the split plot's one trait, with a model or left to the design. */
const saveSheet = (model?: 'mixed') =>
  request(t.app)
    .put(`/api/trials/${SPLIT_PLOT_SLUG}/results-sheet`)
    .set('Origin', TEST_ORIGIN)
    .set('Cookie', cookie)
    .send({
      summary: '',
      methods: null,
      traits: [{ key: 'days_to_first_pods', basis: 'plot', weight: 1 }],
      entryNotes: {},
      coverPhotos: {},
      alpha: 0.05,
      letters: 'hsd',
      ...(model ? { model } : {}),
      license: 'CC-BY-4.0',
    });

describe('a split plot with a missing plot', () => {
  it('gets the mixed model by default, says why, and gives its tests and variances', async () => {
    const res = await request(t.app).get(url).set('Cookie', cookie);
    expect(res.status).toBe(200);
    const a = res.body as TrialAnalysis;
    expect(a.model).toBe('mixed');
    expect(a.counts.missingPlots).toBe(1);
    expect(a.plotValues).toHaveLength(31);
    expect(a.warnings.join(' ')).toContain(
      "1 missing plot: the split plot's classical strata need every plot, so it is analysed by the mixed model (REML",
    );
    expect(a.anova).toEqual([]);
    expect(a.varianceComponents!.map((c) => c.source)).toEqual([
      'block',
      'block:treatment',
      'residual',
    ]);
    expect(a.twoFactor!.fixedTests!.map((f) => [f.source, f.numDf, f.method])).toEqual([
      ['treatment', 1, 'satterthwaite'],
      ['variety', 3, 'satterthwaite'],
      ['variety:treatment', 3, 'satterthwaite'],
    ]);
    expect(a.fixedTest).toEqual({ ...a.twoFactor!.fixedTests![1], source: 'variety' });
    expect(a.twoFactor!.cellMeans).toHaveLength(8);
  });

  it('refuses the classical strata asked for by name, pointing to the mixed model', async () => {
    const res = await request(t.app).get(`${url}&model=anova`).set('Cookie', cookie);
    expect(res.status).toBeGreaterThanOrEqual(400);
    expect(res.status).toBeLessThan(500);
    expect(res.body.error.message).toMatch(/missing plots .*analysed by the mixed model/);
  });

  it('gives the same numbers as the analyze command on the same plots', async () => {
    const res = await request(t.app).get(`${url}&model=mixed`).set('Cookie', cookie);
    expect(res.status).toBe(200);
    const a = res.body as TrialAnalysis;
    const tf = a.twoFactor!;
    // The plots in the order the API analyses them: by the lead's order of levels, then entry code.
    const order = new Map(tf.levels.map((l, i) => [l, i]));
    const plots = [...a.plotValues].sort(
      (x, y) =>
        order.get(x.treatment!)! - order.get(y.treatment!)! ||
        x.entryCode.localeCompare(y.entryCode),
    );
    const csv = [
      'block,Fertilizer,variety,plot,value',
      ...plots.map((p) => `${p.block},${p.treatment},${p.entry},${p.plotNumber},${p.value}`),
    ].join('\n');
    const file = path.join(folder, 'split-plot.csv');
    fs.writeFileSync(file, csv);
    const run = spawnSync(
      process.execPath,
      [
        '--import',
        'tsx',
        'server/analysis/cli.ts',
        file,
        '--factor',
        'Fertilizer',
        '--split-plot',
        '--model',
        'mixed',
        // The trait's own direction, as the API ranks by it.
        '--direction',
        a.direction,
      ],
      { encoding: 'utf8', timeout: 60_000 },
    );
    expect(run.stderr).toBe('');
    const out = JSON.parse(run.stdout);
    const same = (x: number, y: number) =>
      expect(Math.abs(x - y)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(y)));
    expect(out.model).toBe('mixed');
    for (const c of out.adjustedMeans) {
      const m = tf.cellMeans.find((x) => x.variety === c.variety && x.treatment === c.treatment)!;
      same(m.mean, c.mean);
      same(m.se, c.se);
      same(m.df, c.df);
    }
    for (const [ours, theirs] of [
      [tf.treatmentMeans, out.treatmentMeans],
      [tf.varietyMeans, out.varietyMeans],
    ] as const)
      (ours as { mean: number; se: number; df: number }[]).forEach((m, i) => {
        same(m.mean, theirs[i].mean);
        same(m.se, theirs[i].se);
        same(m.df, theirs[i].df);
      });
    tf.fixedTests!.forEach((f, i) => {
      expect(f.source).toBe(out.fixedTests[i].source);
      same(f.f, out.fixedTests[i].f);
      same(f.denDf, out.fixedTests[i].denDf);
      same(f.p, out.fixedTests[i].p);
    });
    a.varianceComponents!.forEach((c, i) => same(c.variance, out.varianceComponents[i].variance));
    tf.treatmentWithinVariety.forEach((e, i) => {
      const o = out.treatmentWithinVariety[i];
      expect([e.within, e.a, e.b]).toEqual([o.within, o.a, o.b]);
      same(e.difference, o.difference);
      same(e.se, o.se);
      same(e.df, o.df);
      same(e.p, o.p);
    });
    same(a.logLik!, out.logLik);
    expect(a.means.map((m) => [m.variety, m.rank, m.group])).toEqual(
      out.means.map((m: { variety: string; rank: number; group: string }) => [
        m.variety,
        m.rank,
        m.group,
      ]),
    );
  });

  it('ranks across traits with the same model when none is named, and by the mixed model when asked', async () => {
    const analysis = (await request(t.app).get(url).set('Cookie', cookie)).body as TrialAnalysis;
    for (const q of ['', '&model=mixed']) {
      const res = await request(t.app)
        .get(`/api/trials/${SPLIT_PLOT_SLUG}/ranking?traits=days_to_first_pods${q}`)
        .set('Cookie', cookie);
      expect(res.status).toBe(200);
      const ranking = res.body as Ranking;
      // One trait: its contribution is the adjusted mean the analysis ranks by.
      for (const m of analysis.means) {
        const row = ranking.entries.find((e) => e.entry === m.variety)!;
        expect(row.contributions[0]!.mean).toBeCloseTo(
          analysis.twoFactor!.varietyMeans.find((v) => v.variety === m.variety)!.mean,
          9,
        );
      }
    }
  });

  it('publishes a sheet left to the design with the mixed model, its Wald test and its words', async () => {
    expect((await saveSheet()).status).toBe(200);
    const pub = await request(t.app)
      .post(`/api/trials/${SPLIT_PLOT_SLUG}/results-sheet/publish`)
      .set('Origin', TEST_ORIGIN)
      .set('Cookie', cookie)
      .send({ changeNote: '' });
    expect(pub.status).toBe(201);
    const sheet = (await request(t.app).get(`/api/results/${SPLIT_PLOT_SLUG}`))
      .body as ResultSnapshot;
    const api = (await request(t.app).get(url).set('Cookie', cookie)).body as TrialAnalysis;
    const trait = sheet.traits[0]!;
    expect(sheet.model).toBe('mixed');
    expect(trait.model).toBe('mixed');
    expect(trait.twoFactor!.cellMeans).toEqual(api.twoFactor!.cellMeans);
    expect(trait.twoFactor!.fixedTests).toEqual(api.twoFactor!.fixedTests);
    expect(trait.means.map((m) => [m.variety, m.rank, m.group])).toEqual(
      api.means.map((m) => [m.variety, m.rank, m.group]),
    );
    expect(trait.twoFactor!.strata).toMatch(/mixed model \(REML\)/);
    expect(sheet.methods).toMatch(/mixed model \(REML\)/);
    const wald = api.twoFactor!.fixedTests!.find((f) => f.source === 'variety:treatment')!;
    expect(interactionNote(trait)).toContain(`F(${wald.numDf}, ${wald.denDf.toFixed(1)})`);
    expect(interactionNote(trait)).toContain('Wald, Satterthwaite df');
  });

  it('accepts the mixed model chosen by name for the sheet of a split plot', async () => {
    expect((await saveSheet('mixed')).status).toBe(200);
  });
});
