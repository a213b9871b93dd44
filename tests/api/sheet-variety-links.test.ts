/**
 * A published results sheet names each entry's register variety, so readers can open the
 * variety's page from it: new versions keep the variety at publishing; versions published before
 * the field existed get it from the entry's register link when read, their stored row unchanged.
 * The variety's page answers anyone signed out for what the published version shows.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PUBLISHED_SLUG, publishDemoSheet } from '../../db/seed/demo-sheet';
import { seedDemo } from '../../db/seed/seed';
import { createTestApp, type TestApp } from '../support/test-app';

let t: TestApp;
let builtDir: string;
let trialId: string;
/** Entry id → the slug of the variety it is linked to in the register, read from the tables. */
let linked: Map<string, string | null>;

beforeAll(async () => {
  // An app shell, and the sheet's server drawing made by the client's own SheetView (the module
  // `vite build` puts beside the client, here taken from its source), so the page is drawn as served.
  builtDir = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-sheet-links-'));
  const clientDir = path.join(builtDir, 'client');
  fs.mkdirSync(clientDir);
  fs.writeFileSync(
    path.join(clientDir, 'index.html'),
    '<!doctype html><html><head><title>Rowtally</title></head><body><div id="root"></div></body></html>',
  );
  fs.mkdirSync(path.join(builtDir, 'sheet-html'));
  const source = pathToFileURL(path.resolve('src/entry-sheet-html.tsx')).href;
  fs.writeFileSync(
    path.join(builtDir, 'sheet-html', 'entry-sheet-html.js'),
    `export { renderSheetHtml } from ${JSON.stringify(source)};\n`,
  );
  t = await createTestApp({ clientDir });
  await seedDemo(t.db);
  await publishDemoSheet(t.db);
  trialId = (
    await t.db
      .selectFrom('trials')
      .select('id')
      .where('slug', '=', DEMO_PUBLISHED_SLUG)
      .executeTakeFirstOrThrow()
  ).id;
  const rows = await t.db
    .selectFrom('entries as e')
    .leftJoin('varieties as v', 'v.id', 'e.variety_id')
    .select(['e.id', 'v.slug'])
    .where('e.trial_id', '=', trialId)
    .execute();
  linked = new Map(rows.map((r) => [r.id, r.slug]));
}, 60_000);
afterAll(async () => {
  await t.close();
  fs.rmSync(builtDir, { recursive: true, force: true });
});

type SheetEntry = { id: string; name: string; varietySlug?: string | null };

