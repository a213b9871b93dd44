/**
 * The authorization matrix: one row per API route, the expected status for each kind of
 * caller. Each feature keeps its rows in tests/api/matrix/<feature>.ts (export `rows`); the
 * matrix test gathers every file here and fails when a mounted route has no row.
 */
import type { MatrixWorld } from './matrix-world';

export const callers = [
  'anonymous',
  'viewer',
  'contributor',
  'growerInSite',
  'growerOtherSite',
  'lead',
  'admin',
] as const;
export type Caller = (typeof callers)[number];
/**
 * Callers only the rows that name them are tried with: a group's coordinator (in no trial) and
 * a signed-in outsider (in no trial and no group).
 */
export const extraCallers = ['coordinator', 'outsider'] as const;
export type ExtraCaller = (typeof extraCallers)[number];

export interface MatrixRequest {
  url: string;
  body?: unknown;
  /** multipart fields and files, for upload routes */
  attach?: { field: string; file: Buffer; filename: string; contentType: string }[];
  fields?: Record<string, string>;
}

export interface MatrixRow {
  method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  /** The Express pattern exactly as mounted, e.g. /api/trials/:slug/harvests */
  route: string;
  /**
   * Builds a fresh request for this caller (create whatever the request acts on here, so a
   * DELETE by one caller does not change what the next one sees).
   */
  request: (world: MatrixWorld, caller: Caller) => Promise<MatrixRequest> | MatrixRequest;
  expect: Record<Caller, number>;
  expectExtra?: Partial<Record<ExtraCaller, number>>;
}

/** The usual answers for a read of the (unpublished) matrix trial. */
export const memberRead: Record<Caller, number> = {
  anonymous: 404,
  viewer: 200,
  contributor: 200,
  growerInSite: 200,
  growerOtherSite: 200,
  lead: 200,
  admin: 200,
};
/** Lead-only changes to the trial: others in the trial get 403, strangers 404. */
export const leadOnly = (ok = 200): Record<Caller, number> => ({
  anonymous: 404,
  viewer: 403,
  contributor: 403,
  growerInSite: 403,
  growerOtherSite: 403,
  lead: ok,
  admin: ok,
});
/** Field records at site A: growers limited to site B are refused. */
export const recordWrite = (ok = 201): Record<Caller, number> => ({
  anonymous: 404,
  viewer: 403,
  contributor: 403,
  growerInSite: ok,
  growerOtherSite: 403,
  lead: ok,
  admin: ok,
});

/** A group's coordinators only: its members (the trial's lead too) 403, outside the group 404. */
export const coordinatorOnly = (ok: number) => ({
  expect: {
    anonymous: 404,
    viewer: 403,
    contributor: 403,
    growerInSite: 403,
    growerOtherSite: 403,
    lead: 403,
    admin: ok,
  } satisfies Record<Caller, number>,
  expectExtra: { coordinator: ok, outsider: 404 } satisfies Partial<Record<ExtraCaller, number>>,
});
