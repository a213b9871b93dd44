import { Router } from 'express';
import { auditQuery, restoreBody, slugParams } from '../../common/contracts/records';
import type { AppDeps } from '../app-deps';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import * as service from './audit-service';

/** Mounted at /api/trials/:slug/audit. */
export function auditRouter({ db }: Pick<AppDeps, 'db'>) {
  const router = Router({ mergeParams: true });
  router.get(
    '/',
    endpoint({ params: slugParams, query: auditQuery }, async ({ params, query }, _req, res) => {
      res.json(await service.auditLog(db, params.slug, actorOf(res), query));
    }),
  );
  router.post(
    '/restore',
    endpoint({ params: slugParams, body: restoreBody }, async ({ params, body }, _req, res) => {
      res.json(await service.restoreRecord(db, params.slug, actorOf(res), body));
    }),
  );
  return router;
}
