import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import { seedDemo } from '../../db/seed/seed';
import { analyzeCsv } from '../../server/analysis/engine/analyze';
import { sheetTraitDecimals } from '../../common/contracts/results';
import { displayUnit } from '../../common/display-units';
import { decimalsInUnit, displayNumber } from '../../common/precision';
import { createTestApp, mintSessionCookie, TEST_ORIGIN, type TestApp } from '../support/test-app';

const SLUG = 'larkhaven-okra-2026';
let t: TestApp;
let lead: string;
let viewer: string;

/** Supertest reads a binary body (the PDF) whole. */
const asBytes = (r: request.Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  r.on('data', (c: Buffer) => chunks.push(c));
  r.on('end', () => cb(null, Buffer.concat(chunks)));
};
const account = (key: string) => demoAccounts.find((a) => a.key === key)!;
const as = (cookie: string | null) => ({
  get: (url: string) =>
    cookie ? request(t.app).get(url).set('Cookie', cookie) : request(t.app).get(url),
  send: (method: 'post' | 'put', url: string, body?: object) => {
    const r = request(t.app)[method](url).set('Origin', TEST_ORIGIN);
    return (cookie ? r.set('Cookie', cookie) : r).send(body ?? {});
  },
});

const sheet = {
  summary: 'Mossbank Long gave the most marketable pods in all three gardens.',
  methods: null,
  traits: [
    { key: 'marketable_yield', basis: 'plot', weight: 2 },
    { key: 'pod_length_at_toughness', basis: 'plot', weight: 1 },
    { key: 'plant_height', basis: 'plot', weight: 1 },
  ],
  entryNotes: {} as Record<string, string>,
  coverPhotos: {},
  alpha: 0.05,
  letters: 'hsd',
  license: 'CC-BY-4.0',
};

beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.db);
  lead = await mintSessionCookie(t, account('lead'));
  viewer = await mintSessionCookie(t, account('viewer'));
  const tc = await t.db
    .selectFrom('entries as e')
    .innerJoin('trials as t', 't.id', 'e.trial_id')
    .select('e.id')
    .where('t.slug', '=', SLUG)
    .where('e.code', '=', 'TC')
    .executeTakeFirstOrThrow();
  sheet.entryNotes[tc.id] = 'Very spiny stems: pick with gloves.';
}, 60_000);
afterAll(async () => {
  await t.close();
});

