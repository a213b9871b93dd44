/**
 * Field records against the real app and PostgreSQL: a retried id is one record, a stale
 * version gets 409 with what changed, growers write only at their sites, bad values are
 * refused with the field named, deletion can be undone and audited.
 */
import crypto from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, TEST_ORIGIN, type TestApp } from '../support/test-app';
import type { Caller } from './matrix/matrix-types';
import { buildMatrixWorld, type MatrixWorld } from './matrix/matrix-world';

let t: TestApp;
let w: MatrixWorld;
let scoreTraitId: string;
const today = new Date().toISOString().slice(0, 10);

beforeAll(async () => {
  t = await createTestApp();
  w = await buildMatrixWorld(t);
  scoreTraitId = (
    await t.db
      .insertInto('traits')
      .values({
        trial_id: w.trial.id,
        key: 'vigor',
        label: 'Vigor',
        quantity_kind: 'score',
        basis: 'plot',
        direction: 'higher',
        scale_min: 1,
        scale_max: 5,
      })
      .returning('id')
      .executeTakeFirstOrThrow()
  ).id;
}, 60_000);
afterAll(async () => {
  await t.close();
});

const as = (caller: Caller) => {
  const cookie = w.cookies[caller];
  const wrap = (r: request.Test) => {
    const withOrigin = r.set('Origin', TEST_ORIGIN);
    return cookie ? withOrigin.set('Cookie', cookie) : withOrigin;
  };
  return {
    get: (url: string) => wrap(request(t.app).get(url)),
    post: (url: string, body?: object) => wrap(request(t.app).post(url)).send(body),
    patch: (url: string, body: object) => wrap(request(t.app).patch(url)).send(body),
    put: (url: string, body: object) => wrap(request(t.app).put(url)).send(body),
    delete: (url: string) => wrap(request(t.app).delete(url)),
  };
};
const api = (path: string) => `/api/trials/${w.trial.slug}${path}`;
const harvest = (over: Record<string, unknown> = {}) => ({
  id: crypto.randomUUID(),
  plotId: w.plotA,
  harvestedOn: today,
  fruitCount: 6,
  massG: 84.2,
  grade: 'marketable',
  ...over,
});
const countRows = async (table: 'harvests' | 'observations' | 'field_events', id: string) =>
  Number(
    (
      await t.db
        .selectFrom(table)
        .select((eb) => eb.fn.countAll().as('n'))
        .where('id', '=', id)
        .executeTakeFirstOrThrow()
    ).n,
  );

describe('a retried record is the same record', () => {
  it('answers 201 then 200 for the same client-made id, and stores one row', async () => {
    const body = harvest();
    const first = await as('growerInSite').post(api('/harvests'), body);
    expect(first.status).toBe(201);
    expect(first.body).toMatchObject({ id: body.id, fruitCount: 6, massG: 84.2, version: 1 });
    const again = await as('growerInSite').post(api('/harvests'), body);
    expect(again.status).toBe(200);
    expect(again.body.id).toBe(body.id);
    expect(await countRows('harvests', body.id)).toBe(1);
    const audit = await t.db
      .selectFrom('audit_log')
      .select('action')
      .where('record_id', '=', body.id)
      .execute();
    expect(audit.map((a) => a.action)).toEqual(['create']);
  });

  it('refuses an id already used for a record of another plot (409)', async () => {
    const body = harvest();
    expect((await as('lead').post(api('/harvests'), body)).status).toBe(201);
    const res = await as('lead').post(api('/harvests'), { ...body, plotId: w.plotB });
    expect(res.status).toBe(409);
    expect(res.body.error.details.fields[0].path).toBe('body.id');
  });

  it('sends 20 concurrent copies of one observation and keeps one', async () => {
    const body = {
      id: crypto.randomUUID(),
      plotId: w.plotA,
      traitId: w.traitId,
      observedOn: today,
      value: 812,
      plantNumber: 3,
    };
    const answers = await Promise.all(
      Array.from({ length: 20 }, () => as('lead').post(api('/observations'), body)),
    );
    expect(answers.filter((a) => a.status === 201)).toHaveLength(1);
    expect(answers.filter((a) => a.status === 200)).toHaveLength(19);
    expect(await countRows('observations', body.id)).toBe(1);
  });
});

