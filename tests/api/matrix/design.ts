/**
 * Design routes. Changes that would disturb the shared world (a new layout deletes its plots)
 * act on a fresh trial with the world's members in the same roles, made for each caller.
 */
import { leadOnly, memberRead, type MatrixRow } from './matrix-types';
import { type MatrixWorld, trialWithWorldMembers } from './matrix-world';

interface Fresh {
  slug: string;
  entryId: string;
  siteId: string;
  traitId: string;
  plotId: string | null;
}

/** A trial with two entries, one site and a trait, and the world's members; with plots if asked. */
async function freshTrial(w: MatrixWorld, withPlots = false): Promise<Fresh> {
  const db = w.t.db;
  const trial = await trialWithWorldMembers(w, 'design-matrix', { title: 'Design matrix' });
  const slug = trial.slug;
  const entries = await db
    .insertInto('entries')
    .values([
      {
        trial_id: trial.id,
        name: 'Fen Green',
        code: 'FG',
        entry_type: 'heirloom',
        in_row_spacing_mm: 300,
      },
      {
        trial_id: trial.id,
        name: 'Fen Red',
        code: 'FR',
        entry_type: 'heirloom',
        in_row_spacing_mm: 300,
      },
    ])
    .returning('id')
    .execute();
  const site = await db
    .insertInto('sites')
    .values({ trial_id: trial.id, name: 'Fen plot' })
    .returning('id')
    .executeTakeFirstOrThrow();
  const trait = await db
    .insertInto('traits')
    .values({
      trial_id: trial.id,
      key: 'vigor',
      label: 'Vigor',
      quantity_kind: 'score',
      basis: 'plot',
      direction: 'higher',
      scale_min: 1,
      scale_max: 5,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  let plotId: string | null = null;
  if (withPlots) {
    plotId = (
      await db
        .insertInto('plots')
        .values({
          trial_id: trial.id,
          site_id: site.id,
          entry_id: entries[0]!.id,
          block: 1,
          position: 1,
          plot_number: 101,
        })
        .returning('id')
        .executeTakeFirstOrThrow()
    ).id;
  }
  return { slug, entryId: entries[0]!.id, siteId: site.id, traitId: trait.id, plotId };
}

const entry = { name: 'Ash Lantern', code: 'AL', entryType: 'heirloom', inRowSpacingMm: 450 };
const layout = { replicates: 3, seed: 42, rowLengthMm: 3000, rowSpacingMm: 900 };

export const rows: MatrixRow[] = [
  {
    method: 'POST',
    route: '/api/trials',
    request: (_w, caller) => ({
      url: '/api/trials',
      body: { title: `Created by ${caller}`, crop: 'Okra', season: '2027', design: 'rcbd' },
    }),
    expect: {
      anonymous: 401,
      viewer: 201,
      contributor: 201,
      growerInSite: 201,
      growerOtherSite: 201,
      lead: 201,
      admin: 201,
    },
  },
  {
    // Into a chosen group: its coordinators only; the trial's people are members there (403),
    // someone outside the group is told it does not exist.
    method: 'POST',
    route: '/api/trials',
    request: (w, caller) => ({
      url: '/api/trials',
      body: {
        title: `In the group by ${caller}`,
        crop: 'Okra',
        season: '2027',
        design: 'rcbd',
        groupId: w.groupId,
      },
    }),
    expect: {
      anonymous: 401,
      viewer: 403,
      contributor: 403,
      growerInSite: 403,
      growerOtherSite: 403,
      lead: 403,
      admin: 201,
    },
    expectExtra: { coordinator: 201, outsider: 404 },
  },
  {
    method: 'PATCH',
    route: '/api/trials/:slug',
    request: (w) => ({
      url: `/api/trials/${w.trial.slug}`,
      body: { description: 'Edited by the matrix.' },
    }),
    expect: leadOnly(204),
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/copy',
    request: (w, caller) => ({
      url: `/api/trials/${w.trial.slug}/copy`,
      body: { title: `Copied by ${caller}`, season: '2027' },
    }),
    expect: leadOnly(201),
  },
  {
    method: 'GET',
    route: '/api/trials/:slug/design',
    request: (w) => ({ url: `/api/trials/${w.trial.slug}/design` }),
    expect: memberRead,
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/entries',
    request: async (w) => ({
      url: `/api/trials/${(await freshTrial(w)).slug}/entries`,
      body: entry,
    }),
    expect: leadOnly(201),
  },
  {
    method: 'PATCH',
    route: '/api/trials/:slug/entries/:entryId',
    request: (w) => ({
      url: `/api/trials/${w.trial.slug}/entries/${w.entries[0]}`,
      body: { notes: 'Checked by the matrix.' },
    }),
    expect: leadOnly(204),
  },
  {
    method: 'DELETE',
    route: '/api/trials/:slug/entries/:entryId',
    request: async (w) => {
      const f = await freshTrial(w);
      return { url: `/api/trials/${f.slug}/entries/${f.entryId}` };
    },
    expect: leadOnly(204),
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/sites',
    request: async (w) => ({
      url: `/api/trials/${(await freshTrial(w)).slug}/sites`,
      body: { name: 'Second bed', region: 'Ashby Hollow' },
    }),
    expect: leadOnly(201),
  },
  {
    method: 'PATCH',
    route: '/api/trials/:slug/sites/:siteId',
    request: (w) => ({
      url: `/api/trials/${w.trial.slug}/sites/${w.siteA}`,
      body: { notes: 'Checked by the matrix.' },
    }),
    expect: leadOnly(204),
  },
  {
    method: 'DELETE',
    route: '/api/trials/:slug/sites/:siteId',
    request: async (w) => {
      const f = await freshTrial(w);
      return { url: `/api/trials/${f.slug}/sites/${f.siteId}` };
    },
    expect: leadOnly(204),
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/traits',
    request: async (w) => ({
      url: `/api/trials/${(await freshTrial(w)).slug}/traits`,
      body: {
        key: 'heat_tolerance',
        label: 'Heat tolerance',
        quantityKind: 'score',
        basis: 'plot',
        direction: 'higher',
        scaleMin: 1,
        scaleMax: 5,
      },
    }),
    expect: leadOnly(201),
  },
  {
    method: 'PATCH',
    route: '/api/trials/:slug/traits/:traitId',
    request: (w) => ({
      url: `/api/trials/${w.trial.slug}/traits/${w.traitId}`,
      body: { label: 'Plant height' },
    }),
    expect: leadOnly(200),
  },
  {
    method: 'DELETE',
    route: '/api/trials/:slug/traits/:traitId',
    request: async (w) => {
      const f = await freshTrial(w);
      return { url: `/api/trials/${f.slug}/traits/${f.traitId}` };
    },
    expect: leadOnly(204),
  },
  {
    method: 'POST',
    route: '/api/trials/:slug/layout',
    request: async (w) => ({
      url: `/api/trials/${(await freshTrial(w)).slug}/layout`,
      body: layout,
    }),
    expect: leadOnly(201),
  },
  {
    method: 'DELETE',
    route: '/api/trials/:slug/layout',
    request: async (w) => ({ url: `/api/trials/${(await freshTrial(w, true)).slug}/layout` }),
    expect: leadOnly(204),
  },
  {
    method: 'PUT',
    route: '/api/trials/:slug/layout/planting',
    request: async (w) => {
      const f = await freshTrial(w, true);
      return {
        url: `/api/trials/${f.slug}/layout/planting`,
        body: { plots: [{ plotId: f.plotId, plantsSet: 10, plantsSurviving: 9, gaps: 1 }] },
      };
    },
    expect: leadOnly(200),
  },
];
