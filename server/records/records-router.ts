import { Router } from 'express';
import { z } from 'zod';
import {
  completenessQuery,
  createFieldEventBody,
  createHarvestBody,
  createObservationBody,
  exportParams,
  importBody,
  listQuery,
  plotParams,
  recordParams,
  slugParams,
  standCountBody,
  updateFieldEventBody,
  updateHarvestBody,
  updateObservationBody,
} from '../../common/contracts/records';
import type { AppDeps } from '../app';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import * as csv from './records-csv-service';
import type { RecordTable } from './records-repository';
import * as service from './records-service';

/** Delete and undo are the same for every record table. */
function lifecycleRoutes(router: Router, db: AppDeps['db'], table: RecordTable) {
  router.delete(
    '/:id',
    endpoint({ params: recordParams }, async ({ params }, _req, res) => {
      res.json(await service.deleteRecord(db, params.slug, actorOf(res), table, params.id));
    }),
  );
  router.post(
    '/:id/undo-delete',
    endpoint({ params: recordParams }, async ({ params }, _req, res) => {
      res.json(await service.undoDelete(db, params.slug, actorOf(res), table, params.id));
    }),
  );
}

/** Mounted at /api/trials/:slug/harvests. A repeated id answers 200 with the stored record. */
export function harvestsRouter({ db }: Pick<AppDeps, 'db'>) {
  const router = Router({ mergeParams: true });
  router.get(
    '/',
    endpoint({ params: slugParams, query: listQuery }, async ({ params, query }, _req, res) => {
      res.json(await service.listHarvests(db, params.slug, actorOf(res), query));
    }),
  );
  router.post(
    '/',
    endpoint(
      { params: slugParams, body: createHarvestBody },
      async ({ params, body }, _req, res) => {
        const { created, record } = await service.createHarvest(
          db,
          params.slug,
          actorOf(res),
          body,
        );
        res.status(created ? 201 : 200).json(record);
      },
    ),
  );
  router.patch(
    '/:id',
    endpoint(
      { params: recordParams, body: updateHarvestBody },
      async ({ params, body }, _req, res) => {
        res.json(await service.updateHarvest(db, params.slug, actorOf(res), params.id, body));
      },
    ),
  );
  lifecycleRoutes(router, db, 'harvests');
  return router;
}

/** Mounted at /api/trials/:slug/observations. */
export function observationsRouter({ db }: Pick<AppDeps, 'db'>) {
  const router = Router({ mergeParams: true });
  router.get(
    '/',
    endpoint(
      { params: slugParams, query: listQuery.extend({ traitId: z.uuid().optional() }) },
      async ({ params, query }, _req, res) => {
        res.json(await service.listObservations(db, params.slug, actorOf(res), query));
      },
    ),
  );
  router.post(
    '/',
    endpoint(
      { params: slugParams, body: createObservationBody },
      async ({ params, body }, _req, res) => {
        const { created, record } = await service.createObservation(
          db,
          params.slug,
          actorOf(res),
          body,
        );
        res.status(created ? 201 : 200).json(record);
      },
    ),
  );
  router.patch(
    '/:id',
    endpoint(
      { params: recordParams, body: updateObservationBody },
      async ({ params, body }, _req, res) => {
        res.json(await service.updateObservation(db, params.slug, actorOf(res), params.id, body));
      },
    ),
  );
  lifecycleRoutes(router, db, 'observations');
  return router;
}

/** Mounted at /api/trials/:slug/field-events. */
export function fieldEventsRouter({ db }: Pick<AppDeps, 'db'>) {
  const router = Router({ mergeParams: true });
  router.get(
    '/',
    endpoint({ params: slugParams, query: listQuery }, async ({ params, query }, _req, res) => {
      res.json(await service.listFieldEvents(db, params.slug, actorOf(res), query));
    }),
  );
  router.post(
    '/',
    endpoint(
      { params: slugParams, body: createFieldEventBody },
      async ({ params, body }, _req, res) => {
        const { created, record } = await service.createFieldEvent(
          db,
          params.slug,
          actorOf(res),
          body,
        );
        res.status(created ? 201 : 200).json(record);
      },
    ),
  );
  router.patch(
    '/:id',
    endpoint(
      { params: recordParams, body: updateFieldEventBody },
      async ({ params, body }, _req, res) => {
        res.json(await service.updateFieldEvent(db, params.slug, actorOf(res), params.id, body));
      },
    ),
  );
  lifecycleRoutes(router, db, 'field_events');
  return router;
}

/** Mounted at /api/trials/:slug/records: plots for the field log, rounds, import and export. */
export function recordsRouter({ db }: Pick<AppDeps, 'db'>) {
  const router = Router({ mergeParams: true });
  router.get(
    '/plots',
    endpoint(
      { params: slugParams, query: z.object({ siteId: z.uuid().optional() }) },
      async ({ params, query }, _req, res) => {
        res.json(await service.listPlots(db, params.slug, actorOf(res), query.siteId));
      },
    ),
  );
  router.put(
    '/plots/:plotId/stand-count',
    endpoint({ params: plotParams, body: standCountBody }, async ({ params, body }, _req, res) => {
      res.json(await service.setStandCount(db, params.slug, actorOf(res), params.plotId, body));
    }),
  );
  router.get(
    '/completeness',
    endpoint(
      { params: slugParams, query: completenessQuery },
      async ({ params, query }, _req, res) => {
        res.json(await service.completeness(db, params.slug, actorOf(res), query));
      },
    ),
  );
  router.post(
    '/import/preview',
    endpoint({ params: slugParams, body: importBody }, async ({ params, body }, _req, res) => {
      res.json(await csv.previewImport(db, params.slug, actorOf(res), body.kind, body.csv));
    }),
  );
  router.post(
    '/import',
    endpoint({ params: slugParams, body: importBody }, async ({ params, body }, _req, res) => {
      res
        .status(201)
        .json(await csv.commitImport(db, params.slug, actorOf(res), body.kind, body.csv));
    }),
  );
  router.get(
    '/export/:dataset',
    endpoint({ params: exportParams }, async ({ params }, _req, res) => {
      const file = await csv.exportDataset(db, params.slug, actorOf(res), params.dataset);
      res.setHeader('Content-Type', 'text/csv; charset=utf-8');
      res.setHeader('Content-Disposition', `attachment; filename="${file.filename}"`);
      res.send(file.body);
    }),
  );
  return router;
}
