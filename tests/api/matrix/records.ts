/** Field records, import/export and the audit log: every route × every caller. */
import crypto from 'node:crypto';
import { type Caller, leadOnly, type MatrixRow, memberRead, recordWrite } from './matrix-types';
import type { MatrixWorld } from './matrix-world';

const base = (w: MatrixWorld) => `/api/trials/${w.trial.slug}`;
const today = new Date().toISOString().slice(0, 10);
type Table = 'harvests' | 'observations' | 'field_events';
const paths: Record<Table, string> = {
  harvests: 'harvests',
  observations: 'observations',
  field_events: 'field-events',
};

/** A stored record at site A, made straight in the database so each caller acts on its own. */
async function recordAtSiteA(w: MatrixWorld, table: Table): Promise<string> {
  const id = crypto.randomUUID();
  const common = { id, trial_id: w.trial.id, created_by: w.users.lead.id };
  if (table === 'harvests')
    await w.t.db
      .insertInto('harvests')
      .values({
        ...common,
        plot_id: w.plotA,
        harvested_on: today,
        fruit_count: 3,
        mass_g: 41,
        grade: 'marketable',
      })
      .execute();
  else if (table === 'observations')
    await w.t.db
      .insertInto('observations')
      .values({
        ...common,
        plot_id: w.plotA,
        trait_id: w.traitId,
        observed_on: today,
        value: 880,
        plant_number: 1,
      })
      .execute();
  else
    await w.t.db
      .insertInto('field_events')
      .values({ ...common, site_id: w.siteA, kind: 'rainfall', occurred_on: today, rain_mm: 6 })
      .execute();
  return id;
}

/** Deleted just now by `caller` (so that caller's undo is in time). */
async function deletedBy(w: MatrixWorld, table: Table, caller: Caller): Promise<string> {
  const id = await recordAtSiteA(w, table);
  const actorId = caller === 'anonymous' ? w.users.lead.id : w.users[caller].id;
  const before = await w.t.db
    .selectFrom(table)
    .selectAll()
    .where('id', '=', id)
    .executeTakeFirstOrThrow();
  await w.t.db
    .updateTable(table)
    .set({ deleted_at: new Date(), version: 2 })
    .where('id', '=', id)
    .execute();
  await w.t.db
    .insertInto('audit_log')
    .values({
      trial_id: w.trial.id,
      table_name: table,
      record_id: id,
      action: 'delete',
      before: JSON.stringify(before),
      after: JSON.stringify({ ...before, version: 2 }),
      actor_id: actorId,
    })
    .execute();
  return id;
}

const createBodies: Record<Table, (w: MatrixWorld) => unknown> = {
  harvests: (w) => ({
    id: crypto.randomUUID(),
    plotId: w.plotA,
    harvestedOn: today,
    fruitCount: 4,
    massG: 52.5,
    grade: 'marketable',
  }),
  observations: (w) => ({
    id: crypto.randomUUID(),
    plotId: w.plotA,
    traitId: w.traitId,
    observedOn: today,
    value: 910,
    plantNumber: 2,
  }),
  field_events: (w) => ({
    id: crypto.randomUUID(),
    siteId: w.siteA,
    kind: 'irrigation',
    occurredOn: today,
    irrigationMethod: 'overhead',
    sprinklerRateMmPerH: 10,
    runTimeMin: 30,
  }),
};
const patchBodies: Record<Table, unknown> = {
  harvests: { version: 1, massG: 60 },
  observations: { version: 1, value: 930 },
  field_events: { version: 1, occurredOn: today, rainMm: 7 },
};

const tableRows = (table: Table): MatrixRow[] => {
  const route = `/api/trials/:slug/${paths[table]}`;
  return [
    {
      method: 'GET',
      route,
      request: (w) => ({ url: `${base(w)}/${paths[table]}` }),
      expect: memberRead,
    },
    {
      method: 'POST',
      route,
      request: (w) => ({ url: `${base(w)}/${paths[table]}`, body: createBodies[table](w) }),
      expect: recordWrite(201),
    },
    {
      method: 'PATCH',
      route: `${route}/:id`,
      request: async (w) => ({
        url: `${base(w)}/${paths[table]}/${await recordAtSiteA(w, table)}`,
        body: patchBodies[table],
      }),
      expect: recordWrite(200),
    },
    {
      method: 'DELETE',
      route: `${route}/:id`,
      request: async (w) => ({
        url: `${base(w)}/${paths[table]}/${await recordAtSiteA(w, table)}`,
      }),
      expect: recordWrite(200),
    },
    {
      method: 'POST',
      route: `${route}/:id/undo-delete`,
      request: async (w, caller) => ({
        url: `${base(w)}/${paths[table]}/${await deletedBy(w, table, caller)}/undo-delete`,
      }),
      expect: recordWrite(200),
    },
  ];
};

export const rows: MatrixRow[] = [
  ...tableRows('harvests'),
  ...tableRows('observations'),
  ...tableRows('field_events'),
  {
    method: 'GET',
    route: '/api/trials/:slug/records/plots',
    request: (w) => ({ url: `${base(w)}/records/plots` }),
    expect: memberRead,
  },
  {
    method: 'PUT',
    route: '/api/trials/:slug/records/plots/:plotId/stand-count',
    request: (w) => ({
      url: `${base(w)}/records/plots/${w.plotA}/stand-count`,
      body: { plantsSurviving: 9 },
    }),
    expect: recordWrite(200),
  },
  {
    method: 'GET',
    route: '/api/trials/:slug/records/completeness',
    request: (w) => ({ url: `${base(w)}/records/completeness?from=${today}&to=${today}` }),
    expect: memberRead,
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/records/import/preview',
    request: (w) => ({
      url: `${base(w)}/records/import/preview`,
      body: {
        kind: 'harvests',
        csv: `site,plot_number,harvested_on,fruit_count,mass_g,grade\nSite A,101,${today},2,30,cull\n`,
      },
    }),
    // A grower from another site sees the preview, with the rows marked as not theirs.
    expect: { ...recordWrite(200), growerOtherSite: 200 },
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/records/import',
    request: (w) => ({
      url: `${base(w)}/records/import`,
      body: {
        kind: 'harvests',
        csv: `site,plot_number,harvested_on,fruit_count,mass_g,grade\nSite A,101,${today},2,30,cull\n`,
      },
    }),
    expect: recordWrite(201),
  },
  {
    method: 'GET',
    route: '/api/trials/:slug/records/export/:dataset',
    request: (w) => ({ url: `${base(w)}/records/export/plot-totals` }),
    expect: memberRead,
  },
  {
    method: 'GET',
    route: '/api/trials/:slug/audit',
    request: (w) => ({ url: `${base(w)}/audit` }),
    expect: memberRead,
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/audit/restore',
    request: async (w) => ({
      url: `${base(w)}/audit/restore`,
      body: { table: 'harvests', recordId: await deletedBy(w, 'harvests', 'lead') },
    }),
    expect: leadOnly(200),
  },
];
