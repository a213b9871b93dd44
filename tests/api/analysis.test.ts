// The trial analysis and ranking API on the demo season (db/seed/demo-season.ts) and on the
// spreadsheet endpoint, against the analyze command, R reference fixtures and hand checks.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts, demoTrials } from '../../db/seed/demo-season';
import { seedDemo } from '../../db/seed/seed';
import { analyzeCsv } from '../../server/analysis/engine/analyze';
import { createTestApp, createUser, mintSessionCookie, type TestApp } from '../support/test-app';

const OKRA = 'larkhaven-okra-2026';
let t: TestApp;
let lead: string;
let stranger: string;

beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.db);
  lead = await mintSessionCookie(
    t,
    demoAccounts.find((a) => a.key === 'lead')!,
  );
  stranger = await mintSessionCookie(t, await createUser(t.db, { name: 'Nell Outsider' }));
}, 60_000);
afterAll(async () => {
  await t.close();
});

const get = (url: string, cookie = lead) => request(t.app).get(url).set('Cookie', cookie);
const analysis = (trait: string, extra = '') =>
  get(`/api/trials/${OKRA}/analysis?trait=${trait}${extra}`);

type Body = {
  lsd: { value: number | null; protected: boolean };
  anova: { source: string; df: number; ss: number; f: number | null; p: number | null }[];
  means: { variety: string; mean: number; se: number | null; group: string; rank: number }[];
  plotValues: {
    plotId: string;
    plotNumber: number;
    site: string;
    block: number;
    entry: string;
    value: number;
  }[];
  entryCodes: Record<string, string>;
  warnings: string[];
  [k: string]: unknown;
};
const line = (b: Body, source: string) => b.anova.find((l) => l.source === source)!;
const byCode = (b: Body) => Object.fromEntries(b.means.map((m) => [b.entryCodes[m.variety]!, m]));

/** A demo okra plot by its number and site. */
async function okraPlot(plotNumber: number, siteName: string) {
  return t.db
    .selectFrom('plots as p')
    .innerJoin('sites as s', 's.id', 'p.site_id')
    .innerJoin('trials as tr', 'tr.id', 'p.trial_id')
    .select(['p.id', 'p.trial_id'])
    .where('tr.slug', '=', OKRA)
    .where('s.name', '=', siteName)
    .where('p.plot_number', '=', plotNumber)
    .executeTakeFirstOrThrow();
}

/** The plot values the API used, as the command's CSV (values written exactly as numbers). */
function toCsv(b: Body): string {
  const q = (s: string) => (/[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
  return (
    'site,block,plot,variety,value\n' +
    b.plotValues
      .map((p) => [q(p.site), p.block, p.plotNumber, q(p.entry), String(p.value)].join(','))
      .join('\n') +
    '\n'
  );
}

/** The analyze command as a child process on the API's plot values. */
function runCommand(b: Body, name: string, args: string[]) {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'rowtally-analysis-'));
  const file = path.join(dir, `${name}.csv`);
  writeFileSync(file, toCsv(b));
  const run = spawnSync(
    process.execPath,
    ['--import', 'tsx', 'server/analysis/cli.ts', file, '--trait', 'value', ...args],
    { encoding: 'utf8', timeout: 60_000 },
  );
  expect(run.stderr).toBe('');
  expect(run.status).toBe(0);
  return JSON.parse(run.stdout) as ReturnType<typeof analyzeCsv>;
}

function expectSameNumbers(api: Body, cmd: ReturnType<typeof analyzeCsv>) {
  expect(api.anova.map((l) => [l.source, l.df, l.ss, l.f, l.p])).toEqual(
    cmd.anova.map((l) => [l.source, l.df, l.ss, l.f, l.p]),
  );
  expect(api.means.map((m) => [m.variety, m.mean, m.se, m.group, m.rank])).toEqual(
    cmd.means.map((m) => [m.variety, m.mean, m.se, m.group, m.rank]),
  );
  expect(api.lsd).toEqual(cmd.lsd);
  expect(api.hsd).toEqual(cmd.hsd);
  expect(api.grandMean).toBe(cmd.grandMean);
}

