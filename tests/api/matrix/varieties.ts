/**
 * Groups and the variety register. The world's trial belongs to a group whose coordinator is
 * in no trial; the trial's people (its lead too) are group members; the outsider is in neither.
 * The trial is unpublished, so its varieties are hidden from anyone outside the group.
 */
import type { Caller, ExtraCaller, MatrixRow } from './matrix-types';
import { coordinatorOnly } from './matrix-types';

const signedIn = (ok: number): Record<Caller, number> => ({
  anonymous: 401,
  viewer: ok,
  contributor: ok,
  growerInSite: ok,
  growerOtherSite: ok,
  lead: ok,
  admin: ok,
});
const groupRead: Record<Caller, number> = { ...signedIn(200), anonymous: 404 };
const hiddenFromOutsider = { coordinator: 200, outsider: 404 } satisfies Record<
  ExtraCaller,
  number
>;

let made = 0;

export const rows: MatrixRow[] = [
  {
    method: 'GET',
    route: '/api/groups',
    request: () => ({ url: '/api/groups' }),
    expect: signedIn(200),
    expectExtra: { coordinator: 200, outsider: 200 },
  },
  {
    method: 'GET',
    route: '/api/varieties',
    request: () => ({ url: '/api/varieties' }),
    expect: signedIn(200),
    expectExtra: { coordinator: 200, outsider: 200 },
  },
  {
    method: 'POST',
    route: '/api/varieties',
    request: (w) => ({
      url: '/api/varieties',
      body: { groupId: w.groupId, name: `Matrix new ${++made}`, crop: 'Okra' },
    }),
    ...coordinatorOnly(201),
  },
  {
    method: 'GET',
    route: '/api/varieties/compare',
    request: (w) => ({ url: `/api/varieties/compare?varieties=${w.varieties.join(',')}` }),
    expect: groupRead,
    expectExtra: hiddenFromOutsider,
  },
  {
    // Group members and coordinators; the figures of each trial as the trial's roles allow.
    method: 'GET',
    route: '/api/varieties/stability',
    request: (w) => ({ url: `/api/varieties/stability?group=${w.groupId}&crop=Okra` }),
    expect: groupRead,
    expectExtra: hiddenFromOutsider,
  },
  {
    method: 'GET',
    route: '/api/varieties/:slug',
    request: (w) => ({ url: `/api/varieties/${w.varieties[0]}` }),
    expect: groupRead,
    expectExtra: hiddenFromOutsider,
  },
  {
    method: 'PATCH',
    route: '/api/varieties/:slug',
    request: (w) => ({
      url: `/api/varieties/${w.varieties[1]}`,
      body: { description: 'Edited in the matrix.' },
    }),
    ...coordinatorOnly(204),
  },
];
