// Publishing the demo fertilizer × variety split plot: the frozen sheet carries the two-factor
// analysis, and the sheet (JSON, CSV, PDF), the analysis API and the analyze command agree.
import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { TrialAnalysis } from '../../common/contracts/analysis';
import type { ResultSnapshot } from '../../common/contracts/results';
import { exportNumber } from '../../common/precision';
import { demoAccounts } from '../../db/seed/demo-season';
import { SPLIT_PLOT_SLUG, seedSplitPlotTrial } from '../../db/seed/demo-split-plot';
import { seedDemo } from '../../db/seed/seed';
import type { TwoFactorResult } from '../../server/analysis/engine/analyze';
import { createTestApp, mintSessionCookie, TEST_ORIGIN, type TestApp } from '../support/test-app';

const TRAIT = 'days_to_first_pods';
let t: TestApp;
let lead: string;
let sheet: ResultSnapshot;
let api: TrialAnalysis;

const asBytes = (r: request.Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  r.on('data', (c: Buffer) => chunks.push(c));
  r.on('end', () => cb(null, Buffer.concat(chunks)));
};

beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.db);
  await seedSplitPlotTrial(t.db);
  lead = await mintSessionCookie(
    t,
    demoAccounts.find((a) => a.key === 'lead')!,
  );
  const put = await request(t.app)
    .put(`/api/trials/${SPLIT_PLOT_SLUG}/results-sheet`)
    .set('Origin', TEST_ORIGIN)
    .set('Cookie', lead)
    .send({
      summary: 'Withholding fertilizer brought the heirlooms’ first pods days earlier.',
      methods: null,
      traits: [{ key: TRAIT, basis: 'plot', weight: 1 }],
      entryNotes: {},
      coverPhotos: {},
      alpha: 0.05,
      letters: 'hsd',
      license: 'CC-BY-4.0',
    });
  expect(put.status).toBe(200);
  const pub = await request(t.app)
    .post(`/api/trials/${SPLIT_PLOT_SLUG}/results-sheet/publish`)
    .set('Origin', TEST_ORIGIN)
    .set('Cookie', lead)
    .send({ changeNote: '' });
  expect(pub.status).toBe(201);
  sheet = (await request(t.app).get(`/api/results/${SPLIT_PLOT_SLUG}`)).body as ResultSnapshot;
  const a = await request(t.app)
    .get(`/api/trials/${SPLIT_PLOT_SLUG}/analysis?trait=${TRAIT}&alpha=0.05&letters=hsd`)
    .set('Cookie', lead);
  expect(a.status).toBe(200);
  api = a.body as TrialAnalysis;
}, 60_000);
afterAll(async () => {
  await t.close();
});

const published = () => sheet.traits.find((x) => x.key === TRAIT)!;
const ms = (source: string) => published().anova.find((l) => l.source === source)!.ms!;