describe('the demo season: what the generator built in is found', () => {
  it('marketable yield: varieties differ (F against site × variety), Tallow Creek first, Copperbell last', async () => {
    const r = await analysis('marketable_yield');
    expect(r.status).toBe(200);
    const b = r.body as Body;
    expect(b.design).toBe('multisite');
    expect(b.unit).toBe('g');
    // 6 entries × 3 blocks × 3 sites, every plot harvested.
    expect(b.n).toBe(54);
    expect(b.plotValues).toHaveLength(54);
    expect(line(b, 'variety').df).toBe(5);
    expect(line(b, 'site:variety').df).toBe(10);
    expect(line(b, 'variety').p!).toBeLessThan(0.001);
    // Generator: TC yieldEffect 1.18 at 300 mm spacing (10 plants a plot), CD 0.86 (the lowest).
    const m = byCode(b);
    expect(m.TC!.rank).toBe(1);
    expect(m.CD!.rank).toBe(6);
    expect(m.TC!.group).toBe('a');
  });

  it('mean fruit mass recovers the generator’s pod masses (17, 16, 15, 14, 14, 12 g) within 0.4 g', async () => {
    const b = (await analysis('mean_fruit_mass')).body as Body;
    const m = byCode(b);
    const designed = Object.fromEntries(demoTrials[0]!.entries.map((e) => [e.code, e.podMassG]));
    for (const [code, g] of Object.entries(designed))
      expect(Math.abs(m[code]!.mean - g)).toBeLessThan(0.4);
    expect(b.means.map((x) => b.entryCodes[x.variety]).slice(0, 3)).toEqual(['ML', 'TC', 'SR']);
  });

  it('pod length at toughness ranks as designed (ML 140 > RS 105 > SR 100 > VL 95 > CD 85 > TC 75 mm)', async () => {
    const b = (await analysis('pod_length_at_toughness')).body as Body;
    expect(b.means.map((x) => b.entryCodes[x.variety])).toEqual([
      'ML',
      'RS',
      'SR',
      'VL',
      'CD',
      'TC',
    ]);
    expect(
      b.warnings.some((w: string) => w.startsWith('sub-samples averaged: 250 plant readings')),
    ).toBe(true);
  });

  it('heat tolerance: no variety effect in the generator, and the analysis finds none', async () => {
    // The generator scores every plot from one distribution with no variety term (its own
    // random stream, db/seed/demo-season.ts), so the F test should not separate the entries.
    const b = (await analysis('heat_tolerance')).body as Body;
    expect(line(b, 'variety').p!).toBeGreaterThan(0.05);
    expect(line(b, 'site:variety').p!).toBeGreaterThan(0.05);
    expect(b.lsd.protected).toBe(false);
    expect(b.warnings.some((w: string) => w.includes('not protected'))).toBe(true);
    // Tukey's HSD at the same alpha separates nobody: every entry shares letter a.
    expect(b.means.every((x) => x.group === 'a')).toBe(true);
  });
});

describe('the API and the analyze command give the same numbers', () => {
  it('engine on the exported plot values = API, to the last digit', async () => {
    const b = (await analysis('marketable_yield')).body as Body;
    expectSameNumbers(b, analyzeCsv(toCsv(b), { design: 'multisite', trait: 'value' }));
  });

  it('the command as a child process prints the same F, p and means', async () => {
    const b = (await analysis('plant_height')).body as Body;
    const cmd = runCommand(b, 'plant-height', ['--design', 'multisite', '--direction', 'lower']);
    expectSameNumbers(b, cmd);
  }, 60_000);

  it('with the mixed model, the API and the command (--model mixed) give the same REML fit, BLUEs, ranks and letters', async () => {
    const r = await analysis('marketable_yield', '&model=mixed');
    expect(r.status).toBe(200);
    const b = r.body as Body & ReturnType<typeof analyzeCsv>;
    expect(b.model).toBe('mixed');
    const cmd = runCommand(b, 'marketable-yield', ['--design', 'multisite', '--model', 'mixed']);
    expect(cmd.model).toBe('mixed');
    expectSameNumbers(b, cmd);
    for (const key of [
      'adjustedMeans',
      'varianceComponents',
      'fixedTest',
      'logLik',
      'boundary',
    ] as const)
      expect(b[key]).toEqual(cmd[key]);
    // Three gardens in blocks: gardens, blocks within gardens and garden × variety are random.
    expect(b.varianceComponents!.map((c) => c.source)).toEqual([
      'site',
      'site:block',
      'site:variety',
      'residual',
    ]);
  }, 60_000);

  it('varieties as random: the API and the command (--varieties-random) give the same heritability and BLUPs', async () => {
    const r = await analysis('marketable_yield', '&model=mixed&varietiesRandom=true');
    expect(r.status).toBe(200);
    const b = r.body as Body & ReturnType<typeof analyzeCsv>;
    const cmd = runCommand(b, 'marketable-yield-random', [
      '--design',
      'multisite',
      '--model',
      'mixed',
      '--varieties-random',
    ]);
    expect(b.varietiesRandom).toEqual(cmd.varietiesRandom);
    expect(b.varietiesRandom!.varianceComponents[0]!.source).toBe('variety');
    expect(b.varietiesRandom!.heritability).toBeGreaterThan(0);
    expect(b.varietiesRandom!.heritability).toBeLessThan(1);
    // Not asked for: not fitted.
    expect(
      ((await analysis('marketable_yield', '&model=mixed')).body as Body).varietiesRandom,
    ).toBe(undefined);
    const anova = await analysis('marketable_yield', '&varietiesRandom=true');
    expect(anova.status).toBe(400);
    expect(anova.body.error.details.fields[0]).toEqual({
      path: 'query.varietiesRandom',
      message: 'Varieties as random need the mixed model.',
    });
  }, 60_000);
});

