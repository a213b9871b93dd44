/**
 * What the record log pages read from the server in client tests: one invented okra trial
 * (Brookfold, one site, the viewer may do everything) and the plot columns every record row
 * carries. Each test adds its own traits, counts and record values.
 */
import { trialActions } from '../../common/policy';

export const fixtureId = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`;

/** The trial as `GET /api/trials/brookfold` answers it, with the test's own fields laid over. */
export function brookfoldTrial<O extends object>(over?: O) {
  return {
    id: fixtureId(1),
    slug: 'brookfold',
    title: 'Brookfold okra round',
    crop: 'Okra',
    season: '2026',
    design: 'rcbd',
    status: 'active',
    siteCount: 1,
    entryCount: 1,
    plotCount: 1,
    myRole: 'lead',
    description: '',
    sowingDate: null,
    transplantDate: null,
    sites: [
      {
        id: fixtureId(2),
        name: 'Brookfold Allotment',
        region: '',
        soilTexture: null,
        irrigationMethod: null,
        notes: '',
      },
    ],
    entries: [],
    traits: [],
    harvestCount: 0,
    observationCount: 0,
    mySiteIds: null,
    permissions: Object.fromEntries(trialActions.map((a) => [a, true])),
    ...over,
  };
}

/** The columns a harvest or observation row shares: who, when, and which plot of which entry. */
export const recordRowBase = {
  version: 1,
  deletedAt: null,
  createdAt: '2026-07-01T10:00:00.000Z',
  updatedAt: '2026-07-01T10:00:00.000Z',
  createdByName: 'Wren Alderby',
  updatedByName: 'Wren Alderby',
  plotId: fixtureId(3),
  siteId: fixtureId(2),
  siteName: 'Brookfold Allotment',
  block: 1,
  entryId: fixtureId(4),
  entryCode: 'E1',
  entryName: 'Tallow Finger',
  note: '',
};

export const jsonResponse = (status: number, body: unknown) =>
  new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
