/**
 * A published results sheet names each entry's register variety, so readers can open the
 * variety's page from it: new versions keep the variety at publishing; versions published before
 * the field existed get it from the entry's register link when read, their stored row unchanged.
 * The variety's page answers anyone signed out for what the published version shows.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PUBLISHED_SLUG, publishDemoSheet } from '../../db/seed/demo-sheet';
import { seedDemo } from '../../db/seed/seed';
import { createTestApp, type TestApp } from '../support/test-app';

let t: TestApp;
let trialId: string;
/** Entry id → the slug of the variety it is linked to in the register, read from the tables. */
let linked: Map<string, string | null>;

beforeAll(async () => {
  t = await createTestApp();
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
});