describe('the published sheet’s links to variety pages', () => {
  it('names each entry’s variety in a newly published version', async () => {
    const res = await request(t.app).get(`/api/results/${DEMO_PUBLISHED_SLUG}`);
    expect(res.status).toBe(200);
    const entries = res.body.entries as SheetEntry[];
    expect(entries.length).toBeGreaterThan(1);
    for (const e of entries) {
      expect(e.varietySlug).toBe(linked.get(e.id));
      expect(e.varietySlug).toMatch(/^[a-z0-9-]+$/);
    }
    // The stored snapshot itself carries them.
    const stored = await t.db
      .selectFrom('result_versions')
      .select('snapshot')
      .where('trial_id', '=', trialId)
      .where('version', '=', 1)
      .executeTakeFirstOrThrow();
    const storedEntries = (stored.snapshot as { entries: SheetEntry[] }).entries;
    expect(storedEntries.map((e) => e.varietySlug)).toEqual(entries.map((e) => e.varietySlug));
  });

  it('opens each linked variety’s page signed out, listing this trial', async () => {
    const res = await request(t.app).get(`/api/results/${DEMO_PUBLISHED_SLUG}/v/1`);
    const slugs = (res.body.entries as SheetEntry[]).map((e) => e.varietySlug);
    for (const slug of slugs) {
      const page = await request(t.app).get(`/api/varieties/${slug}`);
      expect(page.status).toBe(200);
      expect(page.body.variety.slug).toBe(slug);
      expect(page.body.trials.map((x: { slug: string }) => x.slug)).toContain(DEMO_PUBLISHED_SLUG);
    }
  });

  it('fills them in for a version published without them, leaving its stored row as it was', async () => {
    const v1 = await request(t.app).get(`/api/results/${DEMO_PUBLISHED_SLUG}/v/1`);
    // A version of the shape published before entries named their variety; one entry of it was
    // never linked to the register.
    const old = structuredClone(v1.body) as { version: number; entries: SheetEntry[] };
    old.version = 2;
    for (const e of old.entries) delete e.varietySlug;
    const unlinked = old.entries[0]!;
    await t.db
      .updateTable('entries')
      .set({ variety_id: null })
      .where('id', '=', unlinked.id)
      .execute();
    await t.db
      .insertInto('result_versions')
      .values({
        trial_id: trialId,
        version: 2,
        snapshot: JSON.stringify(old),
        published_at: new Date(),
        change_note: 'An earlier shape of the sheet.',
        published_by: null,
      })
      .execute();

    const res = await request(t.app).get(`/api/results/${DEMO_PUBLISHED_SLUG}/v/2`);
    expect(res.status).toBe(200);
    const entries = res.body.entries as SheetEntry[];
    expect(entries.find((e) => e.id === unlinked.id)!.varietySlug).toBeNull();
    for (const e of entries.filter((x) => x.id !== unlinked.id))
      expect(e.varietySlug).toBe(linked.get(e.id));
    // The latest version is this one too.
    expect((await request(t.app).get(`/api/results/${DEMO_PUBLISHED_SLUG}`)).body.entries).toEqual(
      entries,
    );

    const stored = await t.db
      .selectFrom('result_versions')
      .select('snapshot')
      .where('trial_id', '=', trialId)
      .where('version', '=', 2)
      .executeTakeFirstOrThrow();
    const storedEntries = (stored.snapshot as { entries: SheetEntry[] }).entries;
    expect(storedEntries.every((e) => !('varietySlug' in e))).toBe(true);
  });

  it('follows an entry relinked after such a version was read, in the API and the drawn page, with new ETags', async () => {
    const v1 = await request(t.app).get(`/api/results/${DEMO_PUBLISHED_SLUG}/v/1`);
    const old = structuredClone(v1.body) as { version: number; entries: SheetEntry[] };
    old.version = 3;
    for (const e of old.entries) delete e.varietySlug;
    await t.db
      .insertInto('result_versions')
      .values({
        trial_id: trialId,
        version: 3,
        snapshot: JSON.stringify(old),
        published_at: new Date(),
        change_note: 'Another version of the earlier shape.',
        published_by: null,
      })
      .execute();
    // Read afresh: the test before this one unlinked an entry.
    const now = new Map(
      (
        await t.db
          .selectFrom('entries as e')
          .innerJoin('varieties as v', 'v.id', 'e.variety_id')
          .select(['e.id', 'v.slug'])
          .where('e.trial_id', '=', trialId)
          .execute()
      ).map((r) => [r.id, r.slug]),
    );
    const [moved, other] = old.entries.filter((e) => now.has(e.id));
    const before = now.get(moved!.id)!;
    const after = now.get(other!.id)!;
    expect(after).not.toBe(before);
    const sheetOf = (res: request.Response) =>
      res.body as { entries: SheetEntry[]; version: number };
    const linkOf = (res: request.Response) =>
      sheetOf(res).entries.find((e) => e.id === moved!.id)!.varietySlug;
    /** The entry's link in the server's drawing (before the embedded numbers). */
    const drawnLink = (html: string) => {
      const drawn = html.slice(
        html.indexOf('id="sheet-prerender"'),
        html.indexOf('id="sheet-data"'),
      );
      expect(drawn.length).toBeGreaterThan(0);
      return [...drawn.matchAll(/href="\/varieties\/([a-z0-9-]+)"[^>]*>([^<]*)</g)]
        .filter((m) => m[2] === moved!.name)
        .map((m) => m[1]);
    };
    const embeddedLink = (html: string) =>
      (
        JSON.parse(/id="sheet-data">([^]*?)<\/script>/.exec(html)![1]!) as {
          entries: SheetEntry[];
        }
      ).entries.find((e) => e.id === moved!.id)!.varietySlug;

    const api = `/api/results/${DEMO_PUBLISHED_SLUG}/v/3`;
    const page = `/r/${DEMO_PUBLISHED_SLUG}/v/3`;
    const first = await request(t.app).get(api);
    expect(first.status).toBe(200);
    expect(linkOf(first)).toBe(before);
    const firstPage = await request(t.app).get(page);
    expect(firstPage.status).toBe(200);
    expect(drawnLink(firstPage.text)).toEqual([before]);
    expect(embeddedLink(firstPage.text)).toBe(before);
    // Read again unchanged: the reader's copy is still good.
    const again = await request(t.app).get(api).set('If-None-Match', first.headers.etag!);
    expect(again.status).toBe(304);

    // The entry is relinked to another register variety.
    const otherVariety = await t.db
      .selectFrom('entries')
      .select('variety_id')
      .where('id', '=', other!.id)
      .executeTakeFirstOrThrow();
    await t.db
      .updateTable('entries')
      .set({ variety_id: otherVariety.variety_id })
      .where('id', '=', moved!.id)
      .execute();

    const relinked = await request(t.app).get(api).set('If-None-Match', first.headers.etag!);
    expect(relinked.status).toBe(200);
    expect(relinked.headers.etag).not.toBe(first.headers.etag);
    expect(linkOf(relinked)).toBe(after);
    // Everything else of the version is as it was served before.
    const unchanged = (res: request.Response) =>
      sheetOf(res).entries.map((e) => (e.id === moved!.id ? { ...e, varietySlug: null } : e));
    expect(unchanged(relinked)).toEqual(unchanged(first));
    const latest = await request(t.app).get(`/api/results/${DEMO_PUBLISHED_SLUG}`);
    expect(sheetOf(latest).version).toBe(3);
    expect(linkOf(latest)).toBe(after);

    const relinkedPage = await request(t.app)
      .get(page)
      .set('If-None-Match', firstPage.headers.etag ?? '"none"');
    expect(relinkedPage.status).toBe(200);
    expect(relinkedPage.headers.etag).not.toBe(firstPage.headers.etag);
    expect(drawnLink(relinkedPage.text)).toEqual([after]);
    expect(embeddedLink(relinkedPage.text)).toBe(after);
    const latestPage = await request(t.app).get(`/r/${DEMO_PUBLISHED_SLUG}`);
    expect(drawnLink(latestPage.text)).toEqual([after]);
  });
});
