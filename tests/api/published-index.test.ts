/** The public index of published results sheets: newest first, searchable, paged on the server. */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from '../support/test-app';

let t: TestApp;

/** A trial with its entries and, when published, versions at the given times. */
async function trial(
  slug: string,
  crop: string,
  varieties: string[],
  status: 'active' | 'published',
  versionTimes: string[],
) {
  const row = await t.db
    .insertInto('trials')
    .values({ slug, title: `${crop} trial ${slug}`, crop, season: '2026', design: 'rcbd', status })
    .returning('id')
    .executeTakeFirstOrThrow();
  if (varieties.length)
    await t.db
      .insertInto('entries')
      .values(
        varieties.map((name, i) => ({
          trial_id: row.id,
          name,
          code: `E${i}`,
          entry_type: 'heirloom' as const,
          days_to_maturity_claimed: null,
          in_row_spacing_mm: null,
        })),
      )
      .execute();
  for (const [i, at] of versionTimes.entries())
    await t.db
      .insertInto('result_versions')
      .values({
        trial_id: row.id,
        version: i + 1,
        snapshot: JSON.stringify({}),
        published_at: new Date(at),
        change_note: i === 0 ? '' : 'Corrected a typing slip.',
        published_by: null,
      })
      .execute();
}

beforeAll(async () => {
  t = await createTestApp();
  await trial('okra-a', 'Okra', ['Mossgate Spire', 'Pell Finger'], 'published', [
    '2026-09-01T10:00:00Z',
  ]);
  // Version 2 is the newest publication of all.
  await trial('bean-b', 'Bush bean', ['Harrow Wax'], 'published', [
    '2026-08-01T10:00:00Z',
    '2026-10-05T10:00:00Z',
  ]);
  await trial('okra-c', 'Okra', ['Tallow 100% Green'], 'published', ['2026-09-20T10:00:00Z']);
  // Unpublished again (status closed) and never published: not listed.
  await trial('okra-d', 'Okra', ['Mossgate Spire'], 'active', ['2026-09-25T10:00:00Z']);
  await trial('okra-e', 'Okra', ['Pell Finger'], 'active', []);
}, 60_000);
afterAll(async () => {
  await t.close();
});

const list = (query: string) => request(t.app).get(`/api/results${query}`);

describe('GET /api/results', () => {
  it('lists published sheets only, newest publication first, to anyone', async () => {
    const res = await list('');
    expect(res.status).toBe(200);
    expect(res.body.sheets.map((s: { slug: string }) => s.slug)).toEqual([
      'bean-b',
      'okra-c',
      'okra-a',
    ]);
    expect(res.body.sheets[0]).toEqual({
      slug: 'bean-b',
      title: 'Bush bean trial bean-b',
      crop: 'Bush bean',
      season: '2026',
      version: 2,
      publishedAt: '2026-10-05T10:00:00.000Z',
      entryCount: 1,
    });
    expect(res.body).toMatchObject({ page: 1, pageSize: 20, total: 3 });
  });

  it('finds sheets by crop or by a variety’s name, ignoring case', async () => {
    const byCrop = await list('?q=OKRA');
    expect(byCrop.body.sheets.map((s: { slug: string }) => s.slug)).toEqual(['okra-c', 'okra-a']);
    const byVariety = await list('?q=harrow');
    expect(byVariety.body.sheets.map((s: { slug: string }) => s.slug)).toEqual(['bean-b']);
    expect(byVariety.body.total).toBe(1);
    // A typed % is a letter, not a wildcard.
    const percent = await list(`?q=${encodeURIComponent('100%')}`);
    expect(percent.body.sheets.map((s: { slug: string }) => s.slug)).toEqual(['okra-c']);
    expect((await list('?q=Pell%25Finger')).body.total).toBe(0);
    expect((await list('?q=nothing-like-it')).body).toMatchObject({ sheets: [], total: 0 });
  });

  it('pages on the server and keeps the order across pages', async () => {
    const pages = await Promise.all([1, 2, 3, 4].map((p) => list(`?pageSize=1&page=${p}`)));
    expect(pages.map((p) => p.body.sheets.map((s: { slug: string }) => s.slug))).toEqual([
      ['bean-b'],
      ['okra-c'],
      ['okra-a'],
      [],
    ]);
    expect(pages.every((p) => p.body.total === 3 && p.body.pageSize === 1)).toBe(true);
  });

  it('answers 400 with the field for a bad page or search', async () => {
    const res = await list('?page=0');
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields[0]).toEqual({
      path: 'query.page',
      message: 'Pages start at 1.',
    });
    expect((await list(`?q=${'x'.repeat(101)}`)).status).toBe(400);
    expect((await list('?pageSize=51')).status).toBe(400);
  });
});