describe('records the analysis reads', () => {
  it('a soft-deleted harvest is left out of the plot value', async () => {
    const before = (await analysis('marketable_yield')).body as Body;
    const pv = before.plotValues[0]!;
    const h = await t.db
      .selectFrom('harvests')
      .select(['id', 'mass_g'])
      .where('plot_id', '=', pv.plotId)
      .where('grade', '=', 'marketable')
      .orderBy('harvested_on')
      .executeTakeFirstOrThrow();
    await t.db
      .updateTable('harvests')
      .set({ deleted_at: new Date() })
      .where('id', '=', h.id)
      .execute();
    try {
      const after = (await analysis('marketable_yield')).body as Body;
      const now = after.plotValues.find((p) => p.plotId === pv.plotId)!;
      expect(now.value).toBeCloseTo(pv.value - h.mass_g, 9);
      const live = await t.db
        .selectFrom('harvests')
        .select((eb) => eb.fn.sum<number>('mass_g').as('g'))
        .where('plot_id', '=', pv.plotId)
        .where('grade', '=', 'marketable')
        .where('deleted_at', 'is', null)
        .executeTakeFirstOrThrow();
      expect(now.value).toBeCloseTo(Number(live.g), 9);
    } finally {
      await t.db.updateTable('harvests').set({ deleted_at: null }).where('id', '=', h.id).execute();
    }
  });

  it('a plot with every harvest soft-deleted is a missing plot: least squares, warnings, same as the command', async () => {
    const plot = await okraPlot(
      ((await analysis('marketable_yield')).body as Body).plotValues[5]!.plotNumber,
      ((await analysis('marketable_yield')).body as Body).plotValues[5]!.site,
    );
    await t.db
      .updateTable('harvests')
      .set({ deleted_at: new Date() })
      .where('plot_id', '=', plot.id)
      .execute();
    try {
      const b = (await analysis('marketable_yield')).body as Body;
      expect(b.n).toBe(53);
      expect(b.counts).toMatchObject({ missingPlots: 1, entries: 6, sites: 3, blocks: 9 });
      expect(b.method).toBe('least-squares');
      expect(b.plotValues.some((p) => p.plotId === plot.id)).toBe(false);
      expect(b.warnings[0]).toMatch(/^1 plot\(s\) have no harvest records: left out as missing/);
      expect(b.warnings.some((w: string) => w.startsWith('unbalanced: 1 missing plot'))).toBe(true);
      expect(b.warnings.some((w: string) => w.startsWith('unequal replication'))).toBe(true);
      // One plot fewer: residual df 54 − 9 blocks − 5·3 (variety within each site) − 1 = 29.
      expect(line(b, 'residual').df).toBe(29);
      expectSameNumbers(b, analyzeCsv(toCsv(b), { design: 'multisite', trait: 'value' }));
    } finally {
      await t.db
        .updateTable('harvests')
        .set({ deleted_at: null })
        .where('plot_id', '=', plot.id)
        .execute();
    }
  });
});

