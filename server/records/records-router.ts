import { Router } from 'express';
import { z } from 'zod';
import type { Actor } from '../../common/policy';
import {
  completenessQuery,
  createFieldEventBody,
  createHarvestBody,
  createObservationBody,
  exportParams,
  harvestLogQuery,
  importBody,
  listQuery,
  observationLogQuery,
  plotParams,
  recordParams,
  slugParams,
  standCountBody,
  updateFieldEventBody,
  updateHarvestBody,
  updateObservationBody,
} from '../../common/contracts/records';
import type { DB } from '../../db/database';
import type { AppDeps } from '../app-deps';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import * as csv from './records-csv-service';
import type { RecordTable } from './records-repository';
import * as service from './records-service';

/** What differs between the record kinds: their table, schemas and services. */
interface RecordKind<L extends z.ZodType, C extends z.ZodType, U extends z.ZodType> {
  table: RecordTable;
  listQuery: L;
  createBody: C;
  updateBody: U;
  list: (db: DB, slug: string, actor: Actor | null, query: z.output<L>) => Promise<unknown>;
  create: (
    db: DB,
    slug: string,
    actor: Actor | null,
    body: z.output<C>,
  ) => Promise<{ created: boolean; record: unknown }>;
  update: (
    db: DB,
    slug: string,
    actor: Actor | null,
    id: string,
    body: z.output<U>,
  ) => Promise<unknown>;
}

/**
 * List, create, patch, delete and undo for one record kind, in that order. A repeated id
 * answers 200 with the stored record.
 */
function recordRoutes<L extends z.ZodType, C extends z.ZodType, U extends z.ZodType>(
  db: DB,
  kind: RecordKind<L, C, U>,
) {
  const router = Router({ mergeParams: true });
  router.get(
    '/',
    endpoint(
      { params: slugParams, query: kind.listQuery },
      async ({ params, query }, _req, res) => {
        res.json(await kind.list(db, params.slug, actorOf(res), query));
      },
    ),
  );
  router.post(
    '/',
    endpoint({ params: slugParams, body: kind.createBody }, async ({ params, body }, _req, res) => {
      const { created, record } = await kind.create(db, params.slug, actorOf(res), body);
      res.status(created ? 201 : 200).json(record);
    }),
  );
  router.patch(
    '/:id',
    endpoint(
      { params: recordParams, body: kind.updateBody },
      async ({ params, body }, _req, res) => {
        res.json(await kind.update(db, params.slug, actorOf(res), params.id, body));
      },
    ),
  );
  router.delete(
    '/:id',
    endpoint({ params: recordParams }, async ({ params }, _req, res) => {
      res.json(await service.deleteRecord(db, params.slug, actorOf(res), kind.table, params.id));
    }),
  );
  router.post(
    '/:id/undo-delete',
    endpoint({ params: recordParams }, async ({ params }, _req, res) => {
      res.json(await service.undoDelete(db, params.slug, actorOf(res), kind.table, params.id));
    }),
  );
  return router;
}

/** Mounted at /api/trials/:slug/harvests. */
export function harvestsRouter({ db }: Pick<AppDeps, 'db'>) {
  return recordRoutes(db, {
    table: 'harvests',
    listQuery: harvestLogQuery,
    createBody: createHarvestBody,
    updateBody: updateHarvestBody,
    list: service.listHarvests,
    create: service.createHarvest,
    update: service.updateHarvest,
  });
}

/** Mounted at /api/trials/:slug/observations. */
export function observationsRouter({ db }: Pick<AppDeps, 'db'>) {
  return recordRoutes(db, {
    table: 'observations',
    listQuery: observationLogQuery,
    createBody: createObservationBody,
    updateBody: updateObservationBody,
    list: service.listObservations,
    create: service.createObservation,
    update: service.updateObservation,
  });
}

/** Mounted at /api/trials/:slug/field-events. */
export function fieldEventsRouter({ db }: Pick<AppDeps, 'db'>) {
  return recordRoutes(db, {
    table: 'field_events',
    listQuery,
    createBody: createFieldEventBody,
    updateBody: updateFieldEventBody,
    list: service.listFieldEvents,
    create: service.createFieldEvent,
    update: service.updateFieldEvent,
  });
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
