import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomizeLayout } from '../../common/layout';
import { EARLIER_SEASON_SEED, earlierDemoTrials } from '../../db/seed/demo-earlier-seasons';
import { DEMO_SEED, demoAccounts, demoTrials } from '../../db/seed/demo-season';
import { SPLIT_PLOT_SLUG, splitPlotVarieties } from '../../db/seed/demo-split-plot';
import { DEMO_PUBLISHED_SLUG, DEMO_VERSION_NOTE } from '../../db/seed/demo-sheet';
import { NETWORK_LAYOUT_SEED, NETWORK_SLUG, networkEntries } from '../../db/seed/demo-network';
import { seedDemoIfEmpty } from '../../db/seed/seed';
import { localStorage } from '../../server/storage/local-storage';
import { createTestApp, mintSessionCookie, type TestApp } from '../support/test-app';

let t: TestApp;
const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-demo-photos-'));
const storage = localStorage(folder);
let seeded: boolean[] = [];
beforeAll(async () => {
  t = await createTestApp();
  seeded = [await seedDemoIfEmpty(t.db, storage), await seedDemoIfEmpty(t.db, storage)];
}, 120_000);
afterAll(async () => {
  await t.close();
  fs.rmSync(folder, { recursive: true, force: true });
});

describe('the demo season', () => {
  it('loads once into an empty database, with a cover drawing per okra entry stored like an upload', async () => {
    expect(seeded).toEqual([true, false]);
    const photos = await t.db
      .selectFrom('photos as p')
      .innerJoin('entries as e', 'e.id', 'p.entry_id')
      .select(['p.storage_key', 'p.is_cover', 'e.code', 'p.caption'])
      .execute();
    expect(photos.map((p) => p.code).sort()).toEqual(['CD', 'ML', 'RS', 'SR', 'TC', 'VL']);
    expect(photos.every((p) => p.is_cover && p.caption.includes('drawing'))).toBe(true);
    const display = await storage.get(`${photos[0]!.storage_key}/display.webp`);
    const chunks: Buffer[] = [];
    for await (const c of display!.body) chunks.push(c as Buffer);
    const meta = await sharp(Buffer.concat(chunks)).metadata();
    expect(meta.format).toBe('webp');
    expect(meta.exif).toBeUndefined();
    expect(Math.max(meta.width!, meta.height!)).toBeLessThanOrEqual(1600);
  });

  it('stores each trial’s layout seed, and the plots are the plan the design page makes from it', async () => {
    const trials = await t.db
      .selectFrom('trials')
      .select([
        'id',
        'slug',
        'design',
        'replicates',
        'layout_seed',
        'layout_generated_at',
        'factor_levels',
        'factor_arrangement',
        'block_size',
      ])
      .execute();
    const earlier = earlierDemoTrials.map((d) => d.slug);
    expect(trials.map((x) => x.slug).sort()).toEqual(
      [...demoTrials.map((d) => d.slug), ...earlier, SPLIT_PLOT_SLUG, NETWORK_SLUG].sort(),
    );
    for (const trial of trials) {
      expect(trial.layout_seed).toBe(
        earlier.includes(trial.slug)
          ? EARLIER_SEASON_SEED
          : trial.slug === NETWORK_SLUG
            ? NETWORK_LAYOUT_SEED
            : DEMO_SEED,
      );
      expect(trial.layout_generated_at).toBeInstanceOf(Date);
      // The design service's order: entries by code, sites by name.
      const entries = await t.db
        .selectFrom('entries')
        .select('id')
        .where('trial_id', '=', trial.id)
        .orderBy('code')
        .execute();
      const sites = await t.db
        .selectFrom('sites')
        .select('id')
        .where('trial_id', '=', trial.id)
        .orderBy('name')
        .execute();
      const planned = randomizeLayout({
        design: trial.design,
        entryIds: entries.map((e) => e.id),
        replicates: trial.replicates!,
        siteIds: sites.map((s) => s.id),
        seed: trial.layout_seed!,
        factor:
          trial.factor_levels && trial.factor_arrangement
            ? { levels: trial.factor_levels, arrangement: trial.factor_arrangement }
            : null,
        ...(trial.block_size ? { blockSize: trial.block_size } : {}),
      });
      const stored = await t.db
        .selectFrom('plots')
        .select(['site_id', 'entry_id', 'block', 'position', 'plot_number', 'treatment'])
        .where('trial_id', '=', trial.id)
        .execute();
      const key = (p: {
        siteId: string;
        entryId: string;
        block: number;
        plotNumber: number;
        treatment: string | null;
      }) => `${p.siteId}:${p.block}:${p.plotNumber}:${p.entryId}:${p.treatment}`;
      expect(
        stored
          .map((p) =>
            key({
              siteId: p.site_id,
              entryId: p.entry_id,
              block: p.block,
              plotNumber: p.plot_number,
              treatment: p.treatment,
            }),
          )
          .sort(),
      ).toEqual(planned.map(key).sort());
    }
  });

  it('publishes the bean trial’s sheet as version 1 with a note, so the public index is not empty', async () => {
    const index = await request(t.app).get('/api/results');
    expect(index.status).toBe(200);
    expect(index.body.sheets.map((s: { slug: string }) => s.slug)).toEqual([DEMO_PUBLISHED_SLUG]);
    const versions = await request(t.app).get(`/api/results/${DEMO_PUBLISHED_SLUG}/versions`);
    expect(versions.body.versions).toEqual([
      expect.objectContaining({ version: 1, changeNote: DEMO_VERSION_NOTE }),
    ]);
    // The okra trial stays for the lead to publish.
    expect((await request(t.app).get('/api/results/larkhaven-okra-2026')).status).toBe(404);
  });

  it('ranks the sheet’s traits by their direction, as its summary says', async () => {
    const sheet = (await request(t.app).get(`/api/results/${DEMO_PUBLISHED_SLUG}`)).body as {
      summary: string;
      ranking: { variety: string }[];
      traits: {
        key: string;
        direction: string;
        means: { variety: string; mean: number; rank: number | null; group: string }[];
      }[];
    };
    const byRank = (key: string) => {
      const trait = sheet.traits.find((x) => x.key === key)!;
      return [...trait.means].sort((a, b) => a.rank! - b.rank!);
    };
    // Plant height is lower-is-better: rank 1 is the smallest mean.
    const heights = byRank('plant_height');
    expect(heights.map((m) => m.mean)).toEqual(
      [...heights.map((m) => m.mean)].sort((a, b) => a - b),
    );
    expect(heights[0]!.variety).toBe('Inkdrop Black');
    // Marketable yield is higher-is-better: rank 1 is the largest mean.
    const yields = byRank('marketable_yield');
    expect(yields.map((m) => m.mean)).toEqual([...yields.map((m) => m.mean)].sort((a, b) => b - a));
    expect(yields[0]!.variety).toBe('Marrowfield Flat');
    expect(sheet.ranking[0]!.variety).toBe('Marrowfield Flat');
    // Every pod count shares one letter group.
    const counts = sheet.traits.find((x) => x.key === 'pod_count')!.means;
    expect(new Set(counts.map((m) => m.group))).toEqual(new Set(['a']));
    expect(sheet.summary).toContain('Marrowfield Flat gave the heaviest marketable harvest');
    expect(sheet.summary).toContain('Inkdrop Black stayed the shortest');
  });

  it('has earlier seasons in the same register: okra in two seasons, a tomato trial, one variety since dropped', async () => {
    const lead = demoAccounts.find((a) => a.key === 'lead')!;
    const cookie = await mintSessionCookie(t, lead);
    const res = await request(t.app).get('/api/varieties').set('Cookie', cookie);
    expect(res.status).toBe(200);
    const bySlug = new Map(
      (
        res.body.varieties as {
          slug: string;
          crop: string;
          trialCount: number;
          seasonCount: number;
        }[]
      ).map((v) => [v.slug, v]),
    );
    // Counted from the demo's own lists: five okra varieties were grown in both seasons.
    const okra2025 = earlierDemoTrials[0]!.entries.map((e) => e.name);
    const okra2026 = demoTrials[0]!.entries.map((e) => e.name);
    const both = okra2026.filter((n) => okra2025.includes(n));
    expect(both).toHaveLength(5);
    expect(bySlug.get('velvet-lantern')).toMatchObject({ trialCount: 2, seasonCount: 2 });
    expect(bySlug.get('tallow-creek-green')).toMatchObject({ trialCount: 1, seasonCount: 1 });
    expect(bySlug.get('hollin-pink-velvet')).toMatchObject({ crop: 'Okra', trialCount: 1 });
    expect(bySlug.get('pennant-plum')).toMatchObject({ crop: 'Tomato', seasonCount: 1 });
    const entries = await t.db
      .selectFrom('entries')
      .select((eb) => eb.fn.countAll<string>().as('n'))
      .where('variety_id', 'is', null)
      .executeTakeFirstOrThrow();
    expect(Number(entries.n)).toBe(0);
    expect(res.body.varieties).toHaveLength(
      new Set([...okra2025, ...okra2026]).size +
        5 +
        5 +
        splitPlotVarieties().length +
        networkEntries.length,
    );
  });

  it('has a fertilizer × variety split plot whose analysis answers the grower’s question', async () => {
    const lead = demoAccounts.find((a) => a.key === 'lead')!;
    const cookie = await mintSessionCookie(t, lead);
    const res = await request(t.app)
      .get(`/api/trials/${SPLIT_PLOT_SLUG}/analysis?trait=days_to_first_pods`)
      .set('Cookie', cookie);
    expect(res.status).toBe(200);
    const a = res.body as import('../../common/contracts/analysis').TrialAnalysis;
    // The split plot's strata (aov with Error(block/treatment)): fertilizer against block ×
    // fertilizer, variety and the interaction against the residual.
    expect(a.anova.map((l) => [l.source, l.df, l.testedAgainst])).toEqual([
      ['block', 3, null],
      ['treatment', 1, 'block:treatment'],
      ['block:treatment', 3, null],
      ['variety', 3, 'residual'],
      ['variety:treatment', 3, 'residual'],
      ['residual', 18, null],
      ['total', 31, null],
    ]);
    expect(a.plotValues).toHaveLength(32);
    // Recorded as the date the first pods showed, analysed as days from sowing.
    expect(a.quantityKind).toBe('date');
    expect(a.unit).toBe('d');
    expect(a.valueNote).toBe('days from sowing to the recorded date, averaged per plot');
    expect(a.twoFactor).toMatchObject({
      factor: 'Fertilizer',
      levels: ['none', 'pre-plant'],
      layout: 'split-plot',
    });
    // Invented scenario: withholding fertilizer brings the heirlooms' pods days earlier, not
    // the modern variety's.
    const effect = (v: string) => a.twoFactor!.treatmentWithinVariety.find((e) => e.within === v)!;
    for (const heirloom of ['Greywater Runner', 'Mossbank Wax', 'Tansy Purple']) {
      expect(effect(heirloom)).toMatchObject({ a: 'none', b: 'pre-plant' });
      expect(effect(heirloom).difference).toBeLessThan(-2);
    }
    expect(Math.abs(effect('Corvale Prime').difference)).toBeLessThan(2);
    expect(a.anova.find((l) => l.source === 'variety:treatment')!.p).toBeLessThan(0.05);

    // The trial says it has a second factor; a split plot also takes the mixed model.
    const detail = await request(t.app).get(`/api/trials/${SPLIT_PLOT_SLUG}`).set('Cookie', cookie);
    expect(detail.body.factor).toEqual({
      name: 'Fertilizer',
      levels: ['none', 'pre-plant'],
      arrangement: 'split_plot',
    });
    const mixed = await request(t.app)
      .get(`/api/trials/${SPLIT_PLOT_SLUG}/analysis?trait=days_to_first_pods&model=mixed`)
      .set('Cookie', cookie);
    expect(mixed.status).toBe(200);
    expect(mixed.body.model).toBe('mixed');
    expect((mixed.body as typeof a).twoFactor!.fixedTests!.map((f) => f.source)).toEqual([
      'treatment',
      'variety',
      'variety:treatment',
    ]);
  });
});