describe('bases and units', () => {
  it('per m², per hectare and per acre are the plot value over its 3 m × 0.9 m area', async () => {
    const plot = ((await analysis('marketable_yield')).body as Body).plotValues;
    const m2 = (await analysis('marketable_yield', '&basis=m2')).body as Body;
    const ha = (await analysis('marketable_yield', '&basis=ha')).body as Body;
    const acre = (await analysis('marketable_yield', '&basis=acre')).body as Body;
    expect([m2.unit, ha.unit, acre.unit]).toEqual(['g/m²', 'kg/ha', 'lb/acre']);
    const area = 3 * 0.9; // the demo's plots: one 3 m row, rows 900 mm apart
    plot.forEach((p, i) => {
      expect(m2.plotValues[i]!.value).toBeCloseTo(p.value / area, 9);
      // 1 ha = 10 000 m²; 1 acre = 4046.8564224 m² and 1 lb = 453.59237 g (NIST Handbook 44).
      expect(ha.plotValues[i]!.value).toBeCloseTo(((p.value / area) * 10_000) / 1000, 6);
      expect(acre.plotValues[i]!.value).toBeCloseTo(
        ((p.value / area) * 4046.8564224) / 453.59237,
        6,
      );
    });
    // Every plot has the same area, so scaling changes no F (F is scale-free).
    expect(line(m2, 'variety').f!).toBeCloseTo(
      line((await analysis('marketable_yield')).body as Body, 'variety').f!,
      9,
    );
  });

  it('per plant divides by surviving plants', async () => {
    const b = (await analysis('pod_count', '&basis=plant')).body as Body;
    const plotV = ((await analysis('pod_count')).body as Body).plotValues;
    const plants = await t.db
      .selectFrom('plots')
      .select(['id', 'plants_surviving'])
      .where(
        'id',
        'in',
        plotV.map((p) => p.plotId),
      )
      .execute();
    const by = new Map(plants.map((p) => [p.id, p.plants_surviving!]));
    expect(b.unit).toBe('count/plant');
    b.plotValues.forEach((p, i) =>
      expect(p.value).toBeCloseTo(plotV[i]!.value / by.get(p.plotId)!, 9),
    );
  });

  it('refuses what cannot be computed, naming the field', async () => {
    const perPlantScore = await analysis('vigor', '&basis=plant');
    expect(perPlantScore.status).toBe(400);
    expect(perPlantScore.body.error.details.fields[0].path).toBe('query.basis');
    const badAlpha = await analysis('vigor', '&alpha=1.5');
    expect(badAlpha.status).toBe(400);
    expect(badAlpha.body.error.details.fields[0]).toEqual({
      path: 'query.alpha',
      message: 'The significance level must be below 1.',
    });
    const unknown = await analysis('no_such_trait');
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.message).toBe('The trait "no_such_trait" was not found.');
    expect((await get(`/api/trials/${OKRA}/analysis?trait=vigor`, stranger)).status).toBe(404);
  });
});