describe('a published two-factor sheet', () => {
  it('freezes the cell, treatment and variety means, the strata and the interaction test as the analysis API gives them', () => {
    const p = published();
    expect(p.twoFactor).toMatchObject({
      factor: 'Fertilizer',
      levels: ['none', 'pre-plant'],
      layout: 'split-plot',
    });
    // Exactly the API's numbers, not merely present: every cell, every margin, every simple effect.
    const { strata, ...two } = p.twoFactor!;
    expect(two).toEqual(api.twoFactor);
    expect(p.anova).toEqual(api.anova);
    expect(p.means.map((m) => [m.variety, m.mean, m.se, m.group, m.rank])).toEqual(
      api.means.map((m) => [m.variety, m.mean, m.se, m.group, m.rank]),
    );
    expect(p.twoFactor!.cellMeans).toHaveLength(8);
    // aov(value ~ block + treatment * variety + Error(block/treatment)) strata, in words.
    expect(strata).toBe(
      'Split plot: fertilizer is on main plots and is tested against the main-plot error (block × fertilizer); variety and variety × fertilizer are tested against the subplot error (residual).',
    );
    expect(sheet.methods).toContain(strata);
    expect(sheet.methods).toContain(
      'Entries were ranked and separated on their means over all levels of fertilizer',
    );
    // Every plot value keeps its fertilizer level.
    expect(sheet.plotValues).toHaveLength(32);
    expect(new Set(sheet.plotValues.map((v) => v.treatment))).toEqual(
      new Set(['none', 'pre-plant']),
    );
  });

  it('has the textbook means and standard errors of a balanced split plot', () => {
    // A balanced split plot's least-squares cell and marginal means are the plain means of their
    // plots; with a levels of the main-plot factor, b subplot varieties and r blocks, Ea the
    // main-plot and Eb the subplot error mean square, SE(cell) = √((Ea + (b−1)Eb)/(rb)),
    // SE(treatment) = √(Ea/(rb)), SE(variety) = √((Ea + (b−1)Eb)/(rab)) — Gomez & Gomez (1984),
    // Statistical Procedures for Agricultural Research, ch. 3.4 (from memory); the same formulas
    // reproduce fixtures/analysis/two-factor-split-plot.json (R aov + emmeans).
    const p = published();
    const values = sheet.plotValues.filter((v) => v.trait === TRAIT);
    const mean = (xs: number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;
    const [a, b, r] = [2, 4, 4];
    const Ea = ms('block:treatment');
    const Eb = ms('residual');
    for (const c of p.twoFactor!.cellMeans) {
      const cell = values.filter((v) => v.variety === c.variety && v.treatment === c.treatment);
      expect(cell).toHaveLength(r);
      expect(c.mean).toBeCloseTo(mean(cell.map((v) => v.value)), 10);
      expect(c.se).toBeCloseTo(Math.sqrt((Ea + (b - 1) * Eb) / (r * b)), 10);
    }
    for (const m of p.twoFactor!.treatmentMeans) {
      const level = values.filter((v) => v.treatment === m.treatment).map((v) => v.value);
      expect(m.mean).toBeCloseTo(mean(level), 10);
      expect(m.se).toBeCloseTo(Math.sqrt(Ea / (r * b)), 10);
    }
    for (const m of p.twoFactor!.varietyMeans)
      expect(m.se).toBeCloseTo(Math.sqrt((Ea + (b - 1) * Eb) / (r * a * b)), 10);
    // Days to first pods: lower is better, so rank 1 is the earliest variety over both levels.
    const earliest = [...p.means].sort((x, y) => x.mean - y.mean)[0]!;
    expect(p.means.find((m) => m.rank === 1)!.variety).toBe(earliest.variety);
    expect(sheet.ranking[0]!.variety).toBe(earliest.variety);
  });

  it('downloads plot values with the fertilizer column that the analyze command reads back to the same numbers', () => {
    return request(t.app)
      .get(`/api/results/${SPLIT_PLOT_SLUG}/v/1/plots.csv?trait=${TRAIT}`)
      .then((res) => {
        expect(res.status).toBe(200);
        const csv = res.text;
        expect(csv.split('\n')[0]).toBe('trait,unit,variety,Fertilizer,site,block,plot,value');
        const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-two-factor-'));
        const file = path.join(dir, 'plots.csv');
        fs.writeFileSync(file, csv);
        const run = spawnSync(
          process.execPath,
          [
            '--import',
            'tsx',
            'server/analysis/cli.ts',
            file,
            '--trait',
            'value',
            '--factor',
            'Fertilizer',
            '--split-plot',
            '--direction',
            'lower',
          ],
          { encoding: 'utf8', timeout: 60_000 },
        );
        fs.rmSync(dir, { recursive: true, force: true });
        expect(run.stderr).toBe('');
        expect(run.status).toBe(0);
        const cmd = JSON.parse(run.stdout) as TwoFactorResult;
        const p = published();
        const close = (xs: number[], ys: number[]) => {
          expect(xs).toHaveLength(ys.length);
          xs.forEach((x, i) => expect(x).toBeCloseTo(ys[i]!, 9));
        };
        expect(cmd.anova.map((l) => [l.source, l.df, l.testedAgainst])).toEqual(
          p.anova.map((l) => [l.source, l.df, l.testedAgainst]),
        );
        close(
          cmd.anova.flatMap((l) => [l.ss, l.f ?? 0, l.p ?? 0]),
          p.anova.flatMap((l) => [l.ss, l.f ?? 0, l.p ?? 0]),
        );
        const cell = (c: { variety: string; treatment: string }) => `${c.variety}/${c.treatment}`;
        const sorted = <T extends { variety: string; treatment: string }>(cs: T[]) =>
          [...cs].sort((x, y) => cell(x).localeCompare(cell(y)));
        expect(sorted(cmd.adjustedMeans).map(cell)).toEqual(
          sorted(p.twoFactor!.cellMeans).map(cell),
        );
        close(
          sorted(cmd.adjustedMeans).flatMap((c) => [c.mean, c.se]),
          sorted(p.twoFactor!.cellMeans).flatMap((c) => [c.mean, c.se]),
        );
        close(
          cmd.treatmentMeans.flatMap((m) => [m.mean, m.se]),
          p.twoFactor!.treatmentMeans.flatMap((m) => [m.mean, m.se]),
        );
        expect(cmd.means.map((m) => [m.variety, m.group, m.rank])).toEqual(
          p.means.map((m) => [m.variety, m.group, m.rank]),
        );
      });
  }, 60_000);

  it('downloads means with the cells and the fertilizer means under the treatment’s name', async () => {
    const res = await request(t.app).get(`/api/results/${SPLIT_PLOT_SLUG}/v/1/means.csv`);
    expect(res.status).toBe(200);
    const lines = res.text.trim().split('\n');
    expect(lines[0]).toBe(
      'trait,unit,direction,means_of,variety,Fertilizer,n,mean,se,adjusted_mean,adjusted_se,group,rank,alpha,model,version,license',
    );
    const p = published();
    const d = p.decimals!.mean;
    const rows = lines.slice(1).map((l) => l.split(','));
    const kinds = rows.map((r) => r[3]);
    expect(kinds.filter((k) => k === 'entry')).toHaveLength(4);
    expect(kinds.filter((k) => k === 'entry × treatment')).toHaveLength(8);
    expect(kinds.filter((k) => k === 'treatment')).toHaveLength(2);
    for (const c of p.twoFactor!.cellMeans) {
      const row = rows.find(
        (r) => r[3] === 'entry × treatment' && r[4] === c.variety && r[5] === c.treatment,
      )!;
      expect(row.slice(6, 9)).toEqual(['4', exportNumber(c.mean, d), exportNumber(c.se, d)]);
    }
    for (const m of p.twoFactor!.treatmentMeans) {
      const row = rows.find((r) => r[3] === 'treatment' && r[5] === m.treatment)!;
      expect(row.slice(6, 9)).toEqual(['16', exportNumber(m.mean, d), exportNumber(m.se, d)]);
    }
    // The entry rows keep their rank, best (earliest) first.
    expect(rows.filter((r) => r[3] === 'entry').map((r) => r[12])).toEqual(['1', '2', '3', '4']);
  });

  it('prints the cell means, the fertilizer means and the interaction test in the PDF', async () => {
    const pdf = await request(t.app)
      .get(`/api/results/${SPLIT_PLOT_SLUG}/v/1/sheet.pdf`)
      .buffer(true)
      .parse(asBytes);
    expect(pdf.status).toBe(200);
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-two-factor-pdf-'));
    const file = path.join(dir, 'sheet.pdf');
    fs.writeFileSync(file, pdf.body as Buffer);
    const text = execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' });
    fs.rmSync(dir, { recursive: true, force: true });
    expect(text).toContain('Cell means, variety × fertilizer (± SE)');
    expect(text).toContain('Entries ranked on their means over all levels of fertilizer.');
    const line = published().anova.find((l) => l.source === 'variety:treatment')!;
    expect(line.p!).toBeLessThan(0.001);
    expect(text).toContain(`Variety × fertilizer: F(3, 18) = ${line.f!.toFixed(2)}, p < 0.001`);
    expect(text).toMatch(/Fertilizer means: none \d/);
  });

  it('exports the plot totals with each plot’s fertilizer level', async () => {
    const res = await request(t.app)
      .get(`/api/trials/${SPLIT_PLOT_SLUG}/records/export/plot-totals`)
      .set('Cookie', lead);
    expect(res.status).toBe(200);
    const lines = res.text.trim().split('\n');
    const header = lines[0]!.split(',');
    expect(header.slice(0, 6)).toEqual([
      'site',
      'plot_number',
      'block',
      'entry_code',
      'entry_name',
      'Fertilizer',
    ]);
    // The same level per plot as the published plot values (from the trial's layout).
    const levelOf = new Map(sheet.plotValues.map((v) => [v.plot, v.treatment]));
    const rows = lines.slice(1).map((l) => l.split(','));
    expect(rows).toHaveLength(32);
    for (const r of rows) expect(r[5]).toBe(levelOf.get(r[1]!));
  });
});
