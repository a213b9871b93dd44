import { Router } from 'express';
import {
  copyTrialBody,
  createTrialBody,
  entryBody,
  entryIdParams,
  entryUpdateBody,
  layoutBody,
  plantingBody,
  siteBody,
  siteIdParams,
  siteUpdateBody,
  traitBody,
  traitIdParams,
  traitUpdateBody,
  updateTrialBody,
} from '../../common/contracts/design';
import { trialSlugParams } from '../../common/contracts/trials';
import type { AppDeps } from '../app-deps';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import * as service from './design-service';

/** The lead's design routes, mounted at /api/trials next to the trial list and detail. */
export function designRouter({ db }: Pick<AppDeps, 'db'>) {
  const router = Router();

  router.post(
    '/',
    endpoint({ body: createTrialBody }, async ({ body }, _req, res) => {
      res.status(201).json(await service.createTrial(db, actorOf(res), body));
    }),
  );
  router.patch(
    '/:slug',
    endpoint(
      { params: trialSlugParams, body: updateTrialBody },
      async ({ params, body }, _req, res) => {
        await service.updateTrial(db, params.slug, actorOf(res), body);
        res.status(204).end();
      },
    ),
  );
  router.post(
    '/:slug/copy',
    endpoint(
      { params: trialSlugParams, body: copyTrialBody },
      async ({ params, body }, _req, res) => {
        res.status(201).json(await service.copyTrial(db, params.slug, actorOf(res), body));
      },
    ),
  );
  router.get(
    '/:slug/design',
    endpoint({ params: trialSlugParams }, async ({ params }, _req, res) => {
      res.json(await service.getDesign(db, params.slug, actorOf(res)));
    }),
  );

  router.post(
    '/:slug/entries',
    endpoint({ params: trialSlugParams, body: entryBody }, async ({ params, body }, _req, res) => {
      res.status(201).json(await service.createEntry(db, params.slug, actorOf(res), body));
    }),
  );
  router.patch(
    '/:slug/entries/:entryId',
    endpoint(
      { params: entryIdParams, body: entryUpdateBody },
      async ({ params, body }, _req, res) => {
        await service.updateEntry(db, params.slug, actorOf(res), params.entryId, body);
        res.status(204).end();
      },
    ),
  );
  router.delete(
    '/:slug/entries/:entryId',
    endpoint({ params: entryIdParams }, async ({ params }, _req, res) => {
      await service.deleteEntry(db, params.slug, actorOf(res), params.entryId);
      res.status(204).end();
    }),
  );

  router.post(
    '/:slug/sites',
    endpoint({ params: trialSlugParams, body: siteBody }, async ({ params, body }, _req, res) => {
      res.status(201).json(await service.createSite(db, params.slug, actorOf(res), body));
    }),
  );
  router.patch(
    '/:slug/sites/:siteId',
    endpoint(
      { params: siteIdParams, body: siteUpdateBody },
      async ({ params, body }, _req, res) => {
        await service.updateSite(db, params.slug, actorOf(res), params.siteId, body);
        res.status(204).end();
      },
    ),
  );
  router.delete(
    '/:slug/sites/:siteId',
    endpoint({ params: siteIdParams }, async ({ params }, _req, res) => {
      await service.deleteSite(db, params.slug, actorOf(res), params.siteId);
      res.status(204).end();
    }),
  );

  router.post(
    '/:slug/traits',
    endpoint({ params: trialSlugParams, body: traitBody }, async ({ params, body }, _req, res) => {
      res.status(201).json(await service.createTrait(db, params.slug, actorOf(res), body));
    }),
  );
  router.patch(
    '/:slug/traits/:traitId',
    endpoint(
      { params: traitIdParams, body: traitUpdateBody },
      async ({ params, body }, _req, res) => {
        res.json(await service.updateTrait(db, params.slug, actorOf(res), params.traitId, body));
      },
    ),
  );
  router.delete(
    '/:slug/traits/:traitId',
    endpoint({ params: traitIdParams }, async ({ params }, _req, res) => {
      await service.deleteTrait(db, params.slug, actorOf(res), params.traitId);
      res.status(204).end();
    }),
  );

  router.post(
    '/:slug/layout',
    endpoint({ params: trialSlugParams, body: layoutBody }, async ({ params, body }, _req, res) => {
      res.status(201).json(await service.generateLayout(db, params.slug, actorOf(res), body));
    }),
  );
  router.delete(
    '/:slug/layout',
    endpoint({ params: trialSlugParams }, async ({ params }, _req, res) => {
      await service.clearLayout(db, params.slug, actorOf(res));
      res.status(204).end();
    }),
  );
  router.put(
    '/:slug/layout/planting',
    endpoint(
      { params: trialSlugParams, body: plantingBody },
      async ({ params, body }, _req, res) => {
        res.json(await service.recordPlanting(db, params.slug, actorOf(res), body));
      },
    ),
  );
  return router;
}
