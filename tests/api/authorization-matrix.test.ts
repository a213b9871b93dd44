/**
 * Every API route × every kind of caller → the expected status, against the real app and
 * database. The rows live in tests/api/matrix/<feature>.ts; a mounted route with no row fails.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiMounts } from '../../server/app';
import { listRoutes } from '../../server/lib/route-list';
import { createTestApp, TEST_ORIGIN, type TestApp } from '../support/test-app';
import { type Caller, callers, extraCallers, type MatrixRow } from './matrix/matrix-types';
import { buildMatrixWorld, type MatrixWorld } from './matrix/matrix-world';

const modules = import.meta.glob<{ rows: MatrixRow[] }>('./matrix/*.ts', { eager: true });
const rows = Object.values(modules).flatMap((m) => m.rows ?? []);

let t: TestApp;
let world: MatrixWorld;
beforeAll(async () => {
  t = await createTestApp();
  world = await buildMatrixWorld(t);
}, 60_000);
afterAll(async () => {
  await t.close();
});

describe('authorization matrix', () => {
  it('has a row for every mounted API route, and no row for a route that does not exist', () => {
    const mounted = listRoutes(apiMounts(t.runtime.deps))
      .map((r) => `${r.method} ${r.path}`)
      .sort();
    const covered = [...new Set(rows.map((r) => `${r.method} ${r.route}`))].sort();
    expect(covered).toEqual(mounted);
  });

  for (const row of rows) {
    it(`${row.method} ${row.route}`, async () => {
      const got: Record<string, number> = {};
      const tried = [...callers, ...extraCallers.filter((c) => row.expectExtra?.[c] !== undefined)];
      for (const caller of tried) {
        // Rows that name an extra caller build their request without a trial role for it.
        const req = await row.request(world, caller as Caller);
        const method = row.method.toLowerCase() as 'get';
        let r = request(t.app)[method](req.url).set('Origin', TEST_ORIGIN);
        const cookie = world.cookies[caller];
        if (cookie) r = r.set('Cookie', cookie);
        if (req.attach) {
          for (const [k, v] of Object.entries(req.fields ?? {})) r = r.field(k, v);
          for (const a of req.attach)
            r = r.attach(a.field, a.file, { filename: a.filename, contentType: a.contentType });
        } else if (req.body !== undefined) {
          r = r.send(req.body as object);
        }
        got[caller] = (await r).status;
      }
      expect(got).toEqual({ ...row.expect, ...row.expectExtra });
    });
  }
});