describe('two people editing the same record', () => {
  it('gives the second save a 409 with the stored record and the fields that changed', async () => {
    const body = harvest({ fruitCount: 5, massG: 70 });
    await as('growerInSite').post(api('/harvests'), body);
    // Both read version 1; the lead saves first.
    const lead = await as('lead').patch(api(`/harvests/${body.id}`), { version: 1, massG: 75.5 });
    expect(lead.status).toBe(200);
    expect(lead.body).toMatchObject({ version: 2, massG: 75.5, fruitCount: 5 });
    const grower = await as('growerInSite').patch(api(`/harvests/${body.id}`), {
      version: 1,
      fruitCount: 7,
    });
    expect(grower.status).toBe(409);
    expect(grower.body.error.code).toBe('conflict');
    expect(grower.body.error.details).toMatchObject({
      changedFields: ['massG'],
      yourVersion: 1,
      currentVersion: 2,
      current: { massG: 75.5, fruitCount: 5, version: 2 },
    });
    const stored = await t.db
      .selectFrom('harvests')
      .selectAll()
      .where('id', '=', body.id)
      .executeTakeFirstOrThrow();
    expect(stored).toMatchObject({ fruit_count: 5, mass_g: 75.5, version: 2 });
    // Saving again from the current version goes through.
    const retry = await as('growerInSite').patch(api(`/harvests/${body.id}`), {
      version: 2,
      fruitCount: 7,
    });
    expect(retry.status).toBe(200);
    expect(retry.body).toMatchObject({ version: 3, fruitCount: 7, massG: 75.5 });
  });
});

describe('growers write only at their own sites', () => {
  it('refuses a grower limited to site A at site B (403), for every kind of record', async () => {
    const g = as('growerInSite');
    const refused = [
      await g.post(api('/harvests'), harvest({ plotId: w.plotB })),
      await g.post(api('/observations'), {
        id: crypto.randomUUID(),
        plotId: w.plotB,
        traitId: w.traitId,
        observedOn: today,
        value: 500,
      }),
      await g.post(api('/field-events'), {
        id: crypto.randomUUID(),
        siteId: w.siteB,
        kind: 'rainfall',
        occurredOn: today,
        rainMm: 4,
      }),
      await g.put(api(`/records/plots/${w.plotB}/stand-count`), { plantsSurviving: 4 }),
      await g.post(api('/records/import'), {
        kind: 'harvests',
        csv: `site,plot_number,harvested_on,fruit_count,mass_g,grade\nSite B,101,${today},1,10,cull\n`,
      }),
    ];
    expect(refused.map((r) => r.status)).toEqual([403, 403, 403, 403, 403]);
    const rowsAtB = await t.db
      .selectFrom('harvests')
      .select((eb) => eb.fn.countAll().as('n'))
      .where('plot_id', '=', w.plotB)
      .executeTakeFirstOrThrow();
    expect(Number(rowsAtB.n)).toBe(
      // only the lead's record from the id-conflict test exists there? no: that one was refused
      0,
    );
  });

  it('lets the same grower edit nothing at site B either', async () => {
    const body = harvest({ plotId: w.plotB });
    expect((await as('lead').post(api('/harvests'), body)).status).toBe(201);
    const g = as('growerInSite');
    expect((await g.patch(api(`/harvests/${body.id}`), { version: 1, massG: 1 })).status).toBe(403);
    expect((await g.delete(api(`/harvests/${body.id}`))).status).toBe(403);
    await as('lead').delete(api(`/harvests/${body.id}`));
  });
});

