import { Router } from 'express';
import {
  answerSeedRequestBody,
  createLotBody,
  createOfferBody,
  entryLotParams,
  germinationTestBody,
  groupParams,
  lotParams,
  offerParams,
  seedRequestBody,
  seedRequestParams,
  seedSettingsBody,
  setEntryLotBody,
  testParams,
  trialOffersQuery,
  updateLotBody,
  updateOfferBody,
} from '../../common/contracts/seed';
import { trialSlugParams } from '../../common/contracts/trials';
import { varietySlugParams } from '../../common/contracts/varieties';
import type { AppDeps } from '../app-deps';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import * as service from './seed-service';

/** Mounted at /api/varieties/:slug/seed: a variety's lots, tests, stand and offers. */
export function varietySeedRouter(deps: Pick<AppDeps, 'db'>) {
  const { db } = deps;
  const router = Router({ mergeParams: true });
  router.get(
    '/',
    endpoint({ params: varietySlugParams }, async ({ params }, _req, res) => {
      res.json(await service.varietySeed(db, actorOf(res), params.slug));
    }),
  );
  router.post(
    '/lots',
    endpoint(
      { params: varietySlugParams, body: createLotBody },
      async ({ params, body }, _req, res) => {
        res.status(201).json(await service.createLot(db, actorOf(res), params.slug, body));
      },
    ),
  );
  router.post(
    '/offers',
    endpoint(
      { params: varietySlugParams, body: createOfferBody },
      async ({ params, body }, _req, res) => {
        res.status(201).json(await service.createOffer(db, actorOf(res), params.slug, body));
      },
    ),
  );
  return router;
}

/** Mounted at /api/seed: lots, tests, offers and requests by their ids. */
export function seedRouter(deps: Pick<AppDeps, 'db' | 'mail' | 'baseUrl'>) {
  const { db } = deps;
  const router = Router();
  router.patch(
    '/lots/:lotId',
    endpoint({ params: lotParams, body: updateLotBody }, async ({ params, body }, _req, res) => {
      await service.updateLot(db, actorOf(res), params.lotId, body);
      res.status(204).end();
    }),
  );
  router.post(
    '/lots/:lotId/tests',
    endpoint(
      { params: lotParams, body: germinationTestBody },
      async ({ params, body }, _req, res) => {
        res.status(201).json(await service.addTest(db, actorOf(res), params.lotId, body));
      },
    ),
  );
  router.delete(
    '/lots/:lotId/tests/:testId',
    endpoint({ params: testParams }, async ({ params }, _req, res) => {
      await service.deleteTest(db, actorOf(res), params.lotId, params.testId);
      res.status(204).end();
    }),
  );
  router.patch(
    '/groups/:groupId/settings',
    endpoint(
      { params: groupParams, body: seedSettingsBody },
      async ({ params, body }, _req, res) => {
        await service.updateSettings(db, actorOf(res), params.groupId, body);
        res.status(204).end();
      },
    ),
  );
  router.get(
    '/offers',
    endpoint({ query: trialOffersQuery }, async ({ query }, _req, res) => {
      res.json(await service.trialOffers(db, actorOf(res), query.trial));
    }),
  );
  router.get(
    '/offers/:offerId',
    endpoint({ params: offerParams }, async ({ params }, _req, res) => {
      res.json(await service.offerView(db, actorOf(res), params.offerId));
    }),
  );
  router.patch(
    '/offers/:offerId',
    endpoint({ params: offerParams, body: updateOfferBody }, async ({ params }, _req, res) => {
      await service.closeOffer(db, actorOf(res), params.offerId);
      res.status(204).end();
    }),
  );
  router.get(
    '/offers/:offerId/requests',
    endpoint({ params: offerParams }, async ({ params }, _req, res) => {
      res.json(await service.offerRequests(db, actorOf(res), params.offerId));
    }),
  );
  router.post(
    '/offers/:offerId/requests',
    endpoint(
      { params: offerParams, body: seedRequestBody },
      async ({ params, body }, _req, res) => {
        res.status(201).json(await service.requestPacket(deps, actorOf(res), params.offerId, body));
      },
    ),
  );
  router.patch(
    '/requests/:requestId',
    endpoint(
      { params: seedRequestParams, body: answerSeedRequestBody },
      async ({ params, body }, _req, res) => {
        await service.answerRequest(deps, actorOf(res), params.requestId, body);
        res.status(204).end();
      },
    ),
  );
  return router;
}

/** Mounted at /api/trials/:slug/entry-lots: the lot each entry was sown from. */
export function entryLotsRouter(deps: Pick<AppDeps, 'db'>) {
  const { db } = deps;
  const router = Router({ mergeParams: true });
  router.get(
    '/',
    endpoint({ params: trialSlugParams }, async ({ params }, _req, res) => {
      res.json(await service.entryLots(db, actorOf(res), params.slug));
    }),
  );
  router.put(
    '/:entryId',
    endpoint(
      { params: entryLotParams, body: setEntryLotBody },
      async ({ params, body }, _req, res) => {
        await service.setEntryLot(db, actorOf(res), params.slug, params.entryId, body);
        res.status(204).end();
      },
    ),
  );
  return router;
}
