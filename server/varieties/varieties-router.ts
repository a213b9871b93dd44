import { Router } from 'express';
import {
  compareQuery,
  createVarietyBody,
  stabilityQuery,
  updateVarietyBody,
  varietySlugParams,
} from '../../common/contracts/varieties';
import type { AppDeps } from '../app-deps';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import * as service from './varieties-service';

/** Mounted at /api/groups. */
export function groupsRouter(deps: Pick<AppDeps, 'db'>) {
  const router = Router();
  router.get(
    '/',
    endpoint({}, async (_input, _req, res) => {
      res.json(await service.listGroups(deps.db, actorOf(res)));
    }),
  );
  return router;
}

/** Mounted at /api/varieties. */
export function varietiesRouter(deps: Pick<AppDeps, 'db'>) {
  const { db } = deps;
  const router = Router();
  router.get(
    '/',
    endpoint({}, async (_input, _req, res) => {
      res.json(await service.listVarieties(db, actorOf(res)));
    }),
  );
  router.post(
    '/',
    endpoint({ body: createVarietyBody }, async ({ body }, _req, res) => {
      res.status(201).json(await service.createVariety(db, actorOf(res), body));
    }),
  );
  // Before '/:slug': `compare` and `stability` are never a variety's address.
  router.get(
    '/compare',
    endpoint({ query: compareQuery }, async ({ query }, _req, res) => {
      res.json(await service.compareVarieties(db, actorOf(res), query));
    }),
  );
  router.get(
    '/stability',
    endpoint({ query: stabilityQuery }, async ({ query }, _req, res) => {
      res.json(await service.varietyStability(db, actorOf(res), query));
    }),
  );
  router.get(
    '/:slug',
    endpoint({ params: varietySlugParams }, async ({ params }, _req, res) => {
      res.json(await service.varietyRecord(db, actorOf(res), params.slug));
    }),
  );
  router.patch(
    '/:slug',
    endpoint(
      { params: varietySlugParams, body: updateVarietyBody },
      async ({ params, body }, _req, res) => {
        await service.updateVariety(db, actorOf(res), params.slug, body);
        res.status(204).end();
      },
    ),
  );
  return router;
}