describe('bad values are refused with the field named, and nothing is stored', () => {
  it.each([
    ['a negative mass', { massG: -3 }, 'body.massG', 'Mass cannot be negative.'],
    [
      'a date in the future',
      { harvestedOn: '2099-07-01' },
      'body.harvestedOn',
      'The date is in the future.',
    ],
    [
      'a non-number',
      { fruitCount: 'twelve' },
      'body.fruitCount',
      'Fruit count must be a whole number.',
    ],
    [
      'a fractional count',
      { fruitCount: 2.5 },
      'body.fruitCount',
      'Fruit count must be a whole number.',
    ],
    ['an unknown grade', { grade: 'seconds' }, 'body.grade', 'Choose marketable or cull.'],
  ])('%s', async (_name, over, path, message) => {
    const body = harvest(over);
    const res = await as('lead').post(api('/harvests'), body);
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields).toContainEqual({ path, message });
    expect(await countRows('harvests', body.id)).toBe(0);
  });

  it('a plot of another trial or none at all', async () => {
    const body = harvest({ plotId: crypto.randomUUID() });
    const res = await as('lead').post(api('/harvests'), body);
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields).toEqual([
      { path: 'body.plotId', message: 'This plot is not in the trial.' },
    ]);
  });

  it('a score outside the trait scale, and a length given as a date', async () => {
    const score = await as('lead').post(api('/observations'), {
      id: crypto.randomUUID(),
      plotId: w.plotA,
      traitId: scoreTraitId,
      observedOn: today,
      value: 7,
    });
    expect(score.status).toBe(400);
    expect(score.body.error.details.fields).toEqual([
      { path: 'body.value', message: 'Vigor is scored from 1 to 5.' },
    ]);
    const dated = await as('lead').post(api('/observations'), {
      id: crypto.randomUUID(),
      plotId: w.plotA,
      traitId: w.traitId,
      observedOn: today,
      valueDate: today,
    });
    expect(dated.status).toBe(400);
    expect(dated.body.error.details.fields[0].path).toBe('body.value');
  });

  it('an irrigation without what its depth is computed from', async () => {
    const res = await as('lead').post(api('/field-events'), {
      id: crypto.randomUUID(),
      siteId: w.siteA,
      kind: 'irrigation',
      occurredOn: today,
      irrigationMethod: 'drip',
      runTimeMin: 60,
    });
    expect(res.status).toBe(400);
    const paths = res.body.error.details.fields.map((f: { path: string }) => f.path);
    expect(paths).toEqual(
      expect.arrayContaining(['body.wettedWidthMm', 'body.dripEmitterFlowLPerH']),
    );
  });

  it('a stand count above the plants set', async () => {
    await t.db.updateTable('plots').set({ plants_set: 10 }).where('id', '=', w.plotA).execute();
    const res = await as('lead').put(api(`/records/plots/${w.plotA}/stand-count`), {
      plantsSurviving: 11,
    });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields[0]).toEqual({
      path: 'body.plantsSurviving',
      message: 'The plot was set with 10 plants; the stand cannot be more.',
    });
    const ok = await as('growerInSite').put(api(`/records/plots/${w.plotA}/stand-count`), {
      plantsSurviving: 9,
    });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ plotId: w.plotA, plantsSet: 10, plantsSurviving: 9 });
  });
});

describe('field events', () => {
  it('stores the depth of drip water computed from emitter flow, spacing and wetted width', async () => {
    // 2 L/h emitters every 300 mm wetting a 400 mm strip: 2 / (0.3 × 0.4) = 16.67 mm/h, so
    // 45 minutes apply 12.5 mm (1 L over 1 m² = 1 mm).
    const body = {
      id: crypto.randomUUID(),
      siteId: w.siteA,
      kind: 'irrigation',
      occurredOn: today,
      irrigationMethod: 'drip',
      runTimeMin: 45,
      dripEmitterFlowLPerH: 2,
      dripEmitterSpacingMm: 300,
      wettedWidthMm: 400,
      sprinklerRateMmPerH: 99, // not drip: not stored
    };
    const res = await as('growerInSite').post(api('/field-events'), body);
    expect(res.status).toBe(201);
    expect(res.body.waterDepthMm).toBeCloseTo(12.5, 10);
    expect(res.body.sprinklerRateMmPerH).toBeNull();
    const patched = await as('growerInSite').patch(api(`/field-events/${body.id}`), {
      version: 1,
      occurredOn: today,
      irrigationMethod: 'drip',
      runTimeMin: 90,
      dripEmitterFlowLPerH: 2,
      dripEmitterSpacingMm: 300,
      wettedWidthMm: 400,
    });
    expect(patched.status).toBe(200);
    expect(patched.body.waterDepthMm).toBeCloseTo(25, 10);
  });

  it('records "none applied" for fertilizer, and lets a contributor write a note but not rain', async () => {
    const none = await as('lead').post(api('/field-events'), {
      id: crypto.randomUUID(),
      siteId: w.siteB,
      kind: 'fertilizer',
      occurredOn: today,
      noneApplied: true,
    });
    expect(none.status).toBe(201);
    expect(none.body).toMatchObject({ noneApplied: true, amendmentKind: null, rateGPerM2: null });
    const note = await as('contributor').post(api('/field-events'), {
      id: crypto.randomUUID(),
      siteId: w.siteA,
      plotId: w.plotA,
      kind: 'note',
      occurredOn: today,
      note: 'Pods on plot 101 curling at the tip.',
    });
    expect(note.status).toBe(201);
    const rain = await as('contributor').post(api('/field-events'), {
      id: crypto.randomUUID(),
      siteId: w.siteA,
      kind: 'rainfall',
      occurredOn: today,
      rainMm: 3,
    });
    expect(rain.status).toBe(403);
  });
});