describe('ranking across traits', () => {
  it('index = weighted mean of signed z scores; rank sum of per-trait ranks', async () => {
    const r = await get(
      `/api/trials/${OKRA}/ranking?traits=marketable_yield,plant_height,spines&weights=2,1,1`,
    );
    expect(r.status).toBe(200);
    const traits = r.body.traits as {
      key: string;
      direction: string;
      weight: number;
      mean: number;
      sd: number;
    }[];
    expect(traits.map((x) => [x.key, x.direction, x.weight])).toEqual([
      ['marketable_yield', 'higher', 2],
      ['plant_height', 'lower', 1],
      ['spines', 'lower', 1],
    ]);
    for (const e of r.body.entries as {
      index: number;
      rankSum: number;
      contributions: {
        trait: string;
        mean: number;
        z: number;
        contribution: number;
        rank: number;
      }[];
    }[]) {
      let index = 0;
      e.contributions.forEach((c, i) => {
        const tr = traits[i]!;
        expect(c.z).toBeCloseTo((c.mean - tr.mean) / tr.sd, 12);
        const sign = tr.direction === 'higher' ? 1 : -1;
        index += (tr.weight * sign * c.z) / 4;
      });
      expect(e.index).toBeCloseTo(index, 12);
      expect(e.rankSum).toBe(e.contributions.reduce((s, c) => s + c.rank, 0));
    }
    // The ranking's entry means are the per-trait analysis' adjusted means.
    const yieldMeans = ((await analysis('marketable_yield')).body as Body).adjustedMeans as {
      variety: string;
      mean: number;
    }[];
    const tc = (r.body.entries as { entryCode: string; contributions: { mean: number }[] }[]).find(
      (e) => e.entryCode === 'TC',
    )!;
    expect(tc.contributions[0]!.mean).toBe(
      yieldMeans.find((m) => m.variety === 'Tallow Creek Green')!.mean,
    );
  });

  it.each(['anova', 'mixed'])(
    'with a missing plot, ranks by the %s adjusted means the analysis ranks by, not the arithmetic ones',
    async (model) => {
      // Tallow Creek Green loses its plot in block 1 of the first site: its arithmetic mean
      // then leaves out a block, its least-squares mean does not.
      const before = (await analysis('marketable_yield', `&model=${model}`)).body as Body;
      const lost = before.plotValues.find((p) => p.entry === 'Tallow Creek Green')!;
      const plot = await okraPlot(lost.plotNumber, lost.site);
      await t.db
        .updateTable('harvests')
        .set({ deleted_at: new Date() })
        .where('plot_id', '=', plot.id)
        .execute();
      try {
        const b = (await analysis('marketable_yield', `&model=${model}`)).body as Body;
        const adjusted = b.adjustedMeans as { variety: string; mean: number }[];
        const arithmetic = b.means.find((m) => m.variety === 'Tallow Creek Green')!.mean;
        const ls = adjusted.find((m) => m.variety === 'Tallow Creek Green')!.mean;
        expect(Math.abs(ls - arithmetic)).toBeGreaterThan(1);
        const r = await get(
          `/api/trials/${OKRA}/ranking?traits=marketable_yield&weights=1&model=${model}`,
        );
        expect(r.status).toBe(200);
        for (const e of r.body.entries as {
          entry: string;
          contributions: { mean: number; rank: number }[];
        }[]) {
          expect(e.contributions[0]!.mean).toBe(adjusted.find((m) => m.variety === e.entry)!.mean);
          expect(e.contributions[0]!.rank).toBe(b.means.find((m) => m.variety === e.entry)!.rank);
        }
      } finally {
        await t.db
          .updateTable('harvests')
          .set({ deleted_at: null })
          .where('plot_id', '=', plot.id)
          .execute();
      }
    },
  );

  it('one weight per trait, or a 400 naming query.weights', async () => {
    const r = await get(`/api/trials/${OKRA}/ranking?traits=marketable_yield,spines&weights=1`);
    expect(r.status).toBe(400);
    expect(r.body.error.details.fields[0]).toEqual({
      path: 'query.weights',
      message: 'Give one weight per trait (2).',
    });
    const zero = await get(`/api/trials/${OKRA}/ranking?traits=marketable_yield&weights=0`);
    expect(zero.status).toBe(400);
    const model = await get(`/api/trials/${OKRA}/ranking?traits=marketable_yield&model=blup`);
    expect(model.status).toBe(400);
    expect(model.body.error.details.fields[0].path).toBe('query.model');
    // A completely randomized trial has no gardens or blocks to treat as random.
    await t.db.updateTable('trials').set({ design: 'crd' }).where('slug', '=', OKRA).execute();
    try {
      const crd = await get(`/api/trials/${OKRA}/ranking?traits=marketable_yield&model=mixed`);
      expect(crd.status).toBe(400);
      expect(crd.body.error.details.fields[0]).toEqual({
        path: 'query.model',
        message: 'A completely randomized trial is analysed with the classical analysis only.',
      });
    } finally {
      await t.db
        .updateTable('trials')
        .set({ design: 'multisite' })
        .where('slug', '=', OKRA)
        .execute();
    }
  });
});

