// Editing a trait after it has records: name, unit, direction, basis and plausible range change
// with the audit log keeping the trait as it was; key, kind and scale stay once measurements use
// it; a published version keeps showing the old trait until the lead publishes a new one.
// Demo season (db/seed/demo-season.ts): okra plant height is a per-plant length with records.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import { seedDemo } from '../../db/seed/seed';
import { createTestApp, mintSessionCookie, TEST_ORIGIN, type TestApp } from '../support/test-app';

const SLUG = 'larkhaven-okra-2026';
let t: TestApp;
let lead: string;
let grower: string;
let heightId: string;

const get = (url: string, who = lead) => request(t.app).get(url).set('Cookie', who);
const send = (method: 'post' | 'put' | 'patch', url: string, body: object, who = lead) =>
  request(t.app)[method](url).set('Origin', TEST_ORIGIN).set('Cookie', who).send(body);
const patchHeight = (body: object, who = lead) =>
  send('patch', `/api/trials/${SLUG}/traits/${heightId}`, body, who);
const traitIdOf = async (key: string) =>
  (
    await t.db
      .selectFrom('traits as tr')
      .innerJoin('trials as t', 't.id', 'tr.trial_id')
      .select('tr.id')
      .where('t.slug', '=', SLUG)
      .where('tr.key', '=', key)
      .executeTakeFirstOrThrow()
  ).id;
const storedHeight = () =>
  t.db.selectFrom('traits').selectAll().where('id', '=', heightId).executeTakeFirstOrThrow();

beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.db);
  lead = await mintSessionCookie(
    t,
    demoAccounts.find((a) => a.key === 'lead')!,
  );
  grower = await mintSessionCookie(
    t,
    demoAccounts.find((a) => a.key === 'grower2')!,
  );
  heightId = await traitIdOf('plant_height');
}, 60_000);
afterAll(async () => {
  await t.close();
});

describe('a trait with measurements', () => {
  it('starts with the preset plausible range and no unit of its own', async () => {
    const trial = (await get(`/api/trials/${SLUG}`)).body;
    const height = trial.traits.find((x: { key: string }) => x.key === 'plant_height');
    // 20 mm to 4 m (common/trait-presets.ts; common practice, no source)
    expect(height).toMatchObject({ displayUnit: null, plausibleMin: 20, plausibleMax: 4000 });
  });

  it('takes a new name, unit, direction, basis and plausible range, and says nothing is published yet', async () => {
    const res = await patchHeight({
      label: 'Height at last harvest',
      displayUnit: 'm',
      direction: 'none',
      basis: 'plot',
      plausibleMin: 100,
      plausibleMax: 3500,
    });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ publishedVersion: null, altersPublished: false });
    expect(await storedHeight()).toMatchObject({
      label: 'Height at last harvest',
      display_unit: 'm',
      direction: 'none',
      basis: 'plot',
      plausible_min: 100,
      plausible_max: 3500,
    });
    // the trial page and the design page show the same trait
    const design = (await get(`/api/trials/${SLUG}/design`)).body;
    expect(design.traits.find((x: { id: string }) => x.id === heightId)).toMatchObject({
      label: 'Height at last harvest',
      displayUnit: 'm',
      plausibleMin: 100,
      plausibleMax: 3500,
    });
  });

  it('notes the edit in the audit log with the trait as it was and as it became', async () => {
    const res = await get(`/api/trials/${SLUG}/audit?table=traits`);
    expect(res.status).toBe(200);
    const entry = res.body.entries[0];
    expect(entry).toMatchObject({ table: 'traits', recordId: heightId, action: 'update' });
    expect(entry.before).toMatchObject({
      label: 'Plant height',
      direction: 'lower',
      basis: 'plant',
    });
    expect(entry.after).toMatchObject({ label: 'Height at last harvest', displayUnit: 'm' });
    expect(entry.changedFields).toEqual(
      expect.arrayContaining(['label', 'direction', 'basis', 'displayUnit', 'plausibleMin']),
    );
    expect(entry.restorable).toBe(false);
  });

  it('refuses a new key, kind or scale, and a switch to harvest records, changing nothing', async () => {
    const before = await storedHeight();
    for (const body of [{ key: 'height_cm' }, { quantityKind: 'count' }, { basis: 'harvest' }]) {
      const res = await patchHeight(body);
      expect(res.status, JSON.stringify(body)).toBe(409);
      expect(res.body.error.message).toMatch(/measurements already use this trait/);
    }
    expect(await storedHeight()).toEqual(before);
  });

  it('answers 400 with the field for a unit of another quantity or a range that runs backwards', async () => {
    const before = await storedHeight();
    const kg = await patchHeight({ displayUnit: 'kg' });
    expect(kg.status).toBe(400);
    expect(kg.body.error.details.fields[0].path).toBe('body.displayUnit');
    // only the minimum sent: checked against the stored maximum (3500 mm)
    const backwards = await patchHeight({ plausibleMin: 5000 });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.details.fields[0].path).toBe('body.plausibleMax');
    const both = await patchHeight({ plausibleMin: 50, plausibleMax: 10 });
    expect(both.status).toBe(400);
    expect(await storedHeight()).toEqual(before);
  });

  it('gives a score no plausible range (its scale is the rule)', async () => {
    const res = await send('patch', `/api/trials/${SLUG}/traits/${await traitIdOf('vigor')}`, {
      plausibleMin: 0,
      plausibleMax: 9,
    });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields[0].path).toBe('body.plausibleMax');
  });

  it('is the lead’s to edit: a grower is refused on the server', async () => {
    const res = await patchHeight({ label: 'Tallness' }, grower);
    expect(res.status).toBe(403);
    expect((await storedHeight()).label).toBe('Height at last harvest');
  });
});