describe('delete, undo, audit and the lead restore', () => {
  it('audits create, update, delete and restore with before and after values', async () => {
    const body = harvest({ fruitCount: 2, massG: 30 });
    await as('growerInSite').post(api('/harvests'), body);
    await as('growerInSite').patch(api(`/harvests/${body.id}`), { version: 1, grade: 'cull' });
    const deleted = await as('growerInSite').delete(api(`/harvests/${body.id}`));
    expect(deleted.status).toBe(200);
    expect(deleted.body.deletedAt).not.toBeNull();
    const list = await as('lead').get(api('/harvests'));
    expect(list.body.harvests.map((h: { id: string }) => h.id)).not.toContain(body.id);

    // Someone else cannot undo it; the person who deleted it can, straight away.
    const other = await as('admin').post(api(`/harvests/${body.id}/undo-delete`));
    expect(other.status).toBe(403);
    const undo = await as('growerInSite').post(api(`/harvests/${body.id}/undo-delete`));
    expect(undo.status).toBe(200);
    expect(undo.body.deletedAt).toBeNull();

    // Deleted again, and the undo window long past: only the lead restores it.
    await as('growerInSite').delete(api(`/harvests/${body.id}`));
    await t.db
      .updateTable('audit_log')
      .set({ at: new Date(Date.now() - 60 * 60 * 1000) })
      .where('record_id', '=', body.id)
      .where('action', '=', 'delete')
      .execute();
    expect((await as('growerInSite').post(api(`/harvests/${body.id}/undo-delete`))).status).toBe(
      403,
    );
    const log = await as('lead').get(api(`/audit?recordId=${body.id}`));
    expect(log.status).toBe(200);
    const entries = log.body.entries as {
      action: string;
      actorName: string;
      changedFields: string[];
      before: Record<string, unknown> | null;
      after: Record<string, unknown>;
      restorable: boolean;
    }[];
    expect(entries.map((e) => e.action)).toEqual([
      'delete',
      'restore',
      'delete',
      'update',
      'create',
    ]);
    expect(entries.map((e) => e.actorName)).toEqual([
      'Gil In-site',
      'Gil In-site',
      'Gil In-site',
      'Gil In-site',
      'Gil In-site',
    ]);
    expect(entries[3]).toMatchObject({
      changedFields: ['grade'],
      before: { grade: 'marketable', fruitCount: 2, massG: 30 },
      after: { grade: 'cull', fruitCount: 2, massG: 30 },
    });
    expect(entries[4]!.before).toBeNull();
    expect(entries.map((e) => e.restorable)).toEqual([true, false, false, false, false]);

    expect(
      (
        await as('growerInSite').post(api('/audit/restore'), {
          table: 'harvests',
          recordId: body.id,
        })
      ).status,
    ).toBe(403);
    const restored = await as('lead').post(api('/audit/restore'), {
      table: 'harvests',
      recordId: body.id,
    });
    expect(restored.status).toBe(200);
    expect(restored.body).toEqual({ table: 'harvests', recordId: body.id, version: 6 });
    const row = await t.db
      .selectFrom('harvests')
      .selectAll()
      .where('id', '=', body.id)
      .executeTakeFirstOrThrow();
    expect(row).toMatchObject({ deleted_at: null, grade: 'cull', version: 6 });
    const after = await as('lead').get(api(`/audit?recordId=${body.id}&limit=1`));
    expect(after.body.entries[0]).toMatchObject({ action: 'restore', actorName: 'Lena Lead' });
    expect(after.body.nextBeforeId).toEqual(expect.any(Number));
  });

  it('does not edit a deleted record', async () => {
    const body = harvest();
    await as('lead').post(api('/harvests'), body);
    await as('lead').delete(api(`/harvests/${body.id}`));
    const res = await as('lead').patch(api(`/harvests/${body.id}`), { version: 2, massG: 3 });
    expect(res.status).toBe(404);
  });
});

describe('the completeness of a round', () => {
  it('counts observations per plot and trait, and harvests per plot, within the dates', async () => {
    const res = await as('viewer').get(
      api(`/records/completeness?siteId=${w.siteA}&from=${today}&to=${today}`),
    );
    expect(res.status).toBe(200);
    expect(res.body.plots.map((p: { plotId: string }) => p.plotId)).toEqual([w.plotA]);
    const heights = res.body.cells.find(
      (c: { plotId: string; traitId: string }) => c.plotId === w.plotA && c.traitId === w.traitId,
    );
    expect(heights.count).toBe(1); // the one observation stored by the concurrency test
    expect(res.body.traits.map((tr: { key: string }) => tr.key)).toEqual(['plant_height', 'vigor']);
    const bad = await as('viewer').get(api(`/records/completeness?from=${today}&to=2000-01-01`));
    expect(bad.status).toBe(400);
  });
});