describe('POST /api/analyze (spreadsheet, nothing stored)', () => {
  const fixture = (name: string) =>
    readFileSync(path.join('fixtures/analysis', `${name}.csv`), 'utf8');
  const reference = (name: string) =>
    JSON.parse(readFileSync(path.join('fixtures/analysis', `${name}.json`), 'utf8')) as {
      anova: { source: string; f: number | null; p: number | null }[];
    };
  /** A signed-in lead's spreadsheet sent as text/csv, with the query after `/api/analyze`. */
  const post = (csv: string, query = '') =>
    request(t.app)
      .post(`/api/analyze${query}`)
      .set('Cookie', lead)
      .set('Content-Type', 'text/csv')
      .send(csv);

  it('a text/csv body gives R’s aov() F for datasets::npk (fixtures/analysis/npk-rcbd.json)', async () => {
    const r = await post(fixture('npk-rcbd'), '?alpha=0.05');
    expect(r.status).toBe(200);
    const ref = reference('npk-rcbd').anova.find((l) => l.source === 'variety')!;
    const v = (r.body as Body).anova.find((l) => l.source === 'variety')!;
    expect(Math.abs(v.f! - ref.f!) / ref.f!).toBeLessThan(1e-10);
    expect(Math.abs(v.p! - ref.p!) / ref.p!).toBeLessThan(1e-8);
    expect(r.body).toEqual(JSON.parse(JSON.stringify(analyzeCsv(fixture('npk-rcbd')))));
  });

  it('model=mixed gives lme4/lmerTest REML figures (fixtures/analysis/mixed-network.json); a sheet with no gardens or blocks is 422', async () => {
    const ref = JSON.parse(
      readFileSync(path.join('fixtures/analysis', 'mixed-network.json'), 'utf8'),
    ) as { logLik: number; fixedTest: { denDf: number; p: number } };
    const r = await post(fixture('mixed-network'), '?model=mixed');
    expect(r.status).toBe(200);
    expect(r.body.model).toBe('mixed');
    expect(Math.abs(r.body.logLik - ref.logLik)).toBeLessThan(1e-6);
    expect(
      Math.abs(r.body.fixedTest.denDf - ref.fixedTest.denDf) / ref.fixedTest.denDf,
    ).toBeLessThan(1e-4);
    expect(r.body).toEqual(
      JSON.parse(JSON.stringify(analyzeCsv(fixture('mixed-network'), { model: 'mixed' }))),
    );
    const refused = await post(fixture('plantgrowth'), '?model=mixed');
    expect(refused.status).toBe(422);
    expect(refused.body.error.message).toMatch(/needs a site or block column/);
    const badModel = await post(fixture('plantgrowth'), '?model=bayes');
    expect(badModel.status).toBe(400);
  });

  it('chosen columns read a sheet with its own header names', async () => {
    const renamed = fixture('multisite').replace(
      /^site,block,variety,value/,
      'Garden,Rep,Cultivar name,Yield g',
    );
    const r = await post(renamed, '?site=Garden&block=Rep&variety=Cultivar%20name&value=Yield%20g');
    expect(r.status).toBe(200);
    const plain = analyzeCsv(fixture('multisite'));
    expect(r.body.anova.map((l: { f: number | null }) => l.f)).toEqual(plain.anova.map((l) => l.f));
    expect(r.body.trait).toBe('Yield g');
  });

  it('JSON with a csv field works too; bad sheets get a one-line 422', async () => {
    const ok = await request(t.app)
      .post('/api/analyze')
      .set('Cookie', lead)
      .send({ csv: fixture('plantgrowth'), alpha: 0.01 });
    expect(ok.status).toBe(200);
    expect(ok.body.alpha).toBe(0.01);
    const bad = await post('variety,value\nA,1\nA,x\nB,2\n');
    expect(bad.status).toBe(422);
    expect(bad.body.error.message).toBe('row 3, column "value": "x" is not a number');
  });

  it('refuses 1e400 and 1e-400 naming row and column (beyond IEEE 754 double range); hints at a semicolon separator', async () => {
    const big = await post('variety,value\nA,1\nA,1e400\nB,2\nB,3\n');
    expect(big.status).toBe(422);
    expect(big.body.error.message).toMatch(/^row 3, column "value": 1e400 is too large to analyse/);
    const tiny = await post('variety,value\nA,1\nA,2\nB,1e-400\nB,3\n');
    expect(tiny.status).toBe(422);
    expect(tiny.body.error.message).toMatch(
      /^row 4, column "value": 1e-400 is too small to analyse/,
    );
    const semi = await post('variety;value\nA;1\nA;2\nB;3\nB;4\n');
    expect(semi.status).toBe(422);
    expect(semi.body.error.message).toMatch(/separated by semicolons, not commas/);
    const gap = await post('variety,value\nA,1\nA,2\nA,\nB,3\nB,4\n');
    expect(gap.status).toBe(200);
    expect(gap.body.warnings).toContain('row 4 has no value: left out');
  });

  it('refuses more than 2 MB (413), other media types (415) and signed-out callers (401)', async () => {
    const big = 'variety,value\n' + 'Long Name Variety,12.345678\n'.repeat(80_000);
    expect(big.length).toBeGreaterThan(2 * 1024 * 1024);
    const tooBig = await post(big);
    expect(tooBig.status).toBe(413);
    expect(tooBig.body.error.code).toBe('payload_too_large');
    const xml = await request(t.app)
      .post('/api/analyze')
      .set('Cookie', lead)
      .set('Content-Type', 'application/xml')
      .send('<a/>');
    expect(xml.status).toBe(415);
    const anon = await request(t.app)
      .post('/api/analyze')
      .set('Content-Type', 'text/csv')
      .send('variety,value\n');
    expect(anon.status).toBe(401);
  });
});