describe('a trait on a published sheet', () => {
  const publicTrait = async (key: string, version?: number) => {
    const url = version ? `/api/results/${SLUG}/v/${version}` : `/api/results/${SLUG}`;
    const s = (await request(t.app).get(url)).body;
    return s.traits.find((x: { key: string }) => x.key === key);
  };

  beforeAll(async () => {
    const saved = await send('put', `/api/trials/${SLUG}/results-sheet`, {
      summary: '',
      methods: null,
      traits: [
        { key: 'marketable_yield', basis: 'plot', weight: 1 },
        { key: 'plant_height', basis: 'plot', weight: 1 },
      ],
      entryNotes: {},
      coverPhotos: {},
      alpha: 0.05,
      letters: 'hsd',
      license: 'CC-BY-4.0',
    });
    expect(saved.status).toBe(200);
    const pub = await send('post', `/api/trials/${SLUG}/results-sheet/publish`, { changeNote: '' });
    expect(pub.status).toBe(201);
  });

  it('publishes the lead’s unit with the trait', async () => {
    expect(await publicTrait('plant_height')).toMatchObject({
      label: 'Height at last harvest',
      unit: 'mm',
      displayUnit: 'm',
      direction: 'none',
    });
  });

  it('keeps the published version as it was after an edit that changes what it shows, and says a new version is needed', async () => {
    const res = await patchHeight({ direction: 'lower', label: 'Plant height' });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ publishedVersion: 1, altersPublished: true });
    const shown = await publicTrait('plant_height');
    expect(shown).toMatchObject({ label: 'Height at last harvest', direction: 'none' });
    expect(shown.means.every((m: { rank: number | null }) => m.rank === null)).toBe(true);

    const pub = await send('post', `/api/trials/${SLUG}/results-sheet/publish`, {
      changeNote: 'Plant height ranked, shortest first.',
    });
    expect(pub.status).toBe(201);
    const v2 = await publicTrait('plant_height', 2);
    expect(v2).toMatchObject({ label: 'Plant height', direction: 'lower' });
    expect(v2.means[0].rank).toBe(1);
    // lower is better: the first-ranked mean is the smallest
    const means = v2.means.map((m: { mean: number }) => m.mean);
    expect(means[0]).toBe(Math.min(...means));
    expect((await publicTrait('plant_height', 1)).direction).toBe('none');
  });

  it('does not ask for a new version when only the plausible range changes', async () => {
    const res = await patchHeight({ plausibleMin: 20, plausibleMax: 4000 });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ publishedVersion: 2, altersPublished: false });
  });

  it('carries a new key into the saved sheet, so the next version still shows the trait', async () => {
    // harvest traits have no measurements of their own, so their key can still change
    const yieldId = await traitIdOf('marketable_yield');
    const res = await send('patch', `/api/trials/${SLUG}/traits/${yieldId}`, {
      key: 'marketable_mass',
    });
    expect(res.status).toBe(200);
    expect(res.body.altersPublished).toBe(true);
    const draft = (await get(`/api/trials/${SLUG}/results-sheet`)).body;
    expect(draft.traits.map((x: { key: string }) => x.key)).toEqual([
      'marketable_mass',
      'plant_height',
    ]);
  });
});