describe('the results sheet', () => {
  it('is drafted by the lead only, and refuses traits that are not the trial’s', async () => {
    expect((await as(viewer).send('put', `/api/trials/${SLUG}/results-sheet`, sheet)).status).toBe(
      403,
    );
    const bad = await as(lead).send('put', `/api/trials/${SLUG}/results-sheet`, {
      ...sheet,
      traits: [{ key: 'no_such_trait', basis: 'plot', weight: 1 }],
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fields[0]).toEqual({
      path: 'body.traits.0.key',
      message: 'The trial has no trait "no_such_trait".',
    });
    const ok = await as(lead).send('put', `/api/trials/${SLUG}/results-sheet`, sheet);
    expect(ok.status).toBe(200);
    expect(ok.body.generatedMethods).toContain(
      'Means followed by the same letter are not significantly different.',
    );
    expect(ok.body.generatedMethods).toContain(
      '6 entries of okra were compared in 3 randomized complete blocks at each of 3 sites, 54 plots',
    );
  });

  it('publishes version 1 whose ranking, means and letters equal the analysis API for the same trait and alpha', async () => {
    const pub = await as(lead).send('post', `/api/trials/${SLUG}/results-sheet/publish`, {
      changeNote: '',
    });
    expect(pub.status).toBe(201);
    expect(pub.body.version).toBe(1);
    const publicSheet = (await as(null).get(`/api/results/${SLUG}`)).body;
    // No model chosen: several sites are analysed with the mixed model, and the sheet says so.
    expect(publicSheet.model).toBe('mixed');
    for (const trait of sheet.traits) {
      const api = await as(viewer).get(
        `/api/trials/${SLUG}/analysis?trait=${trait.key}&alpha=0.05&letters=hsd&model=${publicSheet.model}`,
      );
      expect(api.status).toBe(200);
      const published = publicSheet.traits.find((x: { key: string }) => x.key === trait.key);
      expect(
        published.means.map((m: { variety: string; mean: number; group: string; rank: number }) => [
          m.variety,
          m.mean,
          m.group,
          m.rank,
        ]),
      ).toEqual(
        api.body.means.map((m: { variety: string; mean: number; group: string; rank: number }) => [
          m.variety,
          m.mean,
          m.group,
          m.rank,
        ]),
      );
      expect(published.anova).toEqual(api.body.anova);
    }
    // The engine's cross-trait ranking over the same means and weights (2, 1, 1).
    const ranking = await as(viewer).get(
      `/api/trials/${SLUG}/ranking?traits=marketable_yield,pod_length_at_toughness,plant_height&weights=2,1,1`,
    );
    expect(ranking.status).toBe(200);
    const apiOrder = [...ranking.body.entries]
      .sort((a: { indexRank: number }, b: { indexRank: number }) => a.indexRank - b.indexRank)
      .map((e: { entry: string }) => e.entry);
    expect(publicSheet.ranking.map((r: { variety: string }) => r.variety)).toEqual(apiOrder);
    // The note mentions spines: the sheet carries the caution beside it, and okra gets the general one.
    const tc = publicSheet.entries.find((e: { code: string }) => e.code === 'TC');
    expect(tc.caution).toMatch(/gloves and long sleeves/);
    expect(publicSheet.cautions[0]).toMatch(/^Spiny or irritating plants/);
    // Public pages show town or region only, and no member e-mail addresses.
    expect(JSON.stringify(publicSheet)).not.toMatch(/@larkhaven-seeds\.example/);
    expect(Object.keys(publicSheet.sites[0]).sort()).toEqual([
      'degreeDayBaseC',
      'degreeDays',
      'hotDays',
      'irrigationMethod',
      'irrigationMm',
      'name',
      'rainMm',
      'region',
      'soilTexture',
    ]);
  });

  it('keeps version 1 unchanged when records change, and publishes version 2 only with a change note', async () => {
    const before = (await as(null).get(`/api/results/${SLUG}/v/1`)).body;
    const plot = await t.db
      .selectFrom('plots as p')
      .innerJoin('trials as t', 't.id', 'p.trial_id')
      .select(['p.id', 'p.trial_id'])
      .where('t.slug', '=', SLUG)
      .executeTakeFirstOrThrow();
    await t.db
      .insertInto('harvests')
      .values({
        trial_id: plot.trial_id,
        plot_id: plot.id,
        harvested_on: '2026-09-17',
        fruit_count: 400,
        mass_g: 6000,
        grade: 'marketable',
      })
      .execute();
    expect((await as(null).get(`/api/results/${SLUG}/v/1`)).body).toEqual(before);

    const noNote = await as(lead).send('post', `/api/trials/${SLUG}/results-sheet/publish`, {
      changeNote: '',
    });
    expect(noNote.status).toBe(400);
    expect(noNote.body.error.details.fields[0].path).toBe('body.changeNote');
    const v2 = await as(lead).send('post', `/api/trials/${SLUG}/results-sheet/publish`, {
      changeNote: 'Added a late harvest from Quarry Lane.',
    });
    expect(v2.body.version).toBe(2);
    const latest = (await as(null).get(`/api/results/${SLUG}`)).body;
    expect(latest.version).toBe(2);
    expect(latest.changeNote).toBe('Added a late harvest from Quarry Lane.');
    const y1 = before.traits.find((x: { key: string }) => x.key === 'marketable_yield').grandMean;
    const y2 = latest.traits.find((x: { key: string }) => x.key === 'marketable_yield').grandMean;
    // Arithmetic: 6000 g more on one of the trial's 54 plots moves the mean plot value by 6000/54.
    expect(y2 - y1).toBeCloseTo(6000 / 54, 6);
    expect((await as(null).get(`/api/results/${SLUG}/v/1`)).body.version).toBe(1);
    const versions = (await as(null).get(`/api/results/${SLUG}/versions`)).body.versions;
    expect(versions.map((v: { version: number }) => v.version)).toEqual([2, 1]);
  });

  it('shows anonymous readers the published sheet and nothing else', async () => {
    expect((await as(null).get(`/api/trials/${SLUG}`)).status).toBe(401);
    expect((await as(null).get(`/api/trials/${SLUG}/members`)).status).toBe(401);
    expect((await as(null).get(`/api/trials/${SLUG}/analysis?trait=marketable_yield`)).status).toBe(
      401,
    );
    expect((await as(null).get(`/api/trials/${SLUG}/results-sheet`)).status).toBe(401);
    expect((await as(null).get(`/api/trials/${SLUG}/photos`)).status).toBe(401);
    // The bean trial is not published at all: it does not exist for them.
    expect((await as(null).get('/api/results/fennick-bush-beans-2026')).status).toBe(404);
  });

  it('makes a PDF whose text lists the entries in ranked order', async () => {
    const res = await as(null)
      .get(`/api/results/${SLUG}/v/2/sheet.pdf?size=letter`)
      .buffer(true)
      .parse(asBytes);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-pdf-')), 'sheet.pdf');
    fs.writeFileSync(file, res.body as Buffer);
    // Debian's poppler-utils reads the text back.
    const text = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
    const sheet2 = (await as(null).get(`/api/results/${SLUG}/v/2`)).body;
    const ranked = sheet2.ranking.map((r: { variety: string }) => r.variety);
    const block = text.slice(text.indexOf('Ranking across traits'));
    const positions = ranked.map((v: string) => block.indexOf(`. ${v}`));
    expect(positions.every((p: number) => p > 0)).toBe(true);
    expect([...positions].sort((a, b) => a - b)).toEqual(positions);
    expect(text).toContain('Means followed by the same letter are not significantly different.');
    // Symbols outside the standard PDF fonts are spelled out rather than garbled.
    expect(text).toContain('(alpha = 0.05)');
    // Each trait in the same display unit as the web sheet (common/display-units.ts), its
    // grand mean scaled by that unit's exact factor (1 kg = 1000 g, NIST Handbook 44 App. C).
    for (const t of sheet2.traits) {
      const u = displayUnit(t.unit, 'metric', t.grandMean, t.displayUnit);
      const heading = `${t.label}${u.label ? ` (${u.label})` : ''}, `;
      expect(text).toContain(heading);
      const d = decimalsInUnit(sheetTraitDecimals(sheet2, t).mean, u.factor);
      expect(text).toContain(
        `Grand mean ${displayNumber(t.grandMean * u.factor, d)}${u.label ? ` ${u.label}` : ''};`,
      );
    }
    expect(text).not.toMatch(/ count\b.*±|\(count\)/);
  });

  it('exports plot values that re-import to the same numbers', async () => {
    const csv = (await as(null).get(`/api/results/${SLUG}/v/2/plots.csv?trait=marketable_yield`))
      .text;
    expect(csv.split('\n')[0]).toBe('trait,unit,variety,site,block,plot,value');
    const published = (await as(null).get(`/api/results/${SLUG}/v/2`)).body.traits.find(
      (x: { key: string }) => x.key === 'marketable_yield',
    );
    const result = analyzeCsv(csv, { trait: 'value', design: 'multisite', model: published.model });
    expect(result.means.map((m) => [m.variety, m.mean, m.group])).toEqual(
      published.means.map((m: { variety: string; mean: number; group: string }) => [
        m.variety,
        m.mean,
        m.group,
      ]),
    );
    expect(result.anova.find((l) => l.source === 'variety')!.f).toBeCloseTo(
      published.anova.find((l: { source: string }) => l.source === 'variety').f,
      10,
    );
    const means = (await as(null).get(`/api/results/${SLUG}/v/2/means.csv`)).text;
    expect(means.split('\n')[0]).toBe(
      'trait,unit,direction,variety,n,mean,se,adjusted_mean,adjusted_se,group,rank,alpha,model,version,license',
    );
    expect(means).toContain('CC-BY-4.0');
  });

  it('lets readers follow by e-mail: confirm, get the publish mail, unsubscribe in one click', async () => {
    const email = 'reader@seed-swap.example';
    expect(
      (await as(null).send('post', `/api/results/${SLUG}/followers`, { email: 'not-an-address' }))
        .status,
    ).toBe(400);
    expect((await as(null).send('post', `/api/results/${SLUG}/followers`, { email })).status).toBe(
      202,
    );
    const confirmMail = await t.mailbox.waitFor(
      (m) => m.to.includes(email) && m.subject.startsWith('Confirm'),
    );
    const confirmLink = confirmMail.links.find((l) => l.includes('/follow?token='))!;
    const token = new URL(confirmLink).searchParams.get('token')!;
    // Not confirmed yet: a publish now sends nothing to this address.
    const confirmed = await as(null).send('post', '/api/results/followers/confirm', { token });
    expect(confirmed.status).toBe(200);
    expect(confirmed.body).toEqual({
      title: 'Larkhaven heirloom okra, three gardens',
      slug: SLUG,
      email,
    });

    await as(lead).send('post', `/api/trials/${SLUG}/results-sheet/publish`, {
      changeNote: 'Corrected a plot label.',
    });
    const news = await t.mailbox.waitFor(
      (m) => m.to.includes(email) && m.subject.includes('version 3'),
    );
    expect(news.text).toContain('What changed: Corrected a plot label.');
    expect(news.links.some((l) => l.endsWith(`/r/${SLUG}/v/3`))).toBe(true);
    const unsubscribePage = news.links.find((l) => l.includes('/unsubscribe?token='))!;
    // One-click unsubscribe in mail clients that offer it (RFC 8058): a POST to the header's address.
    expect(news.headers['list-unsubscribe-post']).toBe('List-Unsubscribe=One-Click');
    expect(news.headers['list-unsubscribe']).toMatch(
      /^<http:\/\/127\.0\.0\.1:3999\/api\/results\/unsubscribe\?token=[A-Za-z0-9_-]{43}>$/,
    );
    expect(news.html).not.toMatch(/<img/i);

    const u = new URL(unsubscribePage).searchParams.get('token')!;
    const gone = await as(null).send('post', `/api/results/unsubscribe?token=${u}`);
    expect(gone.status).toBe(200);
    await as(lead).send('post', `/api/trials/${SLUG}/results-sheet/publish`, {
      changeNote: 'Another correction.',
    });
    await t.mailSettled();
    expect(
      t.mailbox.messages().filter((m) => m.to.includes(email) && m.subject.includes('version 4')),
    ).toEqual([]);
  });

  it('hides the sheet when unpublished and shows it again when published', async () => {
    expect(
      (await as(lead).send('post', `/api/trials/${SLUG}/results-sheet/unpublish`)).status,
    ).toBe(204);
    expect((await as(null).get(`/api/results/${SLUG}`)).status).toBe(404);
    expect((await as(null).get(`/api/results/${SLUG}/v/1`)).status).toBe(404);
    expect(
      (await as(lead).send('post', `/api/trials/${SLUG}/results-sheet/unpublish`)).status,
    ).toBe(409);
    await as(lead).send('post', `/api/trials/${SLUG}/results-sheet/publish`, {
      changeNote: 'Back online.',
    });
    expect((await as(null).get(`/api/results/${SLUG}/v/1`)).status).toBe(200);
  });

  it('answers a reader who has the version with 304 by its strong ETag, never after it changed', async () => {
    // Conditional requests: RFC 9110 §8.8.3 (strong ETag) and §13.1.2 (If-None-Match).
    const first = await as(null).get(`/api/results/${SLUG}`);
    expect(first.status).toBe(200);
    const etag = first.headers.etag as string;
    expect(etag).toMatch(/^"[^"]+"$/);
    // Kept by any cache but asked again before each use (RFC 9111 §5.2.2.4), so a new version
    // or a withdrawal reaches a reader at once; the version list too.
    expect(first.headers['cache-control']).toBe('public, no-cache');
    const list = await as(null).get(`/api/results/${SLUG}/versions`);
    expect(list.headers['cache-control']).toBe('public, no-cache');
    const again = await as(null).get(`/api/results/${SLUG}`).set('If-None-Match', etag);
    expect(again.status).toBe(304);
    expect(again.text).toBe('');
    // The same version at its own address has the same tag; an older one has another.
    const same = await as(null).get(`/api/results/${SLUG}/v/${first.body.version}`);
    expect(same.headers.etag).toBe(etag);
    expect(same.headers['cache-control']).toBe('public, no-cache');
    expect(same.body).toEqual(first.body);
    const older = await as(null).get(`/api/results/${SLUG}/v/1`);
    expect(older.headers.etag).not.toBe(etag);
    // supertest asks for gzip; a reader who refuses it (identity, or gzip;q=0: RFC 9110 §12.5.3)
    // gets the same JSON unencoded, under a tag of its own (§8.8.3: one per representation).
    expect(first.headers['content-encoding']).toBe('gzip');
    for (const refusing of ['identity', 'gzip;q=0, identity']) {
      const plain = await as(null).get(`/api/results/${SLUG}`).set('Accept-Encoding', refusing);
      expect(plain.headers['content-encoding']).toBeUndefined();
      expect(plain.headers.etag).toMatch(/^"[^"]+"$/);
      expect(plain.headers.etag).not.toBe(etag);
      expect(plain.body).toEqual(first.body);
    }

    await as(lead).send('post', `/api/trials/${SLUG}/results-sheet/publish`, {
      changeNote: 'One more picking added.',
    });
    const next = await as(null).get(`/api/results/${SLUG}`).set('If-None-Match', etag);
    expect(next.status).toBe(200);
    expect(next.body.version).toBe(first.body.version + 1);
    expect(next.headers.etag).not.toBe(etag);

    await as(lead).send('post', `/api/trials/${SLUG}/results-sheet/unpublish`);
    const hidden = await as(null)
      .get(`/api/results/${SLUG}`)
      .set('If-None-Match', next.headers.etag as string);
    expect(hidden.status).toBe(404);
    await as(lead).send('post', `/api/trials/${SLUG}/results-sheet/publish`, {
      changeNote: 'Back online again.',
    });
  });

  it('serves the photos a version names to anyone, and no others', async () => {
    const sharp = (await import('sharp')).default;
    const contributor = await mintSessionCookie(t, account('contributor'));
    const entry = await t.db
      .selectFrom('entries as e')
      .innerJoin('trials as t', 't.id', 'e.trial_id')
      .select('e.id')
      .where('t.slug', '=', SLUG)
      .where('e.code', '=', 'ML')
      .executeTakeFirstOrThrow();
    const image = await sharp({
      create: { width: 800, height: 600, channels: 3, background: '#4a8a57' },
    })
      .jpeg()
      .toBuffer();
    const upload = async (caption: string) => {
      const res = await request(t.app)
        .post(`/api/trials/${SLUG}/photos`)
        .set('Origin', TEST_ORIGIN)
        .set('Cookie', contributor)
        .field('caption', caption)
        .field('entryId', entry.id)
        .attach('photo', image, { filename: 'pods.jpg', contentType: 'image/jpeg' });
      expect(res.status, res.text).toBe(201);
      return res.body.photos[0].id as string;
    };
    const chosen = await upload('Mossbank Long pods at first harvest');
    const other = await upload('Another Mossbank Long plant');
    const save = await as(lead).send('put', `/api/trials/${SLUG}/results-sheet`, {
      ...sheet,
      coverPhotos: { [entry.id]: chosen },
    });
    expect(save.status).toBe(200);
    const v = (
      await as(lead).send('post', `/api/trials/${SLUG}/results-sheet/publish`, {
        changeNote: 'Added a photo.',
      })
    ).body.version;
    const snap = (await as(null).get(`/api/results/${SLUG}/v/${v}`)).body;
    expect(snap.entries.find((e: { code: string }) => e.code === 'ML').photo).toMatchObject({
      id: chosen,
      caption: 'Mossbank Long pods at first harvest',
    });
    const served = await as(null).get(`/api/results/${SLUG}/v/${v}/photos/${chosen}/display`);
    expect(served.status).toBe(200);
    expect(served.headers['content-type']).toBe('image/webp');
    expect(served.headers['cache-control']).toBe('public, max-age=86400');
    expect((await as(null).get(`/api/results/${SLUG}/v/${v}/photos/${other}/display`)).status).toBe(
      404,
    );
    // The PDF of that version carries the photo (poppler's pdfimages lists the embedded images).
    const pdf = await as(null)
      .get(`/api/results/${SLUG}/v/${v}/sheet.pdf`)
      .buffer(true)
      .parse(asBytes);
    const pdfFile = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-pdf-')), 'photo.pdf');
    fs.writeFileSync(pdfFile, pdf.body as Buffer);
    const images = execFileSync('pdfimages', ['-list', pdfFile], { encoding: 'utf8' })
      .trim()
      .split('\n')
      .slice(2);
    expect(images).toHaveLength(1);
    expect(execFileSync('pdftotext', [pdfFile, '-'], { encoding: 'utf8' })).toContain(
      'Mossbank Long pods at first harvest',
    );
    // Not in an earlier version either.
    expect((await as(null).get(`/api/results/${SLUG}/v/1/photos/${chosen}/display`)).status).toBe(
      404,
    );
    // And the unpublished trial's photo stays private at its own address.
    expect((await as(null).get(`/api/trials/${SLUG}/photos/${other}/display`)).status).toBe(401);
  });

  it('publishes the model the lead chose and shows it in the JSON, the means CSV and the PDF; a trial without blocks refuses the mixed model', async () => {
    const saved = await as(lead).send('put', `/api/trials/${SLUG}/results-sheet`, {
      ...sheet,
      model: 'anova',
    });
    expect(saved.status).toBe(200);
    expect(saved.body.model).toBe('anova');
    expect(saved.body.generatedMethods).toContain('analysed by analysis of variance');
    const pub = await as(lead).send('post', `/api/trials/${SLUG}/results-sheet/publish`, {
      changeNote: 'Classical analysis of variance, as last season.',
    });
    expect(pub.status).toBe(201);
    const v = pub.body.version as number;
    const classical = (await as(null).get(`/api/results/${SLUG}/v/${v}`)).body;
    expect(classical.model).toBe('anova');
    const yieldTrait = classical.traits.find((x: { key: string }) => x.key === 'marketable_yield');
    expect(yieldTrait.model).toBe('anova');
    expect(yieldTrait.varianceComponents).toBeUndefined();
    const api = await as(viewer).get(
      `/api/trials/${SLUG}/analysis?trait=marketable_yield&model=anova`,
    );
    expect(yieldTrait.means.map((m: { group: string }) => m.group)).toEqual(
      api.body.means.map((m: { group: string }) => m.group),
    );
    const csv = (await as(null).get(`/api/results/${SLUG}/v/${v}/means.csv`)).text;
    expect(csv.split('\n')[1]).toMatch(/,0\.05,anova,/);

    // The version before it (no model chosen, several sites) used the mixed model: its
    // variance components and variety test are stored, and the PDF says which model it was.
    const mixed = (await as(null).get(`/api/results/${SLUG}/v/${v - 1}`)).body;
    const mixedYield = mixed.traits.find((x: { key: string }) => x.key === 'marketable_yield');
    expect(mixedYield.model).toBe('mixed');
    expect(mixedYield.fixedTest.method).toBe('satterthwaite');
    expect(mixedYield.varianceComponents.map((c: { source: string }) => c.source)).toContain(
      'site',
    );
    expect((await as(null).get(`/api/results/${SLUG}/v/${v - 1}/means.csv`)).text).toContain(
      ',0.05,mixed,',
    );
    const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-pdf-')), 'sheet.pdf');
    for (const [version, words] of [
      [v, 'Analysis: Classical analysis of variance'],
      [v - 1, 'Analysis: Mixed model (REML)'],
    ] as const) {
      const pdf = await as(null)
        .get(`/api/results/${SLUG}/v/${version}/sheet.pdf`)
        .buffer(true)
        .parse(asBytes);
      fs.writeFileSync(file, pdf.body as Buffer);
      expect(execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' })).toContain(words);
    }

    const crd = await as(lead).send('post', '/api/trials', {
      title: 'Okra rows at Wend Hollow',
      crop: 'Okra',
      season: '2027',
      design: 'crd',
    });
    expect(crd.status).toBe(201);
    const refused = await as(lead).send('put', `/api/trials/${crd.body.slug}/results-sheet`, {
      ...sheet,
      entryNotes: {},
      model: 'mixed',
    });
    expect(refused.status).toBe(400);
    expect(refused.body.error.details.fields).toContainEqual({
      path: 'body.model',
      message:
        'A completely randomized trial is analysed by the classical analysis of variance only.',
    });
  });

  it('refuses to change a published version even from inside the database', async () => {
    await expect(
      t.db.updateTable('result_versions').set({ change_note: 'rewritten' }).execute(),
    ).rejects.toMatchObject({ code: '23514' });
  });
});
